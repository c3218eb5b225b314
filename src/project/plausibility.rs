//! Plausibility of input values: numbers the loader accepts (they are
//! within the hard limits of [`super::limits`]) but that are unlikely for a
//! living cell, or that look like a unit slip (a bare number read in the
//! default unit where another unit was almost certainly meant: `50` read as
//! 50 M). Such a value changes every verdict that rests on it without any
//! error, so each one becomes a warning with its file, line and column.
//!
//! The rules are here; the finding that reports them is
//! `checks::input_plausibility`. The ranges are common practice for
//! metabolism, not physical limits.

use super::schema::{RawConditions, RawModelFile, RawRange, RawSettings};
use super::sourcemap::{Segment, SourceMap};
use super::units::{self, Kind, RawQuantity};

/// Concentrations outside 1 pM – 1 M are implausible for a metabolite
/// (common practice: cellular metabolite pools lie between about 1 nM and
/// 100 mM; water's 55 M is folded into ΔG'° and never given).
pub const CONCENTRATION_M: (f64, f64) = (1e-12, 1.0);
/// Liquid water at 1 bar (common practice), K.
pub const TEMPERATURE_K: (f64, f64) = (273.0, 373.0);
/// Ionic strength above which the extended Debye–Hückel correction is no
/// longer reliable (Alberty 2003, §3.6: about 0.25–0.5 M), M.
pub const MAX_IONIC_STRENGTH_M: f64 = 0.5;
/// Largest |membrane potential| seen across biological membranes (common
/// practice: about −250 mV at most), mV.
pub const MAX_POTENTIAL_MV: f64 = 300.0;
/// pH of cellular compartments (common practice: lysosome ≈ 4.5 to
/// alkaliphile cytoplasm ≈ 9.5).
pub const PH: (f64, f64) = (4.0, 10.0);

/// Finding kind: a bare number whose default unit is almost certainly not
/// the one meant.
pub const KIND_UNIT_SLIP: &str = "bare-number-unit-slip";
/// Finding kinds of values outside the plausible range.
pub const KIND_CONCENTRATION: &str = "implausible-concentration";
pub const KIND_TEMPERATURE: &str = "implausible-temperature";
pub const KIND_IONIC_STRENGTH: &str = "implausible-ionic-strength";
pub const KIND_POTENTIAL: &str = "implausible-potential";
pub const KIND_PH: &str = "implausible-ph";

/// Every kind, for the check's registration.
pub const KINDS: &[&str] = &[
    KIND_UNIT_SLIP,
    KIND_CONCENTRATION,
    KIND_TEMPERATURE,
    KIND_IONIC_STRENGTH,
    KIND_POTENTIAL,
    KIND_PH,
];

/// The quantities judged here.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    Concentration,
    Temperature,
    IonicStrength,
    Potential,
    Ph,
}

impl Quantity {
    fn kind(self) -> Kind {
        match self {
            Quantity::Concentration => Kind::Concentration,
            Quantity::Temperature => Kind::Temperature,
            Quantity::IonicStrength => Kind::IonicStrength,
            Quantity::Potential => Kind::Potential,
            Quantity::Ph => Kind::Plain,
        }
    }
}

/// One doubtful value, located in its file.
#[derive(Debug, Clone, PartialEq)]
pub struct Remark {
    pub kind: &'static str,
    /// File as shown to the user (relative to the project folder).
    pub file: String,
    pub line: Option<usize>,
    pub column: Option<usize>,
    /// Metabolite or compartment the value belongs to, if any.
    pub subject: Option<String>,
    /// What is doubtful, without the location.
    pub message: String,
    /// The value as read, in the internal unit (M, K, mV, pH).
    pub value: f64,
}

impl Remark {
    /// `file:line:col`, as far as known.
    pub fn location(&self) -> String {
        match (self.line, self.column) {
            (Some(l), Some(c)) => format!("{}:{l}:{c}", self.file),
            (Some(l), None) => format!("{}:{l}", self.file),
            _ => self.file.clone(),
        }
    }
}

