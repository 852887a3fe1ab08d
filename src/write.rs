//! Writing a build to disk: every file to a temporary name, then renamed into
//! place; files raysheet did not write are never overwritten without `--force`.

use std::collections::BTreeSet;
use std::fs;
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

fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), WriteError> {
    let parent = path.parent().unwrap_or(Path::new("."));
    fs::create_dir_all(parent).map_err(|e| io(parent, "create the folder", e))?;
    let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    let tmp = parent.join(format!(".{name}.part-{}", std::process::id()));
    let result = (|| {
        let mut f = fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        fs::rename(&tmp, path)
    })();
    if let Err(e) = result {
        let _ = fs::remove_file(&tmp);
        return Err(io(path, "write", e));
    }
    Ok(())
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
