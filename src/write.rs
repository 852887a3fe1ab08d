//! Writing a build to disk: every file to a temporary name, then renamed into
//! place; files raysheet did not write are never overwritten without `--force`.
//! Nothing is written through a symbolic link: a subfolder or a file that is a
//! link is refused before anything is written, and temporary files are created
//! new (never opened if something, a link included, is already there) under
//! names no other program can guess.

use std::collections::BTreeSet;
use std::fs;
use std::hash::{BuildHasher, Hasher};
use std::io::Write;
use std::path::{Path, PathBuf};

use raysheet::output::Output;

/// The list of files raysheet wrote into a folder, one relative path a line.
pub const MANIFEST: &str = ".raysheet-files";

/// Why writing failed.
pub enum WriteError {
    /// Writing would overwrite the user's files (exit 2).
    Refused(String),
    /// The file system said no (exit 1).
    Io(String),
}

fn io(path: &Path, what: &str, e: std::io::Error) -> WriteError {
    WriteError::Io(format!("{}: cannot {what}: {e}", path.display()))
}

fn read_manifest(dir: &Path) -> BTreeSet<String> {
    fs::read_to_string(dir.join(MANIFEST))
        .map(|s| s.lines().map(str::to_string).collect())
        .unwrap_or_default()
}

/// Whether `path` itself is a symbolic link (not followed).
fn is_link(path: &Path) -> bool {
    fs::symlink_metadata(path).is_ok_and(|m| m.file_type().is_symlink())
}

/// 64 bits no other program can predict: std's per-process random hash keys
/// (from the operating system's random source), mixed with the process id,
/// the time and a counter.
fn unpredictable() -> u64 {
    static COUNTER: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(0);
    let mut h = std::collections::hash_map::RandomState::new().build_hasher();
    h.write_u32(std::process::id());
    h.write_u64(COUNTER.fetch_add(1, std::sync::atomic::Ordering::Relaxed));
    if let Ok(t) = std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH) {
        h.write_u128(t.as_nanos());
    }
    h.finish()
}

/// Ending of raysheet's temporary files.
const PART: &str = ".raysheet-part";

/// Opens `path` for writing only if nothing is there yet: an existing file or
/// symbolic link (even a dangling one) is an error, never followed.
fn open_new(path: &Path) -> std::io::Result<fs::File> {
    fs::OpenOptions::new().write(true).create_new(true).open(path)
}

/// A new temporary file beside `name` in `parent`: `.NAME.<16 hex digits>.raysheet-part`.
fn create_temp(parent: &Path, name: &str) -> std::io::Result<(PathBuf, fs::File)> {
    let mut last = None;
    for _ in 0..8 {
        let tmp = parent.join(format!(".{name}.{:016x}{PART}", unpredictable()));
        match open_new(&tmp) {
            Ok(f) => return Ok((tmp, f)),
            Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => last = Some(e),
            Err(e) => return Err(e),
        }
    }
    Err(last.unwrap_or_else(|| std::io::Error::other("no free temporary name")))
}

fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), WriteError> {
    let parent = path.parent().unwrap_or(Path::new("."));
    fs::create_dir_all(parent).map_err(|e| io(parent, "create the folder", e))?;
    if is_link(parent) || is_link(path) {
        return Err(link_refused(if is_link(parent) { parent } else { path }));
    }
    let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    let (tmp, mut f) = create_temp(parent, &name).map_err(|e| io(path, "create a temporary file for", e))?;
    // rename replaces whatever is at `path` (a link included) and never follows it.
    let result = f.write_all(bytes).and_then(|()| f.sync_all()).and_then(|()| fs::rename(&tmp, path));
    if let Err(e) = result {
        let _ = fs::remove_file(&tmp);
        return Err(io(path, "write", e));
    }
    Ok(())
}

fn link_refused(path: &Path) -> WriteError {
    WriteError::Refused(format!(
        "{}: is a symbolic link; raysheet writes only real files and folders inside the output folder and does not follow links there; nothing was written. Remove the link, or give another --out",
        path.display()
    ))
}

