"""Reference values for raysheet, computed with the rayoptics optical design library.

Each acrylic piece is built in rayoptics (PyPI package ``rayoptics``, version
0.9.8 used for the committed JSON) as a 2-surface singlet in air, entered either
from its "front" or its "back" face.  For rays in the meridional plane a
rotationally symmetric spherical singlet traces exactly like the 2D cylindrical
piece, so rayoptics' paraxial first-order data and its exact (real) ray trace
are valid references.

Run from /work/main:

    python3 tests/reference/make_reference.py > tests/reference/rayoptics_values.json

Every number in the JSON comes from rayoptics, except ``thin_lens_focal_mm``
(the textbook thin-lens formula, for the record).  See README.md for the sign
conventions.
"""
import json
import math
import sys

import numpy as np
import rayoptics
from rayoptics.environment import OpticalModel, PupilSpec, FieldSpec, WvlSpec
from rayoptics.raytr import trace as rt
from rayoptics.raytr.traceerror import TraceError

WVL = 587.6  # nm; irrelevant since the glass is a constant index
PARAX_OBJ_DIST = 1e10  # object at infinity for the first-order data
# Real rays start on a plane this far before the entry vertex, well clear of
# any surface sag.  For a ray parallel to the axis the start distance does not
# matter (20 mm ... 1e10 mm were checked to give bit-identical results).
RAY_START_DIST = 200.0

PIECES = [
    # name, n, front, back, t, H, heights(enter=front), heights(enter=back)
    ("biconvex-60-80", 1.49, ("convex", 60), ("convex", 80), 14, 40, [1, 4, 8, 12, -8], None),
    ("biconcave-50-70", 1.49, ("concave", 50), ("concave", 70), 4, 30, [1, 4, 8, 11, -8], None),
    ("meniscus-40-90", 1.49, ("convex", 40), ("concave", 90), 10, 36, [1, 4, 8, 12, -8], None),
    ("planoconvex-55", 1.52, "flat", ("convex", 55), 12, 44, [1, 5, 10, 15, -10], None),
    ("halfdisc-35", 1.49, "flat", ("convex", 35), 35, 70, [1, 5, 10, 15, 20, -15], [1, 5, 10, 15]),
    ("planoconcave-60-pc", 1.585, "flat", ("concave", 60), 3, 40, [1, 5, 10, 15, -10], None),
]


def signed_radius(face, first):
    """Signed radius for the surface met first (first=True) or second; None = flat."""
    if face == "flat":
        return None
    curve, r = face
    sign = 1.0 if curve == "convex" else -1.0
    return sign * r if first else -sign * r


def build(r1, r2, n, t, semi_h, obj_dist):
    """Singlet in air: surface 1 (radius r1), glass of index n and thickness t, surface 2 (r2)."""
    opm = OpticalModel()
    sm = opm["seq_model"]
    osp = opm["optical_spec"]
    opm.system_spec.dimensions = "mm"
    osp["pupil"] = PupilSpec(osp, key=["object", "epd"], value=2.0 * semi_h)
    osp["fov"] = FieldSpec(osp, key=["object", "angle"], value=0.0, flds=[0.0], is_relative=True)
    osp["wvls"] = WvlSpec([(WVL, 1.0)], ref_wl=0)
    sm.gaps[0].thi = obj_dist
    cv = lambda r: 0.0 if r is None else 1.0 / r  # pass curvatures: 0 = flat
    sm.add_surface([cv(r1), t, n], sd=semi_h)  # glass after surface 1
    sm.add_surface([cv(r2), 100.0], sd=semi_h)  # air after surface 2 (image gap arbitrary)
    sm.set_stop()
    opm.update_model()
    return opm


def real_ray(opm, h, t):
    """Exact trace of the ray parallel to the axis at height h."""
    sm = opm["seq_model"]
    try:
        ray, _, _ = rt.trace(sm, np.array([0.0, h, 0.0]), np.array([0.0, 0.0, 1.0]), WVL)
    except TraceError as e:
        return {"height_mm": h, "failed": True, "message": f"{type(e).__name__}: {e}"}
    # ray[k] = [point, direction after interface, ...] in interface k's local
    # coordinates (origin at the vertex); index 2 is the exit (last lens) surface.
    pt, d = ray[2][0], ray[2][1]
    z_cross = pt[2] - pt[1] * d[2] / d[1]  # straight line through pt, meets y = 0
    return {"height_mm": h,
            "crossing_from_exit_mm": float(z_cross),
            "crossing_from_entry_mm": float(z_cross + t),
            "exit_slope": float(d[1] / d[2])}


def face_json(face):
    return "flat" if face == "flat" else {"curve": face[0], "radius_mm": face[1]}


def main():
    cases = []
    for name, n, front, back, t, H, hf, hb in PIECES:
        for enter in ("front", "back"):
            first, second = (front, back) if enter == "front" else (back, front)
            r1, r2 = signed_radius(first, True), signed_radius(second, False)
            inv = lambda r: 0.0 if r is None else 1.0 / r
            thin = 1.0 / ((n - 1.0) * (inv(r1) - inv(r2)))

            fod = build(r1, r2, n, t, H / 2, PARAX_OBJ_DIST)["analysis_results"]["parax_data"].fod
            ray_model = build(r1, r2, n, t, H / 2, RAY_START_DIST)
            heights = hf if enter == "front" or hb is None else hb
            cases.append({
                "name": name, "index": n, "front": face_json(front), "back": face_json(back),
                "thickness_mm": t, "height_mm": H, "enter": enter,
                "thin_lens_focal_mm": thin,
                "efl_mm": float(fod.efl),
                "bfl_mm": float(fod.bfl),
                # rayoptics' ffl is measured from the 1st vertex along +z; ours is measured back
                "front_focal_mm": float(-fod.ffl),
                "rays": [real_ray(ray_model, float(h), t) for h in heights],
            })
    out = {"source": f"rayoptics {rayoptics.__version__} (PyPI), python {sys.version.split()[0]}",
           "cases": cases}
    json.dump(out, sys.stdout, indent=1)
    print()


if __name__ == "__main__":
    main()
