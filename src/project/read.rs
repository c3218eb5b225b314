//! Reading user files defensively. A project may come from a stranger (CI on
//! a pull request), so every read goes through here:
//!
//! - only regular files are read (`/dev/zero`, FIFOs and `/proc` entries
//!   would grow without end or block);
//! - every file, and the decompressed text of a gzipped SBML file, is
//!   capped at [`max_input_size`] bytes (default
//!   [`DEFAULT_MAX_INPUT_SIZE`], settable with `--max-input-size`);
//! - text that is not UTF-8 is reported with the line and column of the
//!   first bad byte and a guess at the encoding it is in;
//! - [`Confinement`] keeps every path inside the project folder (or a
//!   folder named on the command line), with symlinks followed.

use crate::error::Diagnostic;
use std::io::Read;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

/// Default cap on one input file and on decompressed SBML: 256 MiB, about
/// nine times the largest published genome-scale SBML model we test with
/// (Recon3D, 29 MB uncompressed).
pub const DEFAULT_MAX_INPUT_SIZE: u64 = 256 * 1024 * 1024;

static MAX_INPUT_SIZE: AtomicU64 = AtomicU64::new(DEFAULT_MAX_INPUT_SIZE);

/// The cap in force, in bytes.
pub fn max_input_size() -> u64 {
    MAX_INPUT_SIZE.load(Ordering::Relaxed)
}

/// Change the cap for the rest of the process (the CLI's `--max-input-size`).
pub fn set_max_input_size(bytes: u64) {
    MAX_INPUT_SIZE.store(bytes.max(1), Ordering::Relaxed);
}

/// Parse a size such as `512M`, `2G`, `64k` or `1000000` (bytes; binary
/// multiples).
pub fn parse_size(text: &str) -> Result<u64, String> {
    let t = text.trim();
    let split = t.find(|c: char| !c.is_ascii_digit()).unwrap_or(t.len());
    let (digits, unit) = t.split_at(split);
    let number: u64 = digits
        .parse()
        .map_err(|_| format!("expected a size such as `256M` or `2G`, found `{text}`"))?;
    let factor: u64 = match unit.trim().to_ascii_lowercase().as_str() {
        "" | "b" => 1,
        "k" | "kb" | "kib" => 1 << 10,
        "m" | "mb" | "mib" => 1 << 20,
        "g" | "gb" | "gib" => 1 << 30,
        _ => return Err(format!("unknown size unit `{unit}`; expected k, M or G")),
    };
    number
        .checked_mul(factor)
        .filter(|n| *n > 0)
        .ok_or_else(|| format!("size `{text}` is out of range"))
}

/// Human-readable byte count for messages: `1,371 bytes`, `256 MiB`.
pub fn describe_size(bytes: u64) -> String {
    if bytes >= 1 << 20 && bytes % (1 << 20) == 0 {
        format!("{} MiB", group(bytes >> 20))
    } else {
        format!("{} bytes", group(bytes))
    }
}

/// Digits grouped by thousands: 1371 → `1,371`.
pub fn group(n: u64) -> String {
    let digits = n.to_string();
    let mut out = String::new();
    for (i, c) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(c);
    }
    out
}

fn too_large(path: &Path, what: &str) -> Diagnostic {
    Diagnostic::new(
        path,
        format!(
            "{what} is larger than the input size limit of {}",
            describe_size(max_input_size())
        ),
    )
    .hint("raise the limit with --max-input-size (e.g. --max-input-size 1G) if the file is genuine")
}

thread_local! {
    /// The confinement of the project being loaded on this thread, if any.
    static ACTIVE: std::cell::RefCell<Option<Confinement>> = const { std::cell::RefCell::new(None) };
}

/// Run `f` with every [`read_bytes`] on this thread confined to `confinement`
/// (the loader sets it for a whole project load, so no path can slip past).
pub fn confined<T>(confinement: Confinement, f: impl FnOnce() -> T) -> T {
    struct Restore(Option<Confinement>);
    impl Drop for Restore {
        fn drop(&mut self) {
            let previous = self.0.take();
            ACTIVE.with(|a| *a.borrow_mut() = previous);
        }
    }
    let previous = ACTIVE.with(|a| a.borrow_mut().replace(confinement));
    let _restore = Restore(previous);
    f()
}