/// Writes every output under `dir`. Refuses, before writing anything, when a
/// file it would write exists and is not in the folder's manifest (unless `force`).
pub fn write_all(dir: &Path, files: &[Output], force: bool) -> Result<Vec<PathBuf>, WriteError> {
    if dir.exists() && !dir.is_dir() {
        return Err(WriteError::Refused(format!(
            "{}: exists and is not a folder; give another --out",
            dir.display()
        )));
    }
    let ours = read_manifest(dir);
    if !force {
        let clash: Vec<&str> = files
            .iter()
            .map(|f| f.path.as_str())
            .filter(|p| dir.join(p).exists() && !ours.contains(*p))
            .collect();
        if let Some(first) = clash.first() {
            return Err(WriteError::Refused(format!(
                "{}: {} file(s) there were not written by raysheet (first: {first}); nothing was written. Use another --out folder, or --force to overwrite them",
                dir.display(),
                clash.len()
            )));
        }
    }
    // Every folder the outputs need must be a folder (or not exist yet):
    // checked before anything is written.
    let mut folders: BTreeSet<PathBuf> = BTreeSet::new();
    for f in files {
        let mut p = dir.join(&f.path);
        while p.pop() && p.starts_with(dir) && p != dir {
            folders.insert(p.clone());
        }
    }
    // No subfolder and no file raysheet writes may be a symbolic link: it
    // could send the bytes outside the output folder.
    let targets = files.iter().map(|f| dir.join(&f.path)).chain([dir.join(MANIFEST)]);
    if let Some(link) = folders.iter().cloned().chain(targets).find(|p| is_link(p)) {
        return Err(link_refused(&link));
    }
    for folder in &folders {
        if folder.exists() && !folder.is_dir() {
            return Err(WriteError::Refused(format!(
                "{}: exists and is not a folder, but raysheet needs a folder there; move it or give another --out",
                folder.display()
            )));
        }
    }
    fs::create_dir_all(dir).map_err(|e| io(dir, "create the folder", e))?;
    for folder in &folders {
        fs::create_dir_all(folder).map_err(|e| io(folder, "create the folder", e))?;
    }
    // Claim every output in the manifest first, so a build that fails midway
    // never leaves files the next build would refuse as the user's.
    let mut manifest: BTreeSet<String> = ours;
    manifest.extend(files.iter().map(|f| f.path.clone()));
    let list: String = manifest.iter().map(|p| format!("{p}\n")).collect();
    write_atomic(&dir.join(MANIFEST), list.as_bytes())?;
    let mut written = Vec::new();
    for f in files {
        let path = dir.join(&f.path);
        write_atomic(&path, &f.bytes)?;
        written.push(path);
    }
    Ok(written)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Issue 12, finding 3: temporary files were opened with `File::create`
    /// under a predictable name, so a link planted there sent the bytes elsewhere.
    #[cfg(unix)]
    #[test]
    fn symlink_temporary_file_written_through() {
        let tmp = tempfile::tempdir().unwrap();
        let victim = tmp.path().join("victim.txt");
        fs::write(&victim, "teacher's file").unwrap();
        let planted = tmp.path().join(".answers.json.part");
        std::os::unix::fs::symlink(&victim, &planted).unwrap();
        let err = open_new(&planted).unwrap_err();
        assert_eq!(err.kind(), std::io::ErrorKind::AlreadyExists);
        // A dangling link is not followed either.
        let dangling = tmp.path().join(".keys.pdf.part");
        std::os::unix::fs::symlink(tmp.path().join("nowhere"), &dangling).unwrap();
        assert!(open_new(&dangling).is_err());
        assert!(!tmp.path().join("nowhere").exists());
        assert_eq!(fs::read_to_string(&victim).unwrap(), "teacher's file");
        // Names differ from call to call.
        let (a, _) = create_temp(tmp.path(), "answers.json").unwrap();
        let (b, _) = create_temp(tmp.path(), "answers.json").unwrap();
        assert_ne!(a, b);
        let name = a.file_name().unwrap().to_string_lossy().into_owned();
        assert!(name.starts_with(".answers.json.") && name.ends_with(PART), "{name}");
    }
}
