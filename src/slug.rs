//! Turning model ids into safe file names.

/// A file stem made of `[A-Za-z0-9_-]` only, never empty, never `.`/`..`,
/// and at most 100 bytes. Characters outside the set become `_`, with a short
/// hash appended whenever anything was changed, so two different ids can never
/// share a page (e.g. `a/b` and `a_b`).
pub fn slug(id: &str) -> String {
    let mut out: String = id
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || c == '_' || c == '-' {
                c
            } else {
                '_'
            }
        })
        .collect();
    // `index` would replace a folder's list page.
    let changed =
        out != id || out.is_empty() || out.len() > 100 || out.eq_ignore_ascii_case("index");
    out.truncate(100);
    if changed {
        out.push_str(&format!("-{:08x}", fnv1a(id.as_bytes())));
    }
    out
}

/// Slugs for a list of ids that stay distinct even on case-insensitive file
/// systems: an id whose slug differs from an earlier one only in case gets
/// its hash appended.
pub fn unique_slugs<'a>(ids: impl IntoIterator<Item = &'a str>) -> Vec<String> {
    let mut seen = std::collections::HashSet::new();
    ids.into_iter()
        .map(|id| {
            let mut s = slug(id);
            if !seen.insert(s.to_ascii_lowercase()) {
                s = format!("{s}-{:08x}", fnv1a(id.as_bytes()));
                seen.insert(s.to_ascii_lowercase());
            }
            s
        })
        .collect()
}

/// FNV-1a, 32 bit: a tiny stable hash (same on every machine and release).
fn fnv1a(bytes: &[u8]) -> u32 {
    let mut hash: u32 = 0x811c_9dc5;
    for &b in bytes {
        hash ^= u32::from(b);
        hash = hash.wrapping_mul(0x0100_0193);
    }
    hash
}

#[cfg(test)]
mod tests {
    use super::{slug, unique_slugs};

    #[test]
    fn safe_ids_are_kept() {
        assert_eq!(slug("R_PGI"), "R_PGI");
        assert_eq!(slug("glc-D_c"), "glc-D_c");
    }

    #[test]
    fn unsafe_ids_are_replaced_and_disambiguated() {
        let a = slug("../etc/passwd");
        assert!(a.starts_with("___etc_passwd-"), "{a}");
        assert!(a
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || c == '_' || c == '-'));
        assert_ne!(slug("a/b"), slug("a_b"));
        assert_ne!(slug("a/b"), slug("a.b"));
        assert!(!slug("").is_empty());
        assert!(slug(&"x".repeat(500)).len() <= 109);
        assert_ne!(slug("index"), "index");
        assert_ne!(slug("Index").to_lowercase(), "index");
    }

    #[test]
    fn case_only_differences_get_distinct_slugs() {
        let s = unique_slugs(["M_h2o", "M_H2O", "M_atp"]);
        assert_eq!(s[0], "M_h2o");
        assert_ne!(s[1].to_lowercase(), s[0].to_lowercase());
        assert_eq!(s[2], "M_atp");
    }
}
