//! Building many reports at once: a rayon pool of `jobs` workers takes the
//! models largest first (so a big model does not start last and leave the
//! other cores idle), and a memory budget keeps the sum of the running
//! models' estimated peaks below a limit, so a machine with few gigabytes
//! runs fewer genome-scale models at once instead of swapping.

use super::digest::Digest;
use super::{relative_message, Entry};
use crate::project::Project;
use std::path::Path;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{Condvar, Mutex};
use std::time::Instant;

/// Peak resident memory of one build ≈ FIXED + PER_BYTE × model text size,
/// from peak RSS of single builds (`benches/collection.rs`, 2026-12-02):
/// e_coli_core (0.7 MB of XML) 12 MB, the strain models (≈ 10.6 MB) 89–108
/// MB, iLB1027_lipid (12.4 MB) 485 MB. The bound covers the worst of these
/// (its loop analysis keeps more in memory per byte), so it overestimates
/// most models: the budget errs on the side of not swapping.
const FIXED_BYTES: u64 = 16 << 20;
const PER_BYTE: u64 = 40;

/// How many models may run at once.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Limits {
    /// Worker threads (at least 1).
    pub jobs: usize,
    /// Bytes the running models' estimated peaks may add up to; `None`:
    /// no limit beyond `jobs`. A model estimated above the budget still
    /// runs, alone.
    pub memory_budget: Option<u64>,
}

impl Limits {
    /// `jobs` (default: the number of cores) and a budget (default: three
    /// quarters of the memory the system reports available).
    pub fn new(jobs: Option<usize>, memory_budget: Option<u64>) -> Limits {
        let cores = std::thread::available_parallelism().map_or(1, |n| n.get());
        Limits {
            jobs: jobs.unwrap_or(cores).max(1),
            memory_budget: memory_budget.or_else(|| available_memory().map(|m| m / 4 * 3)),
        }
    }
}

/// A memory size: bytes, or a number with K, M, G or T (powers of 1024;
/// a trailing `B`/`iB` is allowed), e.g. `4G`, `800MiB`.
pub fn parse_size(text: &str) -> std::result::Result<u64, String> {
    let t = text.trim();
    let t = t
        .strip_suffix("iB")
        .or_else(|| t.strip_suffix('B'))
        .unwrap_or(t);
    let (number, shift) = match t.char_indices().last() {
        Some((i, c)) if c.is_ascii_alphabetic() => {
            let shift = match c.to_ascii_uppercase() {
                'K' => 10,
                'M' => 20,
                'G' => 30,
                'T' => 40,
                _ => return Err(format!("unknown unit in `{text}` (use K, M, G or T)")),
            };
            (&t[..i], shift)
        }
        _ => (t, 0),
    };
    let value: f64 = number
        .trim()
        .parse()
        .map_err(|_| format!("expected a size such as 4G or 800M, found `{text}`"))?;
    if !(value.is_finite() && value > 0.0) {
        return Err(format!("the size must be positive, found `{text}`"));
    }
    Ok((value * (1u64 << shift) as f64) as u64)
}

/// `MemAvailable` from /proc/meminfo (Linux), in bytes.
fn available_memory() -> Option<u64> {
    let text = std::fs::read_to_string("/proc/meminfo").ok()?;
    let line = text.lines().find(|l| l.starts_with("MemAvailable:"))?;
    let kb: u64 = line.split_whitespace().nth(1)?.parse().ok()?;
    Some(kb * 1024)
}

/// Estimated peak memory of building the model at `path`.
pub fn estimate_memory(path: &Path) -> u64 {
    FIXED_BYTES + PER_BYTE * model_text_size(path)
}

/// Size of the model's text: uncompressed size of a `.gz` (its trailer),
/// the file size, or the files of a project folder.
fn model_text_size(path: &Path) -> u64 {
    if path.is_dir() {
        return std::fs::read_dir(path)
            .map(|entries| {
                entries
                    .filter_map(|e| e.ok()?.metadata().ok())
                    .filter(|m| m.is_file())
                    .map(|m| m.len())
                    .sum()
            })
            .unwrap_or(0);
    }
    let size = std::fs::metadata(path).map_or(0, |m| m.len());
    if path.to_string_lossy().to_ascii_lowercase().ends_with(".gz") && size >= 4 {
        if let Some(isize) = gzip_trailer_size(path, size) {
            // ISIZE is the size modulo 2³²: never below the file itself.
            return u64::from(isize).max(size);
        }
    }
    size
}

/// The last four bytes of a gzip file: uncompressed size mod 2³² (RFC 1952).
fn gzip_trailer_size(path: &Path, size: u64) -> Option<u32> {
    use std::io::{Read, Seek, SeekFrom};
    let mut file = std::fs::File::open(path).ok()?;
    file.seek(SeekFrom::Start(size - 4)).ok()?;
    let mut bytes = [0u8; 4];
    file.read_exact(&mut bytes).ok()?;
    Some(u32::from_le_bytes(bytes))
}

/// Memory reserved by the running models.
struct Budget {
    limit: Option<u64>,
    used: Mutex<u64>,
    freed: Condvar,
}

impl Budget {
    /// Waits until `want` fits (or nothing else runs), then reserves it.
    fn acquire(&self, want: u64) -> u64 {
        let Some(limit) = self.limit else {
            return 0;
        };
        let want = want.min(limit);
        let mut used = self.used.lock().unwrap_or_else(|e| e.into_inner());
        while *used > 0 && *used + want > limit {
            used = self.freed.wait(used).unwrap_or_else(|e| e.into_inner());
        }
        *used += want;
        want
    }

