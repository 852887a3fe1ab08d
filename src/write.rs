//! Writing a set of files (a build, or the shipped templates) into the output
//! folder, all or nothing.
//!
//! - **Staging.** Every file is first written into `DIR/.raysheet-staging/`,
//!   and the whole set is then synced at once (one `syncfs` on Linux, not one
//!   `fsync` per file); until then the folder's files are untouched.
//! - **Commit point.** A journal, `DIR/.raysheet-commit`, is written atomically:
//!   the new manifest and the earlier files to remove. From here on the new set
//!   wins: every staged file is renamed into place, earlier files of the same
//!   kind of set that this one no longer has are removed, the manifest is
//!   written, and the journal and the staging folder are removed.
//! - **Recovery.** The next run into the folder finds a journal and finishes the
//!   steps (each can be done twice), or finds a staging folder without a journal
//!   and removes it. So a stop at any moment leaves the old set or the new one.
//! - **The teacher's files.** The manifest, `DIR/.raysheet-files`, records the
//!   SHA-256 of every file raysheet wrote. A file that is not listed, or whose
//!   bytes changed since, is the teacher's: never overwritten without `--force`,
//!   never removed.
//! - **Links.** Nothing is written through a symbolic link: a subfolder or a
//!   file that is a link is refused before anything is written, and files are
//!   created new (never opened if something, a link included, is already there).

use std::collections::{BTreeMap, BTreeSet};
use std::fs;
use std::hash::{BuildHasher, Hasher};
use std::io::Write;
use std::path::{Component, Path, PathBuf};

use raysheet::kit::sha256_hex;
use raysheet::output::Output;

/// The list of files raysheet wrote into a folder, with their SHA-256.
pub const MANIFEST: &str = ".raysheet-files";
/// The journal of a set being moved into place.
const JOURNAL: &str = ".raysheet-commit";
/// The folder a set is written into before it is moved into place.
const STAGING: &str = ".raysheet-staging";
/// Ending of the temporary files of earlier raysheet versions, which wrote
/// `.NAME.<16 hex digits>.raysheet-part` beside each file.
const PART: &str = ".raysheet-part";
/// First line of the manifest and of the journal.
const HEADER: &str =
    "# raysheet 2: the files raysheet wrote here (set, SHA-256, path); a changed file is left alone";

/// Why writing failed.
pub enum WriteError {
    /// Writing would overwrite the user's files (exit 2).
    Refused(String),
    /// The file system said no (exit 1).
    Io(String),
}

/// What was written, and what the teacher should know about it.
pub struct Written {
    /// Every file of the new set, in the order given.
    pub paths: Vec<PathBuf>,
    /// Notes: an unfinished earlier build finished or rolled back, earlier
    /// files removed or left because the teacher changed them.
    pub notes: Vec<String>,
}

fn io(path: &Path, what: &str, e: std::io::Error) -> WriteError {
    WriteError::Io(format!("{}: cannot {what}: {e}", path.display()))
}

/// Whether `path` itself is a symbolic link (not followed).
fn is_link(path: &Path) -> bool {
    fs::symlink_metadata(path).is_ok_and(|m| m.file_type().is_symlink())
}

/// A file's SHA-256 as it is on disk now; `None` when it is not a regular file
/// (missing, a folder, a link) or cannot be read.
fn hash_on_disk(path: &Path) -> Option<String> {
    let meta = fs::symlink_metadata(path).ok()?;
    if !meta.file_type().is_file() {
        return None;
    }
    fs::read(path).ok().map(|b| sha256_hex(&b))
}

/// One manifest line: which kind of set wrote the file, its hash, its path.
#[derive(Clone, Debug, PartialEq, Eq)]
struct Entry {
    set: String,
    hash: String,
    path: String,
}

/// The manifest (or the journal's part of it): path → entry.
type Manifest = BTreeMap<String, Entry>;

fn manifest_text(m: &Manifest) -> String {
    let mut s = format!("{HEADER}\n");
    for e in m.values() {
        s.push_str(&format!("{} {} {}\n", e.set, e.hash, e.path));
    }
    s
}

