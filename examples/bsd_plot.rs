//! Writes the growth of the partial Euler products `∏_{q ≤ p} #E(F_q)/q`
//! against `log log p` as an SVG file, with the least-squares slope in the
//! title (the heuristic of Birch and Swinnerton-Dyer: the slope tends to
//! the rank).
//!
//!     cargo run --release --example bsd_plot -- "[0,1,1,-2,0]" 100000 out.svg
//!
//! Arguments (all optional): the curve as a-invariants (default
//! `[0,1,1,-2,0]`, conductor 389, rank 2), the prime bound (default
//! 100000), the output file (default `bsd_plot.svg`).

use std::fmt::Write as _;
use twofold::lseries::{euler_product_growth, FIT_FROM};
use twofold::rootno::minimal_conductor_sign;
use twofold::Curve;

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let text = args.first().map(String::as_str).unwrap_or("[0,1,1,-2,0]");
    let bound: u64 = match args.get(1).map(|s| s.parse()) {
        None => 100_000,
        Some(Ok(b)) => b,
        Some(Err(e)) => fail(&format!("bad prime bound: {e}")),
    };
    let out = args.get(2).map(String::as_str).unwrap_or("bsd_plot.svg");
    let e = Curve::parse(text).unwrap_or_else(|e| fail(&e.to_string()));
    let (m, n, _) = minimal_conductor_sign(&e).unwrap_or_else(|e| fail(&e.to_string()));
    let g = euler_product_growth(&m, &n, bound).unwrap_or_else(|e| fail(&e.to_string()));
    let pts: Vec<(f64, f64)> = g.points.iter().filter(|(lp, _)| *lp > 1.0).map(|&(lp, y)| (lp.ln(), y)).collect();
    if pts.len() < 2 {
        fail("too few primes for a plot");
    }
    let title = format!(
        "E = {text}, N = {n}: log prod_(q<=p) #E(F_q)/q vs log log p, p <= {bound}: slope {:.3} (fit p >= {FIT_FROM})",
        g.slope
    );
    std::fs::write(out, svg(&pts, g.slope, g.intercept, &title)).unwrap_or_else(|e| fail(&e.to_string()));
    println!("{title}\nwritten to {out}");
}

fn fail(msg: &str) -> ! {
    eprintln!("bsd_plot: {msg}");
    std::process::exit(2)
}

fn svg(pts: &[(f64, f64)], slope: f64, intercept: f64, title: &str) -> String {
    let (w, h, pad) = (900.0, 520.0, 60.0);
    let (x0, x1) = (pts[0].0, pts[pts.len() - 1].0);
    let (mut y0, mut y1) = pts.iter().fold((f64::MAX, f64::MIN), |(a, b), p| (a.min(p.1), b.max(p.1)));
    for x in [x0, x1] {
        let y = slope * x + intercept;
        if y.is_finite() {
            y0 = y0.min(y);
            y1 = y1.max(y);
        }
    }
    if y1 - y0 < 1e-9 {
        y1 = y0 + 1.0;
    }
    let sx = |x: f64| pad + (x - x0) / (x1 - x0) * (w - 2.0 * pad);
    let sy = |y: f64| h - pad - (y - y0) / (y1 - y0) * (h - 2.0 * pad);
    let mut s = String::new();
    let _ = writeln!(s, r#"<svg xmlns="http://www.w3.org/2000/svg" width="{w}" height="{h}" font-family="sans-serif" font-size="11">"#);
    let _ = writeln!(s, r#"<rect width="100%" height="100%" fill="white"/>"#);
    let _ = writeln!(s, r#"<text x="{}" y="20" text-anchor="middle">{}</text>"#, w / 2.0, escape(title));
    let _ = writeln!(
        s,
        r#"<path d="M{pad} {pad} V{b} H{r}" stroke="black" fill="none"/>"#,
        b = h - pad,
        r = w - pad
    );
    for i in 0..=4 {
        let x = x0 + (x1 - x0) * i as f64 / 4.0;
        let y = y0 + (y1 - y0) * i as f64 / 4.0;
        let _ = writeln!(s, r#"<text x="{:.1}" y="{}" text-anchor="middle">{x:.2}</text>"#, sx(x), h - pad + 16.0);
        let _ = writeln!(s, r#"<text x="{}" y="{:.1}" text-anchor="end">{y:.2}</text>"#, pad - 4.0, sy(y) + 4.0);
    }
    let _ = writeln!(s, r#"<text x="{}" y="{}" text-anchor="middle">log log p</text>"#, w / 2.0, h - 20.0);
    let _ = writeln!(s, r#"<text x="16" y="{}" transform="rotate(-90 16 {})" text-anchor="middle">log prod</text>"#, h / 2.0, h / 2.0);
    // at most about 1500 vertices
    let step = pts.len().div_ceil(1500).max(1);
    let mut d = String::new();
    for (i, p) in pts.iter().enumerate().filter(|(i, _)| i % step == 0 || *i == pts.len() - 1) {
        let _ = write!(d, "{}{:.1} {:.1} ", if i == 0 { "M" } else { "L" }, sx(p.0), sy(p.1));
    }
    let _ = writeln!(s, r#"<path d="{d}" stroke="steelblue" fill="none"/>"#);
    if slope.is_finite() {
        let _ = writeln!(
            s,
            r#"<line x1="{:.1}" y1="{:.1}" x2="{:.1}" y2="{:.1}" stroke="firebrick" stroke-dasharray="6 4"/>"#,
            sx(x0),
            sy(slope * x0 + intercept),
            sx(x1),
            sy(slope * x1 + intercept)
        );
    }
    s.push_str("</svg>\n");
    s
}

fn escape(t: &str) -> String {
    t.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;")
}
