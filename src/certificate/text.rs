//! The text form of a certificate: one record per line, fields separated
//! by spaces, `-` for an absent value, integers and rationals (`n/d`) in
//! decimal. Records that belong to a section follow the line that opens it.

use super::verify::{place_name, CertificateError};
use super::{
    AnalyticRecord, CertPoint, Certificate, IsogenyProof, LocalPoint, LocalTable, Lift, QuarticProof, SelmerClass, SideImage, SideProof,
};
use crate::solubility::Place;
use malachite::{Integer, Natural, Rational};
use std::fmt::Write;
use std::str::FromStr;

const HEADER: &str = "twofold-certificate 1";

fn opt<T: ToString>(x: &Option<T>) -> String {
    x.as_ref().map(|v| v.to_string()).unwrap_or_else(|| "-".to_string())
}

fn join<T: ToString>(xs: &[T]) -> String {
    xs.iter().map(|x| x.to_string()).collect::<Vec<_>>().join(" ")
}

fn local_text(w: &LocalPoint) -> String {
    format!("{} {} {} {}", place_name(&w.place), w.x, w.z, w.precision)
}

fn class_lines(out: &mut String, c: &SelmerClass) {
    let _ = writeln!(out, "class {} {}", opt(&c.label), join(&c.quartic));
    for w in &c.local_points {
        let _ = writeln!(out, "local {}", local_text(w));
    }
    if let Some(l) = &c.lift {
        let _ = writeln!(out, "lift {} {} {} {} {}", l.x, l.z, l.y, l.image.0, l.image.1);
    }
}

impl Certificate {
    /// The certificate as self-contained text. The layout, one record per line:
    ///
    /// ```text
    /// twofold-certificate 1
    /// input a1 a2 a3 a4 a6          minimal a1 a2 a3 a4 a6
    /// change u r s t                primes p1 p2 ...
    /// bounds lower upper            torsion x y        point x y height
    /// isogeny xT yT x0 u lower upper
    ///   side a b selmer_dim         storsion x y       image class x y
    ///   table place                 soluble c x z precision    insoluble c
    ///   class d a b c d e           local place x z precision
    /// quartic selmer_dim two_torsion_dim enumerated lower upper
    ///   descent_curve a1 a2 a3 a4 a6 degree   (only when the quartics cover an odd-isogenous curve)
    ///   class - a b c d e           local place x z precision   lift x z y X Y
    ///   ruled a b c d e place
    /// analytic order terms conductor root_number low high theorem...
    ///   rootlocal p w_p
    /// algebra ...                   (the descent over Q[X]/(f): see below)
    /// end
    /// ```
    ///
    /// Places are `R` or the prime; heights must not contain spaces. The
    /// algebra record's lines:
    ///
    /// ```text
    /// algebra shape c0 c1 c2 selmer_dim two_torsion_dim grh field_disc bound
    ///   alg_s p1 p2 ...                 (the primes of S)
    ///   alg_cand a0 a1 a2 q1 q2 ...     (a candidate a0 + a1 X + a2 X^2; q: primes outside S of its norm)
    ///   alg_sel mask a0 a1 a2           (a Selmer basis element)
    ///   alg_local place dim X1 X2 ...   (a local image and its local points)
    /// ```
    pub fn to_text(&self) -> String {
        let mut out = String::new();
        let _ = writeln!(out, "{HEADER}");
        let _ = writeln!(out, "input {}", join(&self.input));
        let _ = writeln!(out, "minimal {}", join(&self.minimal));
        let _ = writeln!(out, "change {}", join(&self.change));
        let _ = writeln!(out, "primes {}", join(&self.primes).trim_end());
        let _ = writeln!(out, "bounds {} {}", opt(&self.rank_lower), opt(&self.rank_upper));
        for (x, y) in &self.torsion {
            let _ = writeln!(out, "torsion {x} {y}");
        }
        for p in &self.points {
            let _ = writeln!(out, "point {} {} {}", p.x, p.y, opt(&p.height));
        }
        for run in &self.isogeny {
            let _ = writeln!(
                out,
                "isogeny {} {} {} {} {} {}",
                run.kernel.0,
                run.kernel.1,
                run.x0,
                run.u,
                run.lower,
                opt(&run.upper)
            );
            for side in &run.sides {
                let _ = writeln!(out, "side {} {} {}", side.a, side.b, opt(&side.selmer_dim));
                for (x, y) in &side.torsion {
                    let _ = writeln!(out, "storsion {x} {y}");
                }
                for t in &side.local {
                    let _ = writeln!(out, "table {}", place_name(&t.place));
                    for (c, w) in &t.soluble {
                        let _ = writeln!(out, "soluble {c} {} {} {}", w.x, w.z, w.precision);
                    }
                    for c in &t.insoluble {
                        let _ = writeln!(out, "insoluble {c}");
                    }
                }
                for c in &side.classes {
                    class_lines(&mut out, c);
                }
                for i in &side.images {
                    let _ = writeln!(out, "image {} {} {}", i.class, i.x, i.y);
                }
            }
        }
        if let Some(q) = &self.quartic {
            let _ = writeln!(
                out,
                "quartic {} {} {} {} {}",
                opt(&q.selmer_dim),
                q.two_torsion_dim,
                q.enumerated,
                q.lower,
                opt(&q.upper)
            );
            if let Some((a, d)) = &q.descent_curve {
                let _ = writeln!(out, "descent_curve {} {d}", join(a));
            }
            for c in &q.classes {
                class_lines(&mut out, c);
            }
            for (g, pl) in &q.ruled_out {
                let _ = writeln!(out, "ruled {} {}", join(g), place_name(pl));
            }
        }
        if let Some(a) = &self.analytic {
            let _ = writeln!(
                out,
                "analytic {} {} {} {} {} {} {}",
                a.order, a.terms, a.conductor, a.root_number, a.low, a.high, a.theorem
            );
            for (p, w) in &a.local_root_numbers {
                let _ = writeln!(out, "rootlocal {p} {w}");
            }
        }
        if let Some(a) = &self.algebra {
            super::algebra::write_lines(&mut out, a);
        }
        out.push_str("end\n");
        out
    }

