//! A small JSON writer (no dependency) for reports: integers and rationals
//! are written as decimal strings so that no precision is lost.

use super::RankReport;
use crate::curve::Point;

/// Builds one JSON object field by field (crate-private; the public JSON
/// forms are `RankReport::to_json` and `error_json`).
#[derive(Default)]
pub struct JsonWriter {
    out: String,
}

/// Escapes a string as a JSON string literal.
pub(crate) fn quote(s: &str) -> String {
    let mut o = String::with_capacity(s.len() + 2);
    o.push('"');
    for ch in s.chars() {
        match ch {
            '"' => o.push_str("\\\""),
            '\\' => o.push_str("\\\\"),
            '\n' => o.push_str("\\n"),
            '\r' => o.push_str("\\r"),
            '\t' => o.push_str("\\t"),
            c if (c as u32) < 0x20 => o.push_str(&format!("\\u{:04x}", c as u32)),
            c => o.push(c),
        }
    }
    o.push('"');
    o
}

impl JsonWriter {
    /// An empty object.
    pub fn new() -> Self {
        JsonWriter { out: String::from("{") }
    }
    fn key(&mut self, k: &str) {
        if self.out.len() > 1 {
            self.out.push(',');
        }
        self.out.push_str(&quote(k));
        self.out.push(':');
    }
    /// Adds a string field.
    pub fn string(&mut self, k: &str, v: &str) {
        self.key(k);
        self.out.push_str(&quote(v));
    }
    /// Adds a field whose value is already JSON.
    pub fn raw(&mut self, k: &str, v: &str) {
        self.key(k);
        self.out.push_str(v);
    }
    /// Closes the object.
    pub fn finish(mut self) -> String {
        if self.out.is_empty() {
            self.out.push('{');
        }
        self.out.push('}');
        self.out
    }
}

fn list<T>(xs: &[T], f: impl Fn(&T) -> String) -> String {
    format!("[{}]", xs.iter().map(f).collect::<Vec<_>>().join(","))
}

fn opt(x: Option<usize>) -> String {
    x.map(|v| v.to_string()).unwrap_or_else(|| "null".into())
}

pub(crate) fn point_json(p: &Point) -> String {
    match p {
        Point::Infinity => "null".into(),
        Point::Affine(x, y) => format!("[{},{}]", quote(&x.to_string()), quote(&y.to_string())),
    }
}