/// A number as a person would write it (`50`, `0.25`, `1e-15`).
fn number(x: f64) -> String {
    if x != 0.0 && (x.abs() < 1e-3 || x.abs() >= 1e7) {
        format!("{x:e}")
    } else {
        let text = format!("{:.6}", x);
        let text = text.trim_end_matches('0').trim_end_matches('.');
        text.to_string()
    }
}

/// The value as written in the file.
fn written(raw: &RawQuantity) -> String {
    match raw {
        RawQuantity::Number(n) => number(*n),
        RawQuantity::Text(t) => t.trim().to_string(),
    }
}

/// When `raw` is a bare number that its default unit makes implausible and
/// another unit makes ordinary, the sentence saying so ("`50` is read as
/// 50 M …; did you mean 50 mM?"). Also used as the hint of a hard error.
pub fn unit_slip(quantity: Quantity, raw: &RawQuantity) -> Option<String> {
    // A number written without a unit, also as text (a table cell, a
    // quoted YAML value).
    let n = match raw {
        RawQuantity::Number(n) => *n,
        RawQuantity::Text(t) => t.trim().parse::<f64>().ok()?,
    };
    let shown = number(n);
    match quantity {
        Quantity::Concentration | Quantity::IonicStrength if n > 1.0 => {
            let limit = match quantity {
                Quantity::IonicStrength => MAX_IONIC_STRENGTH_M,
                _ => CONCENTRATION_M.1,
            };
            if n <= limit {
                return None;
            }
            let unit = if n <= 1e3 {
                "mM"
            } else if n <= 1e6 {
                "µM"
            } else {
                "nM"
            };
            Some(format!(
                "`{shown}` is read as {shown} M (a bare number means mol/L); did you mean {shown} {unit}?"
            ))
        }
        Quantity::IonicStrength if n > MAX_IONIC_STRENGTH_M => Some(format!(
            "`{shown}` is read as {shown} M (a bare number means mol/L); did you mean {shown} mM?"
        )),
        Quantity::Temperature if (-30.0..=100.0).contains(&n) => Some(format!(
            "`{shown}` is read as {shown} K (a bare number means kelvin); did you mean {shown} °C ({} K)?",
            number(n + 273.15)
        )),
        _ => None,
    }
}

/// The doubt about a value already converted to the internal unit, if any:
/// (finding kind, message).
pub fn judge(quantity: Quantity, raw: &RawQuantity, value: f64) -> Option<(&'static str, String)> {
    if let Some(slip) = unit_slip(quantity, raw) {
        return Some((KIND_UNIT_SLIP, slip));
    }
    let v = number(value);
    match quantity {
        Quantity::Concentration if value > CONCENTRATION_M.1 => Some((
            KIND_CONCENTRATION,
            format!("{v} M is above 1 M, more than any metabolite pool of a cell"),
        )),
        Quantity::Concentration if value > 0.0 && value < CONCENTRATION_M.0 => Some((
            KIND_CONCENTRATION,
            format!("{v} M is below 1 pM, less than one molecule in a bacterial cell"),
        )),
        Quantity::Temperature if !(TEMPERATURE_K.0..=TEMPERATURE_K.1).contains(&value) => Some((
            KIND_TEMPERATURE,
            format!(
                "{v} K ({} °C) is outside 273–373 K (0–100 °C), where water is liquid",
                number(value - 273.15)
            ),
        )),
        Quantity::IonicStrength if value > MAX_IONIC_STRENGTH_M => Some((
            KIND_IONIC_STRENGTH,
            format!(
                "{v} M is above 0.5 M, beyond the range of the extended Debye–Hückel correction"
            ),
        )),
        Quantity::Potential if value.abs() > MAX_POTENTIAL_MV => Some((
            KIND_POTENTIAL,
            format!("{v} mV is beyond ±300 mV, more than biological membranes hold"),
        )),
        Quantity::Ph if !(PH.0..=PH.1).contains(&value) => Some((
            KIND_PH,
            format!("{v} is outside 4–10, the range of cellular compartments"),
        )),
        _ => None,
    }
}