    /// Reads a certificate written by [`Certificate::to_text`].
    ///
    /// Errors: [`CertificateError::Malformed`] with the line number.
    pub fn from_text(text: &str) -> Result<Certificate, CertificateError> {
        Parser::default().run(text)
    }
}

#[derive(Default)]
struct Parser {
    input: Option<[Integer; 5]>,
    minimal: Option<[Integer; 5]>,
    change: Option<[Rational; 4]>,
    primes: Option<Vec<Natural>>,
    bounds: Option<(Option<usize>, Option<usize>)>,
    torsion: Vec<(Rational, Rational)>,
    points: Vec<CertPoint>,
    runs: Vec<(IsogenyProof, Vec<SideProof>)>,
    quartic: Option<QuarticProof>,
    analytic: Option<AnalyticRecord>,
    algebra: Option<super::AlgebraRecord>,
    in_quartic: bool,
    ended: bool,
}

type Res<T> = Result<T, String>;

fn num<T: FromStr>(s: &str) -> Res<T> {
    T::from_str(s).map_err(|_| format!("cannot read the number {s:?}"))
}

fn opt_num<T: FromStr>(s: &str) -> Res<Option<T>> {
    if s == "-" {
        Ok(None)
    } else {
        num(s).map(Some)
    }
}

fn place(s: &str) -> Res<Place> {
    if s == "R" {
        Ok(Place::Real)
    } else {
        num::<Natural>(s).map(Place::Prime)
    }
}

fn five(f: &[&str]) -> Res<[Integer; 5]> {
    if f.len() != 5 {
        return Err("expected five integers".into());
    }
    Ok([num(f[0])?, num(f[1])?, num(f[2])?, num(f[3])?, num(f[4])?])
}

fn arity(f: &[&str], n: usize) -> Res<()> {
    if f.len() == n {
        Ok(())
    } else {
        Err(format!("expected {n} fields, found {}", f.len()))
    }
}

impl Parser {
    fn run(mut self, text: &str) -> Result<Certificate, CertificateError> {
        let mut lines = text.lines().enumerate().filter(|(_, l)| !l.trim().is_empty());
        match lines.next() {
            Some((_, l)) if l.trim() == HEADER => {}
            Some((n, _)) => return Err(CertificateError::Malformed { line: n + 1, message: format!("expected {HEADER:?}") }),
            None => return Err(CertificateError::Malformed { line: 1, message: "empty text".into() }),
        }
        let mut last = 1;
        for (n, l) in lines {
            last = n + 1;
            if self.ended {
                return Err(CertificateError::Malformed { line: n + 1, message: "text after end".into() });
            }
            self.line(l).map_err(|message| CertificateError::Malformed { line: n + 1, message })?;
        }
        if !self.ended {
            return Err(CertificateError::Malformed { line: last, message: "missing end".into() });
        }
        self.finish().map_err(|message| CertificateError::Malformed { line: last, message })
    }

