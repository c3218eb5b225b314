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
    // `index` would replace a folder's list page; Windows reserved names
    // (`con.html` included) would stop the site unpacking there.
    let changed = out != id
        || out.is_empty()
        || out.len() > 100
        || out.eq_ignore_ascii_case("index")
        || is_windows_reserved(&out);
    out.truncate(100);
    if changed {
        out.push_str(&format!("-{:08x}", fnv1a(id.as_bytes())));
    }
    out
}

/// CON, PRN, AUX, NUL, COM1–COM9, LPT1–LPT9 in any case: device names on
/// Windows, whatever the extension.
fn is_windows_reserved(stem: &str) -> bool {
    let upper = stem.to_ascii_uppercase();
    match upper.as_bytes() {
        b"CON" | b"PRN" | b"AUX" | b"NUL" => true,
        [b'C', b'O', b'M', d] | [b'L', b'P', b'T', d] => (b'1'..=b'9').contains(d),
        _ => false,
    }
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
    fn windows_reserved_names_get_the_hash() {
        for id in [
            "CON", "con", "Prn", "aux", "NUL", "COM1", "com9", "LPT1", "lpt9",
        ] {
            let s = slug(id);
            assert!(
                s.starts_with(&format!("{id}-")) && s.len() == id.len() + 9,
                "{s}"
            );
        }
        // Only the exact names: these are ordinary.
        for id in ["CONS", "COM0", "COM10", "LPT", "nul_c", "icon"] {
            assert_eq!(slug(id), id);
        }
    }

    #[test]
    fn case_only_differences_get_distinct_slugs() {
        let s = unique_slugs(["M_h2o", "M_H2O", "M_atp"]);
        assert_eq!(s[0], "M_h2o");
        assert_ne!(s[1].to_lowercase(), s[0].to_lowercase());
        assert_eq!(s[2], "M_atp");
    }
}