/// Walks raw files and collects remarks with their locations.
struct Scanner<'a> {
    file: &'a str,
    map: &'a SourceMap,
    out: Vec<Remark>,
}

impl Scanner<'_> {
    fn quantity(
        &mut self,
        quantity: Quantity,
        raw: &Option<RawQuantity>,
        path: &[Segment],
        subject: Option<&str>,
        what: &str,
    ) {
        let Some(raw) = raw else { return };
        let Ok(value) = units::parse(raw, quantity.kind()) else {
            return;
        };
        let Some((kind, message)) = judge(quantity, raw, value) else {
            return;
        };
        let location = self.map.value(path).map(|l| l.pair());
        let written = written(raw);
        self.out.push(Remark {
            kind,
            file: self.file.to_string(),
            line: location.map(|l| l.0),
            column: location.map(|l| l.1),
            subject: subject.map(str::to_string),
            message: if kind == KIND_UNIT_SLIP {
                format!("{what}: {message}")
            } else {
                format!("{what} is `{written}`: {message}")
            },
            value,
        });
    }

    fn range(
        &mut self,
        raw: &Option<RawRange>,
        path: &[Segment],
        subject: Option<&str>,
        (prefix, suffix): (&str, &str),
    ) {
        let Some(range) = raw else { return };
        for (key, q) in [("min", &range.min), ("max", &range.max)] {
            self.quantity(
                Quantity::Concentration,
                &Some(q.clone()),
                &child(path, key),
                subject,
                &format!("{prefix} {key}{suffix}"),
            );
        }
    }

    /// pH, ionic strength, potential and temperature of one compartment
    /// (or the conditions a value was stated at).
    fn conditions(
        &mut self,
        values: Conditions<'_>,
        path: &[Segment],
        subject: Option<&str>,
        whose: &str,
    ) {
        let Conditions {
            ph,
            ionic_strength,
            potential,
            temperature,
        } = values;
        for (quantity, raw, key, label) in [
            (Quantity::Ph, ph, "ph", "pH"),
            (
                Quantity::IonicStrength,
                ionic_strength,
                "ionic_strength",
                "ionic_strength",
            ),
            (Quantity::Potential, potential, "potential", "potential"),
            (
                Quantity::Temperature,
                temperature,
                "temperature",
                "temperature",
            ),
        ] {
            self.quantity(
                quantity,
                raw,
                &child(path, key),
                subject,
                &format!("{whose} {label}"),
            );
        }
    }
}

/// The condition values of one place, as written.
struct Conditions<'a> {
    ph: &'a Option<RawQuantity>,
    ionic_strength: &'a Option<RawQuantity>,
    potential: &'a Option<RawQuantity>,
    temperature: &'a Option<RawQuantity>,
}

/// Columns of a metabolite side table judged here.
pub const TABLE_COLUMNS: &[(&str, Quantity)] = &[
    ("min", Quantity::Concentration),
    ("max", Quantity::Concentration),
    ("measured", Quantity::Concentration),
    ("ph", Quantity::Ph),
    ("ionic_strength", Quantity::IonicStrength),
    ("temperature", Quantity::Temperature),
];

/// The doubt about one cell of a side table, if any: `file` as shown,
/// `line` of the row, `field` the 1-based field number, `subject` the row's
/// key as written.
pub fn judge_cell(
    file: &str,
    (line, field): (usize, usize),
    subject: &str,
    column: &str,
    quantity: Quantity,
    text: &str,
) -> Option<Remark> {
    let raw = RawQuantity::Text(text.to_string());
    let value = units::parse(&raw, quantity.kind()).ok()?;
    let (kind, message) = judge(quantity, &raw, value)?;
    let what = format!("column `{column}` of `{subject}`");
    Some(Remark {
        kind,
        file: file.to_string(),
        line: Some(line),
        column: Some(field),
        subject: Some(subject.to_string()),
        message: if kind == KIND_UNIT_SLIP {
            format!("{what}: {message}")
        } else {
            format!("{what} is `{}`: {message}", text.trim())
        },
        value,
    })
}