pub(crate) fn report_json(r: &RankReport, input: &str) -> String {
    let mut w = JsonWriter::new();
    w.string("input", input);
    w.raw("minimal_model", &list(r.minimal.coefficients(), |a| quote(&a.to_string())));
    w.string("conductor", &r.conductor.to_string());
    if r.torsion_known {
        w.raw("torsion", &list(&r.torsion, |n| n.to_string()));
    } else {
        w.raw("torsion", "null");
    }
    w.raw("rank_lower", &opt(r.rank_lower));
    w.raw("rank_upper", &opt(r.rank_upper));
    w.raw("rank", &opt(r.rank()));
    w.raw("rank_proven_by", &list(&r.rank_proven_by, |p| quote(p.name())));
    w.raw("descent_bounds", &format!("[{},{}]", opt(r.descent_bounds.0), opt(r.descent_bounds.1)));
    w.string("route", r.route.name());
    w.raw(
        "isogeny_selmer_dims",
        &r.isogeny_selmer_dims.map(|(a, b)| format!("[{a},{b}]")).unwrap_or_else(|| "null".into()),
    );
    w.raw("two_selmer_dim", &opt(r.two_selmer_dim));
    w.raw("two_selmer_route", &r.two_selmer_route().map(quote).unwrap_or_else(|| "null".into()));
    w.raw(
        "descent_curve",
        &r.descent_curve
            .as_ref()
            .map(|(c, d)| {
                let mut o = JsonWriter::new();
                o.raw("coefficients", &list(c.coefficients(), |a| quote(&a.to_string())));
                o.raw("isogeny_degree", &d.to_string());
                o.finish()
            })
            .unwrap_or_else(|| "null".into()),
    );
    w.raw(
        "analytic_route",
        &r.analytic
            .as_ref()
            .map(|a| {
                let mut o = JsonWriter::new();
                o.raw("root_number", &a.root_number.map(|w| w.to_string()).unwrap_or_else(|| "null".into()));
                match &a.value {
                    Some(v) => {
                        let (lo, hi) = v.decimal_bounds();
                        o.raw("order", &v.order.to_string());
                        o.raw("enclosure", &format!("[{},{}]", quote(&lo), quote(&hi)));
                        o.raw("terms", &v.terms.to_string());
                    }
                    None => {
                        o.raw("order", "null");
                        o.raw("enclosure", "null");
                        o.raw("terms", "null");
                    }
                }
                o.raw("rank", &opt(a.rank));
                o.finish()
            })
            .unwrap_or_else(|| "null".into()),
    );
    w.raw("sha2_order", &r.sha2_dim.map(|d| quote(&(malachite::Natural::from(1u32) << d).to_string())).unwrap_or_else(|| "null".into()));
    w.raw(
        "isogeny_sha_dims",
        &if r.isogeny_sha_dims.is_empty() {
            "null".to_string()
        } else {
            list(&r.isogeny_sha_dims, |(d, e)| format!("[{d}, {e}]"))
        },
    );
    w.raw("points", &list(&r.points, point_json));
    w.raw(
        "sha_suspects",
        &list(&r.sha_suspects, |s| {
            let mut o = JsonWriter::new();
            o.string("origin", &s.origin);
            o.raw("quartic", &list(&s.quartic, |c| quote(&c.to_string())));
            o.raw("class", &s.class.as_ref().map(|c| quote(&c.to_string())).unwrap_or_else(|| "null".into()));
            o.raw("everywhere_locally_soluble", "true");
            o.raw("searched_height", &s.searched_height.to_string());
            o.raw("in_sha", if s.in_sha { "true" } else { "false" });
            o.finish()
        }),
    );
    let ev = r.evidence.as_ref();
    let num = |x: Option<f64>| x.filter(|v| v.is_finite()).map(|v| format!("{v:.12e}")).map(|t| quote(&t)).unwrap_or_else(|| "null".into());
    w.raw("root_number", &ev.and_then(|e| e.root_number).map(|v| v.to_string()).unwrap_or_else(|| "null".into()));
    w.raw("vanishing_order", &opt(ev.and_then(|e| e.vanishing_order)));
    w.raw(
        "saturated_basis",
        &ev.and_then(|e| e.generators.as_ref()).map(|g| list(g, point_json)).unwrap_or_else(|| "null".into()),
    );
    w.raw("regulator", &num(ev.and_then(|e| e.regulator)));
    w.raw("period_omega", &num(ev.and_then(|e| e.real_period)));
    w.raw(
        "tamagawa_numbers",
        &ev.map(|e| list(&e.tamagawa, |(p, c)| format!("[{},{c}]", quote(&p.to_string())))).unwrap_or_else(|| "null".into()),
    );
    w.raw("sha_bsd_estimate", &num(ev.and_then(|e| e.sha_bsd_estimate)));
    w.raw("certificate", &r.certificate.as_ref().map(|c| quote(c)).unwrap_or_else(|| "null".into()));
    w.raw("budget_exhausted", if r.budget_exhausted { "true" } else { "false" });
    w.raw("elapsed_ms", &r.elapsed.as_millis().to_string());
    w.finish()
}

/// The JSON line for an input that could not be analysed: `{"input": ..., "error": ...}`.
pub fn error_json(input: &str, err: &crate::Error) -> String {
    let mut w = JsonWriter::new();
    w.string("input", input);
    w.string("error", &err.to_string());
    w.finish()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn writer_escapes_and_joins() {
        let mut w = JsonWriter::new();
        w.string("input", "say \"hi\"");
        w.raw("n", "3");
        assert_eq!(w.finish(), r#"{"input":"say \"hi\"","n":3}"#);
    }
}
