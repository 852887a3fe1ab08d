//! Class sets: every group gets its own setting of every sheet, dealt from the
//! settings the sheet's kind allows with that sheet's seeded stream, and a
//! variant code of its own.

use super::{Lesson, SheetPlan};
use crate::paper::PaperSpec;
use crate::plan::Group;
use crate::plan::variants::{draw_code, sheet_stream, shuffle};

/// The plans of a class set, group by group.
#[derive(Clone, Debug, PartialEq)]
pub struct ClassPlan {
    /// The groups in order.
    pub groups: Vec<Group>,
    /// `plans[g]` holds group g's sheets in kit order.
    pub plans: Vec<Vec<SheetPlan>>,
    /// Things the teacher should know (a band too narrow for distinct variants…).
    pub notes: Vec<String>,
    /// The seed used.
    pub seed: u64,
}

/// Plans a class set: for each sheet, the settings its kind allows are
/// shuffled with that sheet's ChaCha8 stream and dealt to the groups in order,
/// so groups differ wherever the band has room; then each group–sheet gets a
/// unique variant code.
pub fn plan_class(lesson: &Lesson, paper: &PaperSpec, groups: Vec<Group>, seed: u64) -> ClassPlan {
    let mut notes = Vec::new();
    let mut plans: Vec<Vec<SheetPlan>> = vec![Vec::new(); groups.len()];
    for spec in &lesson.sheets {
        let prepared = spec.kind.def().prepare(&lesson.kit, spec, paper);
        let mut options = prepared.choices();
        notes.extend(prepared.notes(groups.len()));
        let mut rng = sheet_stream(seed, spec.number);
        shuffle(&mut rng, &mut options);
        let fallback = options.is_empty().then(|| prepared.plan(None));
        for (g, group) in groups.iter().enumerate() {
            let mut plan = match options.get(g % options.len().max(1)) {
                Some(o) => prepared.plan(Some(o)),
                None => fallback.clone().expect("made when there are no options"),
            };
            plan.group = Some(group.name.clone());
            super::attach(&mut plan, spec);
            plans[g].push(plan);
        }
    }
    let mut codes_rng = sheet_stream(seed, 0);
    let mut used = std::collections::BTreeSet::new();
    for group_plans in &mut plans {
        for p in group_plans.iter_mut() {
            let code = loop {
                let c = draw_code(&mut codes_rng);
                if used.insert(c.clone()) {
                    break c;
                }
            };
            p.variant = Some(code);
        }
    }
    ClassPlan { groups, plans, notes, seed }
}