fn child(path: &[Segment], key: &str) -> Vec<Segment> {
    let mut p = path.to_vec();
    p.push(Segment::Key(key.to_string()));
    p
}

fn key(k: &str) -> Segment {
    Segment::Key(k.to_string())
}

/// Doubtful values of a model file (`file` as shown to the user).
pub fn scan_model(file: &str, raw: &RawModelFile, map: &SourceMap) -> Vec<Remark> {
    let mut s = Scanner {
        file,
        map,
        out: Vec::new(),
    };
    s.quantity(
        Quantity::Temperature,
        &raw.temperature,
        &[key("temperature")],
        None,
        "model temperature",
    );
    for (i, c) in raw.compartments.iter().enumerate() {
        let here = [key("compartments"), Segment::Index(i)];
        s.conditions(
            Conditions {
                ph: &c.ph,
                ionic_strength: &c.ionic_strength,
                potential: &c.potential,
                temperature: &c.temperature,
            },
            &here,
            Some(&c.id),
            &format!("compartment `{}`", c.id),
        );
    }
    for (i, m) in raw.metabolites.iter().enumerate() {
        let here = [key("metabolites"), Segment::Index(i)];
        s.range(
            &m.concentration,
            &child(&here, "concentration"),
            Some(&m.id),
            ("concentration", &format!(" of `{}`", m.id)),
        );
        s.quantity(
            Quantity::Concentration,
            &m.measured,
            &child(&here, "measured"),
            Some(&m.id),
            &format!("measured concentration of `{}`", m.id),
        );
        if let Some(at) = m.formation_energy.as_ref().and_then(|e| e.at.as_ref()) {
            let path = [here.to_vec(), vec![key("formation_energy"), key("at")]].concat();
            s.conditions(
                Conditions {
                    ph: &at.ph,
                    ionic_strength: &at.ionic_strength,
                    potential: &None,
                    temperature: &at.temperature,
                },
                &path,
                Some(&m.id),
                &format!("formation energy of `{}` stated at", m.id),
            );
        }
    }
    s.out
}

