//! Cross references from the RDF annotations of SBML elements.
//!
//! SBML (Level 3, section 6) puts identity statements in
//! `<annotation><rdf:RDF><rdf:Description><bqbiol:is><rdf:Bag><rdf:li
//! rdf:resource="URI"/>…`. The URIs are identifiers.org URLs
//! (`http://identifiers.org/chebi/CHEBI:15422`, or the compact form
//! `https://identifiers.org/CHEBI:15422`) or MIRIAM URNs
//! (`urn:miriam:chebi:CHEBI%3A15422`). Each becomes a (namespace, id) pair
//! with the namespace normalised (see [`normalise`]).
//!
//! Only `bqbiol:is` is read (the element *is* that database entry), because
//! later stages look thermodynamic data up by these ids and a parent class
//! would give the wrong compound. The one exception: EC numbers are also
//! taken from `bqbiol:isVersionOf`, since an EC number names a class of
//! reactions and many models state it that way.

use std::borrow::Cow;
use std::collections::BTreeMap;

const RDF_NS: &str = "http://www.w3.org/1999/02/22-rdf-syntax-ns#";
const BQBIOL_NS: &str = "http://biomodels.net/biology-qualifiers/";

/// Cross references of one SBML element (`annotation` is the element's
/// `<annotation>` child).
pub(crate) fn cross_references(annotation: roxmltree::Node) -> BTreeMap<String, Vec<String>> {
    let mut xrefs: BTreeMap<String, Vec<String>> = BTreeMap::new();
    let descriptions = annotation
        .children()
        .filter(|n| n.has_tag_name((RDF_NS, "RDF")))
        .flat_map(|rdf| rdf.children())
        .filter(|n| n.has_tag_name((RDF_NS, "Description")));
    for description in descriptions {
        for qualifier in description.children().filter(|n| n.is_element()) {
            let tag = qualifier.tag_name();
            if tag.namespace() != Some(BQBIOL_NS) {
                continue;
            }
            let only_ec = match tag.name() {
                "is" => false,
                "isVersionOf" => true,
                _ => continue,
            };
            let resources = qualifier
                .descendants()
                .filter(|n| n.has_tag_name((RDF_NS, "li")))
                .filter_map(|li| li.attribute((RDF_NS, "resource")));
            for uri in resources {
                let Some((namespace, id)) = parse_uri(uri) else {
                    continue;
                };
                if only_ec && namespace != "ec-code" {
                    continue;
                }
                let ids = xrefs.entry(namespace).or_default();
                if !ids.contains(&id) {
                    ids.push(id);
                }
            }
        }
    }
    xrefs
}

/// Splits an identifiers.org URL or a MIRIAM URN into a normalised
/// (namespace, id). Other URIs give `None`.
pub fn parse_uri(uri: &str) -> Option<(String, String)> {
    let uri = uri.trim();
    let (namespace, id) = if let Some(rest) = uri.strip_prefix("urn:miriam:") {
        // urn:miriam:<namespace>:<id>, the id percent-encoded.
        let (namespace, id) = rest.split_once(':')?;
        (namespace, percent_decode(id))
    } else {
        let rest = ["https://identifiers.org/", "http://identifiers.org/"]
            .iter()
            .find_map(|p| uri.strip_prefix(p))?;
        match rest.split_once('/') {
            Some((namespace, id)) => (namespace, percent_decode(id)),
            // Compact form: identifiers.org/PREFIX:ID.
            None => {
                let (prefix, local) = rest.split_once(':')?;
                if prefix_is_part_of_id(prefix) {
                    (prefix, percent_decode(rest))
                } else {
                    (prefix, percent_decode(local))
                }
            }
        }
    };
    if namespace.is_empty() || id.is_empty() {
        return None;
    }
    Some(normalise(namespace, &id))
}

/// Namespaces whose ids carry their own prefix (`CHEBI:15422`, `GO:0008152`).
fn prefix_is_part_of_id(prefix: &str) -> bool {
    matches!(prefix.to_ascii_lowercase().as_str(), "chebi" | "go" | "sbo")
}

/// One spelling per namespace, lower case, as registered at identifiers.org:
/// `obo.chebi` → `chebi` (ids always `CHEBI:<n>`), `inchi_key` → `inchikey`
/// (without an `InChIKey=` prefix), `ec` → `ec-code`, `obo.go` → `go`,
/// `mnx.chemical` → `metanetx.chemical`.
pub fn normalise(namespace: &str, id: &str) -> (String, String) {
    let lower = namespace.trim().to_ascii_lowercase();
    let id = id.trim();
    match lower.as_str() {
        "chebi" | "obo.chebi" => {
            let number = id
                .strip_prefix("CHEBI:")
                .or_else(|| id.strip_prefix("chebi:"))
                .unwrap_or(id);
            ("chebi".into(), format!("CHEBI:{number}"))
        }
        "inchi_key" | "inchikey" => (
            "inchikey".into(),
            id.strip_prefix("InChIKey=").unwrap_or(id).to_string(),
        ),
        "ec" | "ec-code" | "ec.code" => ("ec-code".into(), id.to_string()),
        "obo.go" | "go" => ("go".into(), id.to_string()),
        "mnx.chemical" => ("metanetx.chemical".into(), id.to_string()),
        "mnx.reaction" => ("metanetx.reaction".into(), id.to_string()),
        _ => (lower, id.to_string()),
    }
}