/// Reads a manifest. Lines of an earlier version (a bare path, no hash) come
/// back with an empty hash: such a file is never taken for raysheet's.
fn parse_entries<'a>(lines: impl Iterator<Item = &'a str>) -> Manifest {
    let mut m = Manifest::new();
    for line in lines {
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let mut parts = line.splitn(3, ' ');
        let entry = match (parts.next(), parts.next(), parts.next()) {
            (Some(set), Some(hash), Some(path))
                if hash.len() == 64 && hash.bytes().all(|b| b.is_ascii_hexdigit()) =>
            {
                Entry { set: set.to_string(), hash: hash.to_string(), path: path.to_string() }
            }
            _ => Entry { set: String::new(), hash: String::new(), path: line.to_string() },
        };
        m.insert(entry.path.clone(), entry);
    }
    m
}

fn read_manifest(dir: &Path) -> Manifest {
    fs::read_to_string(dir.join(MANIFEST)).map(|s| parse_entries(s.lines())).unwrap_or_default()
}

/// The journal: the new manifest, then `remove HASH PATH` for every earlier file
/// to remove (only if its bytes still have that hash).
struct Journal {
    manifest: Manifest,
    remove: Vec<(String, String)>,
}

impl Journal {
    fn text(&self) -> String {
        let mut s = manifest_text(&self.manifest);
        for (hash, path) in &self.remove {
            s.push_str(&format!("remove {hash} {path}\n"));
        }
        s
    }

    fn parse(text: &str) -> Journal {
        let (remove, keep): (Vec<&str>, Vec<&str>) = text.lines().partition(|l| l.starts_with("remove "));
        let remove = remove
            .iter()
            .filter_map(|l| {
                let mut p = l.splitn(3, ' ').skip(1);
                Some((p.next()?.to_string(), p.next()?.to_string()))
            })
            .collect();
        Journal { manifest: parse_entries(keep.into_iter()), remove }
    }
}

/// Counts the steps that change the folder, so that a test can stop the
/// writing after any of them, as a kill would.
struct Steps {
    stop_after: Option<usize>,
    done: usize,
}

impl Steps {
    fn all() -> Steps {
        Steps { stop_after: None, done: 0 }
    }

    /// Called before each change; an error once the allowance is used up.
    fn next(&mut self) -> std::io::Result<()> {
        if self.stop_after.is_some_and(|n| self.done >= n) {
            return Err(std::io::Error::other("stopped (test)"));
        }
        self.done += 1;
        Ok(())
    }