    fn side(&mut self) -> Res<&mut SideProof> {
        if self.in_quartic {
            return Err("a side record inside the quartic section".into());
        }
        self.runs.last_mut().and_then(|r| r.1.last_mut()).ok_or_else(|| "a record outside a side".to_string())
    }

    fn class(&mut self) -> Res<&mut SelmerClass> {
        let c = if self.in_quartic {
            self.quartic.as_mut().and_then(|q| q.classes.last_mut())
        } else {
            self.runs.last_mut().and_then(|r| r.1.last_mut()).and_then(|s| s.classes.last_mut())
        };
        c.ok_or_else(|| "a record outside a class".to_string())
    }

    fn line(&mut self, l: &str) -> Res<()> {
        let mut it = l.split_whitespace();
        let key = it.next().unwrap_or("");
        let f: Vec<&str> = it.collect();
        match key {
            "input" => self.input = Some(five(&f)?),
            "minimal" => self.minimal = Some(five(&f)?),
            "change" => {
                arity(&f, 4)?;
                self.change = Some([num(f[0])?, num(f[1])?, num(f[2])?, num(f[3])?]);
            }
            "primes" => self.primes = Some(f.iter().map(|s| num(s)).collect::<Res<_>>()?),
            "bounds" => {
                arity(&f, 2)?;
                self.bounds = Some((opt_num(f[0])?, opt_num(f[1])?));
            }
            "torsion" => {
                arity(&f, 2)?;
                self.torsion.push((num(f[0])?, num(f[1])?));
            }
            "point" => {
                arity(&f, 3)?;
                let height = if f[2] == "-" { None } else { Some(f[2].to_string()) };
                self.points.push(CertPoint { x: num(f[0])?, y: num(f[1])?, height });
            }
            "isogeny" => {
                arity(&f, 6)?;
                if self.in_quartic {
                    return Err("isogeny section after the quartic section".into());
                }
                let empty = SideProof { a: Integer::from(0), b: Integer::from(0), selmer_dim: None, torsion: vec![], local: vec![], classes: vec![], images: vec![] };
                let run = IsogenyProof {
                    kernel: (num(f[0])?, num(f[1])?),
                    x0: num(f[2])?,
                    u: num(f[3])?,
                    sides: [empty.clone(), empty],
                    lower: num(f[4])?,
                    upper: opt_num(f[5])?,
                };
                self.runs.push((run, vec![]));
            }
            "side" => {
                arity(&f, 3)?;
                let run = self.runs.last_mut().ok_or("a side outside an isogeny section")?;
                if run.1.len() == 2 || self.in_quartic {
                    return Err("more than two sides".into());
                }
                run.1.push(SideProof {
                    a: num(f[0])?,
                    b: num(f[1])?,
                    selmer_dim: opt_num(f[2])?,
                    torsion: vec![],
                    local: vec![],
                    classes: vec![],
                    images: vec![],
                });
            }
            "storsion" => {
                arity(&f, 2)?;
                let p = (num(f[0])?, num(f[1])?);
                self.side()?.torsion.push(p);
            }
            "table" => {
                arity(&f, 1)?;
                let pl = place(f[0])?;
                self.side()?.local.push(LocalTable { place: pl, soluble: vec![], insoluble: vec![] });
            }
            "soluble" => {
                arity(&f, 4)?;
                let (c, x, z, precision): (Integer, Integer, Integer, u64) = (num(f[0])?, num(f[1])?, num(f[2])?, num(f[3])?);
                let t = self.side()?.local.last_mut().ok_or("a soluble class outside a table")?;
                let place = t.place.clone();
                t.soluble.push((c, LocalPoint { place, x, z, precision }));
            }
            "insoluble" => {
                arity(&f, 1)?;
                let c: Integer = num(f[0])?;
                self.side()?.local.last_mut().ok_or("an insoluble class outside a table")?.insoluble.push(c);
            }
            "image" => {
                arity(&f, 3)?;
                let i = SideImage { class: num(f[0])?, x: num(f[1])?, y: num(f[2])? };
                self.side()?.images.push(i);
            }
            "class" => {
                arity(&f, 6)?;
                let c = SelmerClass { label: opt_num(f[0])?, quartic: five(&f[1..])?, local_points: vec![], lift: None };
                if self.in_quartic {
                    self.quartic.as_mut().ok_or("no quartic section")?.classes.push(c);
                } else {
                    self.side()?.classes.push(c);
                }
            }
            "local" => {
                arity(&f, 4)?;
                let w = LocalPoint { place: place(f[0])?, x: num(f[1])?, z: num(f[2])?, precision: num(f[3])? };
                self.class()?.local_points.push(w);
            }
            "lift" => {
                arity(&f, 5)?;
                let l = Lift { x: num(f[0])?, z: num(f[1])?, y: num(f[2])?, image: (num(f[3])?, num(f[4])?) };
                self.class()?.lift = Some(l);
            }
            "quartic" => {
                arity(&f, 5)?;
                if self.quartic.is_some() {
                    return Err("a second quartic section".into());
                }
                self.in_quartic = true;
                self.quartic = Some(QuarticProof {
                    selmer_dim: opt_num(f[0])?,
                    two_torsion_dim: num(f[1])?,
                    enumerated: num(f[2])?,
                    classes: vec![],
                    ruled_out: vec![],
                    lower: num(f[3])?,
                    upper: opt_num(f[4])?,
                    descent_curve: None,
                });
            }
            "descent_curve" => {
                arity(&f, 6)?;
                let a = five(&f[..5])?;
                let d: u64 = num(f[5])?;
                let q = self.quartic.as_mut().ok_or("a descent curve outside the quartic section")?;
                if q.descent_curve.is_some() || !q.classes.is_empty() {
                    return Err("a misplaced descent curve".into());
                }
                q.descent_curve = Some((a, d));
            }
            "ruled" => {
                arity(&f, 6)?;
                let g = five(&f[..5])?;
                let pl = place(f[5])?;
                self.quartic.as_mut().ok_or("a ruled-out quartic outside the quartic section")?.ruled_out.push((g, pl));
            }
            "analytic" => {
                if f.len() < 7 {
                    return Err(format!("expected at least 7 fields, found {}", f.len()));
                }
                if self.analytic.is_some() {
                    return Err("a second analytic record".into());
                }
                for b in [f[4], f[5]] {
                    num::<f64>(b)?;
                }
                self.analytic = Some(AnalyticRecord {
                    order: num(f[0])?,
                    terms: num(f[1])?,
                    conductor: num(f[2])?,
                    root_number: num(f[3])?,
                    local_root_numbers: vec![],
                    low: f[4].to_string(),
                    high: f[5].to_string(),
                    theorem: f[6..].join(" "),
                });
            }
            "rootlocal" => {
                arity(&f, 2)?;
                let e = (num(f[0])?, num(f[1])?);
                self.analytic.as_mut().ok_or("a local root number outside the analytic record")?.local_root_numbers.push(e);
            }
            "end" => {
                arity(&f, 0)?;
                self.ended = true;
            }
            other if super::algebra::is_algebra_line(other) => super::algebra::read_line(&mut self.algebra, other, &f)?,
            other => return Err(format!("unknown record {other:?}")),
        }
        Ok(())
    }

    fn finish(self) -> Res<Certificate> {
        let (rank_lower, rank_upper) = self.bounds.ok_or("missing bounds")?;
        let mut isogeny = Vec::new();
        for (mut run, sides) in self.runs {
            let [e, e1]: [SideProof; 2] = sides.try_into().map_err(|_| "an isogeny section needs two sides".to_string())?;
            run.sides = [e, e1];
            isogeny.push(run);
        }
        Ok(Certificate {
            input: self.input.ok_or("missing input")?,
            minimal: self.minimal.ok_or("missing minimal")?,
            change: self.change.ok_or("missing change")?,
            primes: self.primes.ok_or("missing primes")?,
            rank_lower,
            rank_upper,
            torsion: self.torsion,
            points: self.points,
            isogeny,
            quartic: self.quartic,
            analytic: self.analytic,
            algebra: self.algebra,
        })
    }
}