/// Check `path` against the active confinement (no-op without one);
/// returns the path to open.
pub fn check_confined(path: &Path) -> Result<PathBuf, Diagnostic> {
    ACTIVE.with(|a| match a.borrow().as_ref() {
        None => Ok(path.to_path_buf()),
        Some(c) => c.resolve(path).map_err(|why| {
            let d = Diagnostic::new(path, why.clone());
            if why == "not found" {
                not_found(path)
            } else {
                d.hint(Confinement::hint())
            }
        }),
    })
}

/// Read a whole regular file, at most [`max_input_size`] bytes, inside the
/// active confinement.
pub fn read_bytes(path: &Path) -> Result<Vec<u8>, Diagnostic> {
    let real = check_confined(path)?;
    // Checked before opening too: opening a FIFO for reading blocks until
    // some writer appears.
    let not_regular = || {
        Diagnostic::new(
            path,
            "not a regular file (devices, pipes and folders are not read)",
        )
    };
    match std::fs::metadata(&real) {
        Ok(meta) if !meta.is_file() => return Err(not_regular()),
        Ok(_) => {}
        Err(e) => return Err(open_error(path, &e)),
    }
    let file = std::fs::File::open(&real).map_err(|e| open_error(path, &e))?;
    // Checked on the opened handle, so a swap after the check cannot matter.
    let meta = file.metadata().map_err(|e| open_error(path, &e))?;
    if !meta.is_file() {
        return Err(not_regular());
    }
    let limit = max_input_size();
    if meta.len() > limit {
        return Err(too_large(path, "the file"));
    }
    let mut bytes = Vec::with_capacity(meta.len() as usize);
    // `take` guards against a file that grows while it is read.
    file.take(limit + 1)
        .read_to_end(&mut bytes)
        .map_err(|e| open_error(path, &e))?;
    if bytes.len() as u64 > limit {
        return Err(too_large(path, "the file"));
    }
    Ok(bytes)
}

/// Read a regular file as UTF-8 text (a leading byte-order mark is dropped).
pub fn read_text(path: &Path) -> Result<String, Diagnostic> {
    decode_utf8(read_bytes(path)?, path)
}

/// "file not found", with the nearest existing file name as a hint.
fn not_found(path: &Path) -> Diagnostic {
    let d = Diagnostic::new(path, "file not found");
    match similar_file(path) {
        Some(name) => d.hint(format!("did you mean `{name}`?")),
        None => d,
    }
}

/// The name of an existing entry of `path`'s folder nearest to its file
/// name (a typo in a file name), when one is close. Only a folder the
/// active confinement allows is listed, so no name from outside the
/// project reaches a message.
pub fn similar_file(path: &Path) -> Option<String> {
    /// Entries looked at, so a huge folder stays cheap.
    const MAX_ENTRIES: usize = 10_000;
    let name = path.file_name()?.to_str()?;
    let folder = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p,
        _ => Path::new("."),
    };
    let folder = check_confined(folder).ok()?;
    let names: Vec<String> = std::fs::read_dir(folder)
        .ok()?
        .take(MAX_ENTRIES)
        .filter_map(|e| e.ok()?.file_name().into_string().ok())
        .filter(|n| !n.starts_with('.'))
        .collect();
    super::schema::did_you_mean(name, names.iter().map(String::as_str)).map(str::to_string)
}

fn open_error(path: &Path, e: &std::io::Error) -> Diagnostic {
    if e.kind() == std::io::ErrorKind::NotFound {
        return not_found(path);
    }
    let message = match e.kind() {
        std::io::ErrorKind::PermissionDenied => "permission denied".to_string(),
        _ => format!("cannot read file: {e}"),
    };
    Diagnostic::new(path, message)
}

