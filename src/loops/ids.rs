//! Ids of loops and cycles derived from their member set, so they stay the
//! same when the model file lists its reactions in another order, when the
//! search finds the loops in another order, or when unrelated reactions are
//! added or removed. A baseline diff then compares like with like.
//!
//! The id is `<prefix>-<10 hex digits>`: the top 40 bits of the 64-bit
//! FNV-1a hash of the sorted, de-duplicated member ids, each followed by a
//! newline byte. FNV-1a (Fowler, Noll, Vo; offset basis 0xcbf29ce484222325,
//! prime 0x100000001b3, as published in the FNV reference and IETF draft
//! draft-eastlake-fnv) is fixed by its definition, so the id does not change
//! with the compiler or platform, unlike `std`'s `DefaultHasher`, whose
//! algorithm may change between releases.

/// FNV-1a, 64 bits.
pub fn fnv1a64(bytes: &[u8]) -> u64 {
    let mut hash: u64 = 0xcbf2_9ce4_8422_2325;
    for &b in bytes {
        hash ^= u64::from(b);
        hash = hash.wrapping_mul(0x0000_0100_0000_01b3);
    }
    hash
}

/// `<prefix>-<10 hex>` from a set of member ids (order and repeats ignored).
pub fn member_set_id<'a>(prefix: &str, members: impl IntoIterator<Item = &'a str>) -> String {
    let mut sorted: Vec<&str> = members.into_iter().collect();
    sorted.sort_unstable();
    sorted.dedup();
    let mut key = Vec::new();
    for m in sorted {
        key.extend_from_slice(m.as_bytes());
        key.push(b'\n');
    }
    format!("{prefix}-{:010x}", fnv1a64(&key) >> 24)
}

/// Makes ids unique in order of appearance: the first keeps its id, a later
/// one with the same id (two member sets whose 40-bit hashes collide) gets
/// `-2`, `-3`, …
pub fn disambiguate(ids: &mut [String]) {
    let mut seen = std::collections::HashMap::<String, usize>::new();
    for id in ids.iter_mut() {
        let n = seen.entry(id.clone()).or_insert(0);
        *n += 1;
        if *n > 1 {
            *id = format!("{id}-{n}");
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fnv1a64_matches_the_published_test_vectors() {
        // FNV-1a 64-bit test vectors from the FNV reference test suite
        // (draft-eastlake-fnv, Appendix: "" and "a"; "foobar" from the same
        // suite), from memory.
        assert_eq!(fnv1a64(b""), 0xcbf2_9ce4_8422_2325);
        assert_eq!(fnv1a64(b"a"), 0xaf63_dc4c_8601_ec8c);
        assert_eq!(fnv1a64(b"foobar"), 0x8594_4171_f739_67e8);
    }

    #[test]
    fn id_depends_on_the_set_only() {
        let a = member_set_id("loop", ["PYK", "PEPS", "ADK"]);
        let b = member_set_id("loop", ["ADK", "PYK", "PEPS", "PYK"]);
        assert_eq!(a, b);
        assert!(
            a.starts_with("loop-") && a.len() == "loop-".len() + 10,
            "{a}"
        );
        assert_ne!(a, member_set_id("loop", ["PYK", "PEPS"]));
        // No ambiguity from joining: {"ab"} is not {"a", "b"}.
        assert_ne!(
            member_set_id("loop", ["ab"]),
            member_set_id("loop", ["a", "b"])
        );
        assert_eq!(
            member_set_id("cycle", ["x"]).split_once('-').unwrap().0,
            "cycle"
        );
    }

    #[test]
    fn collisions_get_a_counter() {
        let mut ids = vec!["loop-1".to_string(), "loop-2".into(), "loop-1".into()];
        disambiguate(&mut ids);
        assert_eq!(ids, ["loop-1", "loop-2", "loop-1-2"]);
    }
}
