//! Number formatting for the pages, registered as template filters; the
//! formatting itself lives in [`crate::number_text`].

use minijinja::Environment;

pub use crate::number_text::*;

/// Registers every formatting filter on `env`.
pub fn register(env: &mut Environment<'_>) {
    env.add_filter("energy", |v: Option<f64>| opt(v, energy));
    env.add_filter("num", |v: Option<f64>| opt(v, number));
    env.add_filter("sci", |v: Option<f64>| opt(v, scientific));
    env.add_filter("kprime", |v: Option<f64>| opt(v, k_prime));
    env.add_filter("fraction", |v: Option<f64>| opt(v, fraction));
    env.add_filter("conc", |v: Option<f64>| opt(v, concentration));
    env.add_filter("coef", |v: f64| coefficient(v));
    env.add_filter("percent", |part: f64, whole: f64| percent(part, whole));
    env.add_filter("anchor", |s: &str| crate::slug::slug(s));
}

fn opt(v: Option<f64>, f: fn(f64) -> String) -> String {
    v.map_or_else(|| NONE.to_string(), f)
}