/// UTF-8 text from bytes, or a diagnostic at the first bad byte that says
/// which encoding the bytes look like.
pub fn decode_utf8(bytes: Vec<u8>, path: &Path) -> Result<String, Diagnostic> {
    match String::from_utf8(bytes) {
        Ok(mut text) => {
            if text.starts_with('\u{feff}') {
                text.drain(..3);
            }
            Ok(text)
        }
        Err(e) => {
            let bytes = e.as_bytes();
            let offset = e.utf8_error().valid_up_to();
            let (line, column) = line_column(bytes, offset);
            Err(Diagnostic::new(
                path,
                format!(
                    "the file is not valid UTF-8 text: byte 0x{:02X} at offset {offset}",
                    bytes[offset]
                ),
            )
            .at(line, column)
            .hint(encoding_guess(bytes)))
        }
    }
}

/// 1-based line and column (in characters of the valid prefix) of `offset`.
pub fn line_column(bytes: &[u8], offset: usize) -> (usize, usize) {
    let before = &bytes[..offset.min(bytes.len())];
    let line = before.iter().filter(|&&b| b == b'\n').count() + 1;
    let line_start = before
        .iter()
        .rposition(|&b| b == b'\n')
        .map_or(0, |i| i + 1);
    let column = String::from_utf8_lossy(&before[line_start..])
        .chars()
        .count()
        + 1;
    (line, column)
}

fn encoding_guess(bytes: &[u8]) -> String {
    let utf16 = bytes.starts_with(&[0xFF, 0xFE]) || bytes.starts_with(&[0xFE, 0xFF]) || {
        // Mostly-ASCII UTF-16 has a zero byte in every other position.
        let sample = &bytes[..bytes.len().min(512)];
        let zeros = sample.iter().filter(|&&b| b == 0).count();
        sample.len() >= 4 && zeros * 3 >= sample.len()
    };
    if utf16 {
        "the file looks like UTF-16; save it as UTF-8".to_string()
    } else {
        "the file looks like Latin-1 or Windows-1252; save it as UTF-8".to_string()
    }
}

/// Gunzip `bytes` (all members), stopping with an error once the output
/// exceeds [`max_input_size`] — a small gzip can expand a thousandfold.
pub fn gunzip(bytes: &[u8], path: &Path) -> Result<Vec<u8>, Diagnostic> {
    let limit = max_input_size();
    let mut out = Vec::new();
    flate2::read::MultiGzDecoder::new(bytes)
        .take(limit + 1)
        .read_to_end(&mut out)
        .map_err(|e| Diagnostic::new(path, format!("cannot decompress the gzip data: {e}")))?;
    if out.len() as u64 > limit {
        return Err(too_large(path, "the decompressed SBML"));
    }
    Ok(out)
}

/// The folders a project's files must stay in, with symlinks resolved.
#[derive(Debug, Clone)]
pub struct Confinement {
    roots: Vec<PathBuf>,
}

impl Confinement {
    /// The project folder plus any folders allowed on the command line.
    /// Folders that do not exist are left out (nothing can be inside them).
    pub fn new(project_root: &Path, allowed: &[PathBuf]) -> Confinement {
        let root = if project_root.as_os_str().is_empty() {
            Path::new(".")
        } else {
            project_root
        };
        let roots = std::iter::once(root)
            .chain(allowed.iter().map(PathBuf::as_path))
            .filter_map(|p| std::fs::canonicalize(p).ok())
            .collect();
        Confinement { roots }
    }

    /// The canonical form of `path` when it exists and lies inside one of
    /// the roots; otherwise a message saying why it is refused.
    pub fn resolve(&self, path: &Path) -> Result<PathBuf, String> {
        let real = std::fs::canonicalize(path).map_err(|e| match e.kind() {
            std::io::ErrorKind::NotFound => "not found".to_string(),
            _ => format!("cannot resolve the path: {e}"),
        })?;
        if self.roots.iter().any(|root| real.starts_with(root)) {
            Ok(real)
        } else {
            Err(
                "resolves (symlinks followed) to a place outside the project folder; \
                 refusing to read it"
                    .to_string(),
            )
        }
    }