/// Doubtful values of `gibbsite.yaml`.
pub fn scan_settings(file: &str, raw: &RawSettings, map: &SourceMap) -> Vec<Remark> {
    let mut s = Scanner {
        file,
        map,
        out: Vec::new(),
    };
    s.range(
        &raw.default_concentration,
        &[key("default_concentration")],
        None,
        ("default_concentration", ""),
    );
    for (id, c) in &raw.compartments {
        let RawConditions {
            ph,
            ionic_strength,
            potential,
            temperature,
            ..
        } = c;
        s.conditions(
            Conditions {
                ph,
                ionic_strength,
                potential,
                temperature,
            },
            &[key("compartments"), key(id)],
            Some(id),
            &format!("compartment `{id}`"),
        );
    }
    s.out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn bare(n: f64) -> RawQuantity {
        RawQuantity::Number(n)
    }

    fn text(s: &str) -> RawQuantity {
        RawQuantity::Text(s.to_string())
    }

    #[test]
    fn bare_numbers_that_look_like_unit_slips() {
        let slip = unit_slip(Quantity::Concentration, &bare(50.0)).unwrap();
        assert_eq!(
            slip,
            "`50` is read as 50 M (a bare number means mol/L); did you mean 50 mM?"
        );
        assert!(unit_slip(Quantity::Concentration, &bare(5000.0))
            .unwrap()
            .ends_with("did you mean 5000 µM?"));
        // 0.5 M is a possible (if high) pool: no slip.
        assert_eq!(unit_slip(Quantity::Concentration, &bare(0.5)), None);
        // A table cell or quoted value without a unit is a bare number too.
        assert!(unit_slip(Quantity::Concentration, &text(" 50 "))
            .unwrap()
            .ends_with("did you mean 50 mM?"));
        // With a unit, the writer said what was meant.
        assert_eq!(unit_slip(Quantity::Concentration, &text("50 M")), None);
        // 25 °C = 298.15 K (definition of the Celsius scale).
        assert!(unit_slip(Quantity::Temperature, &bare(25.0))
            .unwrap()
            .ends_with("did you mean 25 °C (298.15 K)?"));
        assert_eq!(unit_slip(Quantity::Temperature, &bare(310.15)), None);
        assert!(unit_slip(Quantity::IonicStrength, &bare(250.0))
            .unwrap()
            .ends_with("did you mean 250 mM?"));
        assert!(unit_slip(Quantity::IonicStrength, &bare(0.8))
            .unwrap()
            .ends_with("did you mean 0.8 mM?"));
        assert_eq!(unit_slip(Quantity::IonicStrength, &bare(0.25)), None);
    }

    #[test]
    fn ranges_flag_values_outside_and_keep_ordinary_ones() {
        let judged = |q, raw: &RawQuantity| {
            let value = units::parse(raw, Quantity::kind(q)).unwrap();
            judge(q, raw, value).map(|(kind, _)| kind)
        };
        assert_eq!(
            judged(Quantity::Concentration, &text("2 M")),
            Some(KIND_CONCENTRATION)
        );
        assert_eq!(judged(Quantity::Concentration, &text("1 M")), None);
        assert_eq!(
            judged(Quantity::Concentration, &text("0.5 pM")),
            Some(KIND_CONCENTRATION)
        );
        assert_eq!(judged(Quantity::Concentration, &text("1 pM")), None);
        assert_eq!(
            judged(Quantity::Temperature, &text("380 K")),
            Some(KIND_TEMPERATURE)
        );
        assert_eq!(judged(Quantity::Temperature, &text("37 °C")), None);
        assert_eq!(
            judged(Quantity::Temperature, &text("-5 °C")),
            Some(KIND_TEMPERATURE)
        );
        assert_eq!(
            judged(Quantity::IonicStrength, &text("0.6 M")),
            Some(KIND_IONIC_STRENGTH)
        );
        assert_eq!(judged(Quantity::IonicStrength, &text("0.5 M")), None);
        assert_eq!(
            judged(Quantity::Potential, &text("-350 mV")),
            Some(KIND_POTENTIAL)
        );
        assert_eq!(judged(Quantity::Potential, &text("-0.3 V")), None);
        assert_eq!(judged(Quantity::Ph, &bare(3.5)), Some(KIND_PH));
        assert_eq!(judged(Quantity::Ph, &bare(10.0)), None);
        assert_eq!(
            judged(Quantity::Temperature, &bare(25.0)),
            Some(KIND_UNIT_SLIP)
        );
    }

    #[test]
    fn remarks_carry_line_and_column() {
        let text = "id: m\ncompartments:\n  - id: c\n    ph: 3\nmetabolites:\n  - id: a_c\n    compartment: c\n    concentration: {min: 50, max: 5000}\nreactions: []\n";
        let raw: RawModelFile = serde_yaml::from_str(text).unwrap();
        let map = SourceMap::build(text);
        let remarks = scan_model("model.yaml", &raw, &map);
        let shown: Vec<String> = remarks
            .iter()
            .map(|r| {
                format!(
                    "{} {} {}",
                    r.location(),
                    r.kind,
                    r.subject.as_deref().unwrap_or("")
                )
            })
            .collect();
        assert_eq!(
            shown,
            [
                "model.yaml:4:9 implausible-ph c",
                "model.yaml:8:26 bare-number-unit-slip a_c",
                "model.yaml:8:35 bare-number-unit-slip a_c",
            ]
        );
        assert_eq!(
            remarks[1].message,
            "concentration min of `a_c`: `50` is read as 50 M (a bare number means mol/L); did you mean 50 mM?"
        );
    }
}