    fn release(&self, amount: u64) {
        let mut used = self.used.lock().unwrap_or_else(|e| e.into_inner());
        *used -= amount;
        self.freed.notify_all();
    }
}

/// What became of one model.
#[derive(Debug, Clone)]
pub struct ModelOutcome {
    pub entry: Entry,
    /// The digest of its report, or why there is none (a load error with
    /// file:line, a write error, an internal error).
    pub result: Result<Digest, String>,
    /// Wall time of its build, seconds.
    pub seconds: f64,
    pub estimated_memory: u64,
}

/// Builds every entry's report into `out/<name>/`; `root` is the
/// collection folder (stripped from error messages). Calls `progress` as
/// each model finishes (from the worker threads). The outcomes keep the
/// order of `entries`.
pub fn build_models(
    entries: &[Entry],
    root: &Path,
    out: &Path,
    limits: Limits,
    progress: &(dyn Fn(&ModelOutcome) + Sync),
) -> Vec<ModelOutcome> {
    let estimates: Vec<u64> = entries.iter().map(|e| estimate_memory(&e.path)).collect();
    // Largest first; ties in collection order.
    let mut order: Vec<usize> = (0..entries.len()).collect();
    order.sort_by(|&a, &b| estimates[b].cmp(&estimates[a]).then(a.cmp(&b)));
    let budget = Budget {
        limit: limits.memory_budget,
        used: Mutex::new(0),
        freed: Condvar::new(),
    };
    let next = AtomicUsize::new(0);
    let results: Vec<Mutex<Option<ModelOutcome>>> =
        entries.iter().map(|_| Mutex::new(None)).collect();
    let workers = limits.jobs.min(entries.len()).max(1);
    let work = || loop {
        let k = next.fetch_add(1, Ordering::Relaxed);
        let Some(&i) = order.get(k) else {
            break;
        };
        let reserved = budget.acquire(estimates[i]);
        let start = Instant::now();
        let result = build_one(&entries[i], root, out);
        budget.release(reserved);
        let outcome = ModelOutcome {
            entry: entries[i].clone(),
            result,
            seconds: start.elapsed().as_secs_f64(),
            estimated_memory: estimates[i],
        };
        progress(&outcome);
        *results[i].lock().unwrap_or_else(|e| e.into_inner()) = Some(outcome);
    };
    match rayon::ThreadPoolBuilder::new().num_threads(workers).build() {
        Ok(pool) => pool.scope(|s| {
            for _ in 0..workers {
                s.spawn(|_| work());
            }
        }),
        // No threads to be had: build one after the other here.
        Err(_) => work(),
    }
    results
        .into_iter()
        .map(|slot| {
            slot.into_inner()
                .unwrap_or_else(|e| e.into_inner())
                .expect("every model is built exactly once")
        })
        .collect()
}

/// Load, analyse and render one model; a panic becomes that model's error
/// instead of ending the whole collection.
fn build_one(entry: &Entry, root: &Path, out: &Path) -> Result<Digest, String> {
    let run = || -> Result<Digest, String> {
        let project =
            Project::load(&entry.path).map_err(|e| relative_message(&e.to_string(), root))?;
        let report = project.analyse();
        let theme_dir = project.settings.theme_dir.clone();
        // The model is not needed for rendering: free it first.
        drop(project);
        crate::site::render(&report, theme_dir.as_deref(), &out.join(&entry.name))
            .map_err(|e| format!("the report could not be written: {e}"))?;
        Ok(Digest::from_report(&report))
    };
    match std::panic::catch_unwind(std::panic::AssertUnwindSafe(run)) {
        Ok(result) => result,
        Err(payload) => {
            let what = payload
                .downcast_ref::<&str>()
                .map(|s| s.to_string())
                .or_else(|| payload.downcast_ref::<String>().cloned())
                .unwrap_or_default();
            Err(format!(
                "internal error while building this model (please report it): {what}"
            ))
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::sync::Arc;

    #[test]
    fn budget_waits_until_memory_is_freed_and_lets_an_oversized_model_run_alone() {
        let budget = Arc::new(Budget {
            limit: Some(100),
            used: Mutex::new(0),
            freed: Condvar::new(),
        });
        // Larger than the whole budget: clamped, runs alone.
        assert_eq!(budget.acquire(500), 100);
        let waiting = {
            let budget = Arc::clone(&budget);
            std::thread::spawn(move || budget.acquire(60))
        };
        std::thread::sleep(std::time::Duration::from_millis(50));
        assert!(
            !waiting.is_finished(),
            "must wait while the budget is used up"
        );
        budget.release(100);
        assert_eq!(waiting.join().unwrap(), 60);
        assert_eq!(*budget.used.lock().unwrap(), 60);
    }

    #[test]
    fn sizes_take_binary_units() {
        assert_eq!(parse_size("4G"), Ok(4 << 30));
        assert_eq!(parse_size("800MiB"), Ok(800 << 20));
        assert_eq!(parse_size("1.5k"), Ok(1536));
        assert_eq!(parse_size("1000"), Ok(1000));
        assert!(parse_size("4X").is_err());
        assert!(parse_size("-1G").is_err());
    }

    #[test]
    fn gzip_trailer_gives_the_uncompressed_size() {
        use std::io::Write;
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("m.xml.gz");
        let mut gz = flate2::write::GzEncoder::new(
            std::fs::File::create(&path).unwrap(),
            flate2::Compression::default(),
        );
        gz.write_all(&[b'a'; 100_000]).unwrap();
        gz.finish().unwrap();
        assert!(std::fs::metadata(&path).unwrap().len() < 1000);
        assert_eq!(model_text_size(&path), 100_000);
        assert_eq!(estimate_memory(&path), FIXED_BYTES + PER_BYTE * 100_000);
    }
}