/// Decodes `%XX` escapes (MIRIAM URNs write `:` as `%3A`); a malformed
/// escape is kept as written.
fn percent_decode(text: &str) -> Cow<'_, str> {
    if !text.contains('%') {
        return Cow::Borrowed(text);
    }
    let bytes = text.as_bytes();
    let mut out = Vec::with_capacity(bytes.len());
    let mut i = 0;
    while i < bytes.len() {
        if bytes[i] == b'%' && i + 2 < bytes.len() {
            let high = (bytes[i + 1] as char).to_digit(16);
            let low = (bytes[i + 2] as char).to_digit(16);
            if let (Some(high), Some(low)) = (high, low) {
                out.push((high * 16 + low) as u8);
                i += 3;
                continue;
            }
        }
        out.push(bytes[i]);
        i += 1;
    }
    String::from_utf8(out).map_or(Cow::Borrowed(text), Cow::Owned)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn pair(ns: &str, id: &str) -> Option<(String, String)> {
        Some((ns.to_string(), id.to_string()))
    }

    #[test]
    fn identifiers_org_urls() {
        // URL forms as written in the BiGG-exported e_coli_core file.
        assert_eq!(
            parse_uri("http://identifiers.org/chebi/CHEBI:15422"),
            pair("chebi", "CHEBI:15422")
        );
        assert_eq!(
            parse_uri("http://identifiers.org/kegg.compound/C00031"),
            pair("kegg.compound", "C00031")
        );
        assert_eq!(
            parse_uri("http://identifiers.org/inchi_key/WQZGKKKJIJFFOK-GASJEMHNSA-N"),
            pair("inchikey", "WQZGKKKJIJFFOK-GASJEMHNSA-N")
        );
        assert_eq!(
            parse_uri("http://identifiers.org/ec-code/2.7.1.11"),
            pair("ec-code", "2.7.1.11")
        );
        // Compact identifiers (identifiers.org resolver syntax).
        assert_eq!(
            parse_uri("https://identifiers.org/CHEBI:15422"),
            pair("chebi", "CHEBI:15422")
        );
        assert_eq!(
            parse_uri("https://identifiers.org/kegg.reaction:R00212"),
            pair("kegg.reaction", "R00212")
        );
        assert_eq!(
            parse_uri("https://identifiers.org/metanetx.chemical:MNXM41"),
            pair("metanetx.chemical", "MNXM41")
        );
    }

    #[test]
    fn miriam_urns() {
        assert_eq!(
            parse_uri("urn:miriam:chebi:CHEBI%3A15422"),
            pair("chebi", "CHEBI:15422")
        );
        assert_eq!(
            parse_uri("urn:miriam:obo.chebi:CHEBI%3A17234"),
            pair("chebi", "CHEBI:17234")
        );
        assert_eq!(
            parse_uri("urn:miriam:kegg.compound:C00002"),
            pair("kegg.compound", "C00002")
        );
        assert_eq!(
            parse_uri("urn:miriam:ec:1.1.1.1"),
            pair("ec-code", "1.1.1.1")
        );
    }

    #[test]
    fn other_uris_are_ignored() {
        assert_eq!(parse_uri("https://example.org/chebi/1"), None);
        assert_eq!(parse_uri("http://identifiers.org/"), None);
        assert_eq!(parse_uri("urn:miriam:chebi"), None);
        assert_eq!(parse_uri("http://identifiers.org/chebi/"), None);
    }

    #[test]
    fn chebi_ids_get_their_prefix() {
        assert_eq!(
            normalise("CHEBI", "15422"),
            ("chebi".into(), "CHEBI:15422".into())
        );
        assert_eq!(
            normalise("inchikey", "InChIKey=WQZGKKKJIJFFOK-GASJEMHNSA-N"),
            ("inchikey".into(), "WQZGKKKJIJFFOK-GASJEMHNSA-N".into())
        );
    }

    #[test]
    fn percent_escapes() {
        assert_eq!(percent_decode("CHEBI%3A15422"), "CHEBI:15422");
        assert_eq!(percent_decode("100%"), "100%");
        assert_eq!(percent_decode("a%zzb"), "a%zzb");
        assert_eq!(percent_decode("%é%41"), "%éA");
    }

    #[test]
    fn reads_only_identity_statements() {
        let xml = r##"<annotation xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#"
            xmlns:bqbiol="http://biomodels.net/biology-qualifiers/">
          <rdf:RDF><rdf:Description rdf:about="#R_X">
            <bqbiol:is><rdf:Bag>
              <rdf:li rdf:resource="http://identifiers.org/kegg.reaction/R00212"/>
              <rdf:li rdf:resource="http://identifiers.org/kegg.reaction/R00212"/>
              <rdf:li rdf:resource="urn:miriam:chebi:CHEBI%3A1"/>
            </rdf:Bag></bqbiol:is>
            <bqbiol:isVersionOf><rdf:Bag>
              <rdf:li rdf:resource="http://identifiers.org/ec-code/2.3.1.54"/>
              <rdf:li rdf:resource="http://identifiers.org/chebi/CHEBI:2"/>
            </rdf:Bag></bqbiol:isVersionOf>
            <bqbiol:hasPart><rdf:Bag>
              <rdf:li rdf:resource="http://identifiers.org/chebi/CHEBI:3"/>
            </rdf:Bag></bqbiol:hasPart>
          </rdf:Description></rdf:RDF></annotation>"##;
        let doc = roxmltree::Document::parse(xml).unwrap();
        let xrefs = cross_references(doc.root_element());
        let expected: BTreeMap<String, Vec<String>> = [
            ("chebi", vec!["CHEBI:1"]),
            ("ec-code", vec!["2.3.1.54"]),
            ("kegg.reaction", vec!["R00212"]),
        ]
        .into_iter()
        .map(|(k, v)| (k.to_string(), v.into_iter().map(String::from).collect()))
        .collect();
        assert_eq!(xrefs, expected);
    }
}