    fn stopped(&self) -> bool {
        self.stop_after.is_some_and(|n| self.done >= n)
    }
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

/// Writes one small file (the journal, the manifest) by a new temporary file
/// renamed into place.
fn write_atomic(path: &Path, bytes: &[u8], steps: &mut Steps) -> Result<(), WriteError> {
    let parent = path.parent().unwrap_or(Path::new("."));
    if is_link(path) {
        return Err(link_refused(path));
    }
    let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    steps.next().map_err(|e| io(path, "write", e))?;
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

/// Whether a relative path stays inside the folder: plain names only, no
/// `..`, no root, no drive, and not one of raysheet's own bookkeeping names.
fn is_plain_relative(path: &str) -> bool {
    let p = Path::new(path);
    !path.is_empty()
        && p.components().all(|c| matches!(c, Component::Normal(_)))
        && ![MANIFEST, JOURNAL, STAGING].iter().any(|n| p.starts_with(n))
}

/// Removes every folder from `from` up to (not including) `dir` that is empty.
fn remove_empty_folders(dir: &Path, from: &Path) {
    let mut p = from.to_path_buf();
    while p.starts_with(dir) && p != dir {
        if fs::remove_dir(&p).is_err() {
            break;
        }
        p.pop();
    }
}

/// Carries out a journal: staged files into place, earlier files removed (only
/// those whose bytes are still raysheet's), the manifest, then the journal and
/// the staging folder removed. Every step can be done again after a stop.
fn apply_journal(dir: &Path, journal: &Journal, steps: &mut Steps) -> Result<(), WriteError> {
    let staging = dir.join(STAGING);
    // Folders made so far: each made once, not once per file in it.
    let mut made: BTreeSet<PathBuf> = BTreeSet::new();
    for path in journal.manifest.keys() {
        let from = staging.join(path);
        if !from.exists() {
            continue; // moved before a stop
        }
        let to = dir.join(path);
        let parent = to.parent().unwrap_or(dir);
        if !made.contains(parent) {
            fs::create_dir_all(parent).map_err(|e| io(parent, "create the folder", e))?;
            made.insert(parent.to_path_buf());
        }
        if is_link(parent) || is_link(&to) {
            return Err(link_refused(if is_link(parent) { parent } else { &to }));
        }
        steps.next().map_err(|e| io(&to, "move into place", e))?;
        fs::rename(&from, &to).map_err(|e| io(&to, "move into place", e))?;
    }
    for (hash, path) in &journal.remove {
        let target = dir.join(path);
        if hash_on_disk(&target).as_deref() == Some(hash.as_str()) {
            steps.next().map_err(|e| io(&target, "remove", e))?;
            fs::remove_file(&target).map_err(|e| io(&target, "remove", e))?;
            remove_empty_folders(dir, target.parent().unwrap_or(dir));
        }
    }
    write_atomic(&dir.join(MANIFEST), manifest_text(&journal.manifest).as_bytes(), steps)?;
    steps.next().map_err(|e| io(&staging, "remove", e))?;
    if staging.exists() {
        fs::remove_dir_all(&staging).map_err(|e| io(&staging, "remove", e))?;
    }
    steps.next().map_err(|e| io(&dir.join(JOURNAL), "remove", e))?;
    fs::remove_file(dir.join(JOURNAL)).map_err(|e| io(&dir.join(JOURNAL), "remove", e))?;
    Ok(())
}

/// Temporary files that earlier raysheet versions left behind when stopped,
/// in `dir` and in the folders of the files its manifest lists.
fn stale_parts(dir: &Path, manifest: &Manifest) -> Vec<PathBuf> {
    let mut folders: BTreeSet<PathBuf> = BTreeSet::from([dir.to_path_buf()]);
    for p in manifest.keys().filter(|p| is_plain_relative(p)) {
        if let Some(parent) = dir.join(p).parent() {
            folders.insert(parent.to_path_buf());
        }
    }
    let is_part = |name: &str| {
        // `.NAME.<16 hex>.raysheet-part`
        name.starts_with('.')
            && name
                .strip_suffix(PART)
                .and_then(|s| s.rsplit_once('.'))
                .is_some_and(|(_, hex)| hex.len() == 16 && hex.bytes().all(|b| b.is_ascii_hexdigit()))
    };
    let mut found = Vec::new();
    for folder in folders.iter().filter(|f| !is_link(f)) {
        let Ok(entries) = fs::read_dir(folder) else { continue };
        for e in entries.flatten() {
            let is_file = e.file_type().is_ok_and(|t| t.is_file());
            if is_file && is_part(&e.file_name().to_string_lossy()) {
                found.push(e.path());
            }
        }
    }
    found
}

/// Finishes or rolls back a set that an earlier run did not finish, and removes
/// temporary files earlier versions left. Says what it did.
fn recover(dir: &Path, steps: &mut Steps) -> Result<Vec<String>, WriteError> {
    let mut notes = Vec::new();
    let journal_path = dir.join(JOURNAL);
    let staging = dir.join(STAGING);
    for p in [&journal_path, &staging] {
        if is_link(p) {
            return Err(link_refused(p));
        }
    }
    if journal_path.exists() {
        let text = fs::read_to_string(&journal_path).map_err(|e| io(&journal_path, "read", e))?;
        apply_journal(dir, &Journal::parse(&text), steps)?;
        notes.push(format!(
            "{}: an earlier run was stopped while it moved its files into place; its files are now all there",
            dir.display()
        ));
    } else if staging.exists() {
        steps.next().map_err(|e| io(&staging, "remove", e))?;
        fs::remove_dir_all(&staging).map_err(|e| io(&staging, "remove", e))?;
        notes.push(format!(
            "{}: an earlier run was stopped before its files were complete; they were removed and the files before it kept",
            dir.display()
        ));
    }
    let parts = stale_parts(dir, &read_manifest(dir));
    if !parts.is_empty() {
        for p in &parts {
            steps.next().map_err(|e| io(p, "remove", e))?;
            fs::remove_file(p).map_err(|e| io(p, "remove", e))?;
        }
        notes.push(format!(
            "{}: removed {} unfinished temporary file(s) that an earlier stopped run left",
            dir.display(),
            parts.len()
        ));
    }
    Ok(notes)
}

/// Writes the set `files` (of kind `set`: "build", "templates") under `dir`,
/// all or nothing. Refuses, before writing anything, when a file it would write
/// exists and is not raysheet's with the bytes raysheet wrote (unless `force`).
/// Files of the same kind of set that an earlier run wrote and this one does
/// not are removed, if their bytes are still raysheet's.
pub fn write_all(dir: &Path, set: &str, files: &[Output], force: bool) -> Result<Written, WriteError> {
    write_steps(dir, set, files, force, &mut Steps::all())
}

fn write_steps(
    dir: &Path,
    set: &str,
    files: &[Output],
    force: bool,
    steps: &mut Steps,
) -> Result<Written, WriteError> {
    if is_link(dir) {
        return Err(link_refused(dir));
    }
    if dir.exists() && !dir.is_dir() {
        return Err(WriteError::Refused(format!(
            "{}: exists and is not a folder; give another --out",
            dir.display()
        )));
    }
    if let Some(bad) = files.iter().find(|f| !is_plain_relative(&f.path)) {
        return Err(WriteError::Io(format!(
            "{}: raysheet made an output path that would leave the output folder or use its own names ({:?}); nothing was written (a defect: please report it)",
            dir.display(),
            bad.path
        )));
    }
    let mut notes = if dir.is_dir() { recover(dir, steps)? } else { Vec::new() };
    let old = read_manifest(dir);
    let ours = |path: &str| {
        let p = dir.join(path);
        old.get(path)
            .is_some_and(|e| !e.hash.is_empty() && hash_on_disk(&p).as_deref() == Some(e.hash.as_str()))
    };
    // Every folder the outputs need must be a real folder (or not exist yet),
    // and no file raysheet writes may be a link: checked before anything is written.
    let mut folders: BTreeSet<PathBuf> = BTreeSet::new();
    for f in files {
        let mut p = dir.join(&f.path);
        while p.pop() && p.starts_with(dir) && p != dir {
            folders.insert(p.clone());
        }
    }
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
    if let Some(folder) = files.iter().map(|f| dir.join(&f.path)).find(|p| p.is_dir()) {
        return Err(WriteError::Refused(format!(
            "{}: is a folder, but raysheet writes a file there; move it or give another --out",
            folder.display()
        )));
    }
    if !force {
        let clash: Vec<&str> = files
            .iter()
            .map(|f| f.path.as_str())
            .filter(|p| fs::symlink_metadata(dir.join(p)).is_ok() && !ours(p))
            .collect();
        if let Some(first) = clash.first() {
            let why = if old.contains_key(*first) {
                "changed since raysheet wrote it"
            } else {
                "not written by raysheet"
            };
            return Err(WriteError::Refused(format!(
                "{}: {} file(s) there are the teacher's (first: {first}, {why}); nothing was written. Use another --out folder, or --force to overwrite them",
                dir.display(),
                clash.len()
            )));
        }
    }
    fs::create_dir_all(dir).map_err(|e| io(dir, "create the folder", e))?;

    // Stage: nothing the folder shows changes until the journal is written.
    let staging = dir.join(STAGING);
    let staged = stage(&staging, files, steps);
    if let Err(e) = staged {
        if !steps.stopped() {
            let _ = fs::remove_dir_all(&staging);
        }
        return Err(e);
    }

    // The new manifest: this set's files, plus the other sets' entries.
    let mut manifest: Manifest =
        old.iter().filter(|(_, e)| e.set != set).map(|(p, e)| (p.clone(), e.clone())).collect();
    for f in files {
        manifest.insert(
            f.path.clone(),
            Entry { set: set.to_string(), hash: sha256_hex(&f.bytes), path: f.path.clone() },
        );
    }
    let mut remove = Vec::new();
    for (path, e) in old.iter().filter(|(p, e)| e.set == set && !manifest.contains_key(*p)) {
        if !is_plain_relative(path) || fs::symlink_metadata(dir.join(path)).is_err() {
            continue;
        }
        if ours(path) {
            remove.push((e.hash.clone(), path.clone()));
        } else {
            notes.push(format!(
                "{}: left {path}, which an earlier run wrote and this one does not, because it changed since",
                dir.display()
            ));
        }
    }
    if !remove.is_empty() {
        notes.push(format!(
            "{}: removed {} file(s) an earlier run wrote that this one does not (first: {})",
            dir.display(),
            remove.len(),
            remove[0].1
        ));
    }
    let journal = Journal { manifest, remove };
    let journal_path = dir.join(JOURNAL);
    if let Err(e) = write_atomic(&journal_path, journal.text().as_bytes(), steps) {
        if !steps.stopped() {
            let _ = fs::remove_dir_all(&staging);
        }
        return Err(e);
    }
    // Committed: from here a stop is finished by the next run.
    apply_journal(dir, &journal, steps)?;
    Ok(Written { paths: files.iter().map(|f| dir.join(&f.path)).collect(), notes })
}

/// Writes every file into the staging folder, new, then makes them all durable
/// at once ([`sync_staged`]) before the caller writes the journal.
fn stage(staging: &Path, files: &[Output], steps: &mut Steps) -> Result<(), WriteError> {
    steps.next().map_err(|e| io(staging, "create the folder", e))?;
    fs::create_dir(staging).map_err(|e| io(staging, "create the folder", e))?;
    // Each folder is made once, not once per file in it.
    let mut made: BTreeSet<PathBuf> = BTreeSet::new();
    for f in files {
        let path = staging.join(&f.path);
        let parent = path.parent().unwrap_or(staging);
        if !made.contains(parent) {
            fs::create_dir_all(parent).map_err(|e| io(parent, "create the folder", e))?;
            made.insert(parent.to_path_buf());
        }
        steps.next().map_err(|e| io(&path, "write", e))?;
        let mut file = open_new(&path).map_err(|e| io(&path, "create", e))?;
        file.write_all(&f.bytes).map_err(|e| io(&path, "write", e))?;
    }
    sync_staged(staging, files).map_err(|e| io(staging, "sync", e))
}

/// Makes every staged file, and the folders that name them, durable, so that
/// the journal (the commit point) never names a file a power cut could lose.
///
/// On Linux one `syncfs` on the staging folder's file system does it for the
/// whole set: the kernel writes the set out and commits the file system's
/// journal once, where one `fsync` per file would wait for a journal commit per
/// file (a class set has hundreds of files). Elsewhere every file and folder of
/// the set is synced in turn.
#[cfg(target_os = "linux")]
fn sync_staged(staging: &Path, _files: &[Output]) -> std::io::Result<()> {
    let folder = fs::File::open(staging)?;
    rustix::fs::syncfs(&folder).map_err(std::io::Error::from)
}

/// See the Linux version: here each staged file and then each folder is synced.
#[cfg(not(target_os = "linux"))]
fn sync_staged(staging: &Path, files: &[Output]) -> std::io::Result<()> {
    let mut folders: BTreeSet<PathBuf> = BTreeSet::from([staging.to_path_buf()]);
    for f in files {
        let path = staging.join(&f.path);
        fs::File::open(&path)?.sync_all()?;
        let mut p = path;
        while p.pop() && p.starts_with(staging) {
            folders.insert(p.clone());
        }
    }
    // Folders can be opened and synced on Unix; Windows has no such call and
    // its file systems keep names with the file's own flush.
    if cfg!(unix) {
        for folder in folders.iter().rev() {
            fs::File::open(folder)?.sync_all()?;
        }
    }
    Ok(())
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

    fn out(path: &str, bytes: &str) -> Output {
        Output { path: path.to_string(), bytes: bytes.as_bytes().to_vec() }
    }

    /// Every regular file under `dir` but raysheet's bookkeeping, with its text.
    fn visible(dir: &Path) -> BTreeMap<String, String> {
        fn walk(root: &Path, d: &Path, into: &mut BTreeMap<String, String>) {
            for e in fs::read_dir(d).unwrap().flatten() {
                let p = e.path();
                if p.is_dir() {
                    walk(root, &p, into);
                } else {
                    let rel = p.strip_prefix(root).unwrap().to_string_lossy().replace('\\', "/");
                    into.insert(rel, fs::read_to_string(&p).unwrap());
                }
            }
        }
        let mut m = BTreeMap::new();
        walk(dir, dir, &mut m);
        m.remove(MANIFEST);
        m
    }

    fn expect(files: &[Output], extra: &[(&str, &str)]) -> BTreeMap<String, String> {
        files
            .iter()
            .map(|f| (f.path.clone(), String::from_utf8(f.bytes.clone()).unwrap()))
            .chain(extra.iter().map(|(a, b)| (a.to_string(), b.to_string())))
            .collect()
    }

    /// Issue 12, finding 6: a build stopped at any moment (a kill, a full disk)
    /// left a mix of two sets, or half a set beside a manifest listing files
    /// that were not there. Stopped after every possible step, then recovered
    /// by the next run, the folder holds exactly the old set or the new one,
    /// the teacher's own file is untouched, and nothing temporary is left.
    #[test]
    fn killed_build_leaves_old_or_new_set() {
        let old = vec![
            out("sheets.pdf", "old sheets"),
            out("groups/b/keys.pdf", "old b"),
            out("keep.json", "same"),
        ];
        let new = vec![
            out("sheets.pdf", "new sheets"),
            out("groups/c/keys.pdf", "new c"),
            out("keep.json", "same"),
        ];
        let teacher = ("notes.txt", "the teacher's notes");
        let (old_set, new_set) = (expect(&old, &[teacher]), expect(&new, &[teacher]));
        let mut total = None;
        for stop in 0.. {
            let tmp = tempfile::tempdir().unwrap();
            let dir = tmp.path().join("out");
            fs::create_dir(&dir).unwrap();
            fs::write(dir.join(teacher.0), teacher.1).unwrap();
            assert!(write_all(&dir, "build", &old, false).is_ok());
            let mut steps = Steps { stop_after: Some(stop), done: 0 };
            let finished = write_steps(&dir, "build", &new, false, &mut steps).is_ok();
            let seen = visible(&dir);
            if finished {
                total = Some(stop);
                assert_eq!(seen, new_set);
                break;
            }
            // Before recovery the folder may show bookkeeping; the next run
            // (writing nothing new: the same set again) finishes or rolls back.
            let again = write_all(&dir, "probe", &[], false);
            assert!(again.is_ok());
            let after = visible(&dir);
            assert!(after == old_set || after == new_set, "stopped after {stop} steps: {after:?}");
            assert!(!dir.join(STAGING).exists() && !dir.join(JOURNAL).exists());
            // The manifest lists exactly the set that is there, with its hashes.
            let m = read_manifest(&dir);
            for (path, e) in m.iter().filter(|(_, e)| e.set == "build") {
                assert_eq!(hash_on_disk(&dir.join(path)).as_deref(), Some(e.hash.as_str()), "{path}");
            }
        }
        assert!(total.unwrap() > 8, "the stop points cover staging, commit and moving");
    }

    /// Issue 12, finding 9: a manifest that listed a teacher's own `keys.pdf`
    /// (put there after a build) let the next build overwrite it. Only a file
    /// whose bytes still have the recorded hash is raysheet's.
    #[test]
    fn manifest_listed_teacher_file_overwritten() {
        let tmp = tempfile::tempdir().unwrap();
        let dir = tmp.path().join("out");
        assert!(write_all(&dir, "build", &[out("keys.pdf", "raysheet's")], false).is_ok());
        fs::write(dir.join("keys.pdf"), "the teacher's own keys").unwrap();
        let Err(WriteError::Refused(msg)) = write_all(&dir, "build", &[out("keys.pdf", "again")], false)
        else {
            panic!("a changed file is refused")
        };
        assert!(
            msg.contains("keys.pdf, changed since raysheet wrote it") && msg.contains("--force"),
            "{msg}"
        );
        assert_eq!(fs::read_to_string(dir.join("keys.pdf")).unwrap(), "the teacher's own keys");
        // A manifest of an earlier version (paths without hashes) proves nothing.
        fs::write(dir.join(MANIFEST), "keys.pdf\n").unwrap();
        assert!(write_all(&dir, "build", &[out("keys.pdf", "again")], false).is_err());
        assert!(write_all(&dir, "build", &[out("keys.pdf", "again")], true).is_ok());
        assert_eq!(fs::read_to_string(dir.join("keys.pdf")).unwrap(), "again");
    }

    /// Issue 9 ("rebuild removes earlier build's own files"): a class set
    /// rebuilt with fewer groups left the old groups' folders beside the new
    /// set. raysheet's unchanged files go, changed ones stay, other sets stay.
    #[test]
    fn rebuild_removes_only_its_own_unchanged_files() {
        let tmp = tempfile::tempdir().unwrap();
        let dir = tmp.path().join("out");
        let first =
            [out("groups/a/sheets.pdf", "a"), out("groups/b/sheets.pdf", "b"), out("groups/c/keys.pdf", "c")];
        assert!(write_all(&dir, "build", &first, false).is_ok());
        assert!(write_all(&dir, "templates", &[out("common.toml", "t")], false).is_ok());
        fs::write(dir.join("groups/c/keys.pdf"), "marked up by the teacher").unwrap();
        let w = write_all(&dir, "build", &[out("groups/a/sheets.pdf", "a2")], false).ok().unwrap();
        assert_eq!(
            visible(&dir),
            expect(
                &[out("groups/a/sheets.pdf", "a2"), out("common.toml", "t")],
                &[("groups/c/keys.pdf", "marked up by the teacher")]
            )
        );
        assert!(!dir.join("groups/b").exists(), "an emptied folder goes too");
        assert!(w.notes.iter().any(|n| n.contains("removed 1 file")), "{:?}", w.notes);
        assert!(w.notes.iter().any(|n| n.contains("left groups/c/keys.pdf")), "{:?}", w.notes);
        assert!(!read_manifest(&dir).contains_key("groups/c/keys.pdf"), "now the teacher's");
    }

    /// Issue 12, finding 6: killed builds of earlier versions left
    /// `.NAME.<hex>.raysheet-part` files that no later build removed.
    #[test]
    fn stale_part_files_never_removed() {
        let tmp = tempfile::tempdir().unwrap();
        let dir = tmp.path().join("out");
        assert!(write_all(&dir, "build", &[out("groups/a/keys.pdf", "k")], false).is_ok());
        let stale = [
            dir.join(".keys.pdf.0123456789abcdef.raysheet-part"),
            dir.join("groups/a/.x.pdf.fedcba9876543210.raysheet-part"),
        ];
        for s in &stale {
            fs::write(s, "half").unwrap();
        }
        let lookalike = dir.join(".notes.raysheet-part");
        fs::write(&lookalike, "the teacher's").unwrap();
        let w = write_all(&dir, "build", &[out("groups/a/keys.pdf", "k2")], false).ok().unwrap();
        assert!(stale.iter().all(|s| !s.exists()));
        assert!(lookalike.exists(), "only raysheet's own pattern is removed");
        assert!(w.notes.iter().any(|n| n.contains("removed 2 unfinished temporary file")), "{:?}", w.notes);
    }

    #[test]
    fn output_paths_that_leave_the_folder_are_refused() {
        let tmp = tempfile::tempdir().unwrap();
        let dir = tmp.path().join("out");
        for bad in ["../x.pdf", "/etc/x", "", ".raysheet-staging/x", "a/../../b"] {
            assert!(write_all(&dir, "build", &[out(bad, "x")], false).is_err(), "{bad}");
        }
        assert!(!dir.exists(), "nothing was written");
    }
}