    /// The canonical folders allowed.
    pub fn roots(&self) -> &[PathBuf] {
        &self.roots
    }

    /// Hint for a refused path.
    pub fn hint() -> &'static str {
        "keep the project's files inside its folder, or allow another folder with --allow-dir"
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sizes_parse_with_binary_units() {
        assert_eq!(parse_size("256M"), Ok(256 << 20));
        assert_eq!(parse_size("2G"), Ok(2 << 30));
        assert_eq!(parse_size("64k"), Ok(64 << 10));
        assert_eq!(parse_size("1000"), Ok(1000));
        assert!(parse_size("0").is_err());
        assert!(parse_size("12 parsecs").is_err());
        assert!(parse_size("99999999999999999999G").is_err());
        assert_eq!(group(1371), "1,371");
        assert_eq!(group(999), "999");
        assert_eq!(describe_size(DEFAULT_MAX_INPUT_SIZE), "256 MiB");
    }

    #[test]
    fn bad_utf8_is_located_and_the_encoding_guessed() {
        let path = Path::new("m.yaml");
        // "id: caf\xe9" in Latin-1 on line 2.
        let d = decode_utf8(b"format: x\nid: caf\xe9\n".to_vec(), path).unwrap_err();
        assert_eq!((d.line, d.column), (Some(2), Some(8)));
        assert!(d.message.contains("0xE9"), "{}", d.message);
        assert!(d.hint.unwrap().contains("Latin-1"));
        let utf16: Vec<u8> = [0xFF, 0xFE]
            .into_iter()
            .chain("id: x\n".bytes().flat_map(|b| [b, 0]))
            .collect();
        let d = decode_utf8(utf16, path).unwrap_err();
        assert_eq!((d.line, d.column), (Some(1), Some(1)));
        assert!(d.hint.unwrap().contains("UTF-16"));
    }

    #[test]
    fn gunzip_stops_at_the_limit() {
        use std::io::Write;
        let mut gz = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::fast());
        gz.write_all(&vec![b'a'; 4096]).unwrap();
        let bytes = gz.finish().unwrap();
        assert_eq!(gunzip(&bytes, Path::new("m.xml.gz")).unwrap().len(), 4096);
    }

    #[cfg(unix)]
    #[test]
    fn devices_and_pipes_are_not_read() {
        let d = read_bytes(Path::new("/dev/zero")).unwrap_err();
        assert!(d.message.contains("not a regular file"), "{}", d.message);
        // A FIFO would block the open until a writer came.
        let dir = tempfile::tempdir().unwrap();
        let fifo = dir.path().join("note.md");
        let made = std::process::Command::new("mkfifo").arg(&fifo).status();
        if made.is_ok_and(|s| s.success()) {
            let d = read_bytes(&fifo).unwrap_err();
            assert!(d.message.contains("not a regular file"), "{}", d.message);
        }
    }

    #[cfg(unix)]
    #[test]
    fn confinement_follows_symlinks() {
        let dir = tempfile::tempdir().unwrap();
        let project = dir.path().join("p");
        std::fs::create_dir(&project).unwrap();
        std::fs::write(dir.path().join("secret"), "x").unwrap();
        std::fs::write(project.join("ok.md"), "x").unwrap();
        std::os::unix::fs::symlink(dir.path().join("secret"), project.join("link.md")).unwrap();
        let c = Confinement::new(&project, &[]);
        assert!(c.resolve(&project.join("ok.md")).is_ok());
        assert!(c.resolve(&project.join("link.md")).is_err());
        assert!(c.resolve(&project.join("../secret")).is_err());
        let wider = Confinement::new(&project, &[dir.path().to_path_buf()]);
        assert!(wider.resolve(&project.join("link.md")).is_ok());
        // The same rule holds for every read while a confinement is active.
        let refused = confined(c, || read_bytes(&project.join("link.md"))).unwrap_err();
        assert!(refused.message.contains("outside the project folder"));
        assert!(refused.hint.unwrap().contains("--allow-dir"));
        assert_eq!(read_bytes(&project.join("link.md")).unwrap(), b"x");
    }
}
