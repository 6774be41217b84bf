//! Reading curves from text: `[a1,a2,a3,a4,a6]`, the short form `[a4,a6]`,
//! or an equation such as `y^2 + x*y + y = x^3 - x^2 - 10*x - 20`.

use crate::error::{Error, ErrorKind};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};
use std::str::FromStr;

/// Longest input accepted, in bytes: a guard against absurd sizes.
pub const MAX_INPUT_LEN: usize = 20_000;

fn perr(msg: impl Into<String>) -> Error {
    Error::new(ErrorKind::Parse, msg)
}

/// Reads a rational number `n` or `n/d` (optional sign, decimal digits).
///
/// ```
/// use twofold::curve::parse_rational;
/// assert_eq!(parse_rational("-3/6").unwrap().to_string(), "-1/2");
/// assert!(parse_rational("1/0").is_err());
/// ```
pub fn parse_rational(text: &str) -> Result<Rational, Error> {
    let t = text.trim();
    if t.is_empty() {
        return Err(perr("expected a number, found nothing"));
    }
    if t.len() > MAX_INPUT_LEN {
        return Err(Error::new(ErrorKind::TooLarge, format!("a number of {} characters is too long", t.len())));
    }
    let (num, den) = match t.split_once('/') {
        Some((n, d)) => (n.trim(), Some(d.trim())),
        None => (t, None),
    };
    let n = parse_integer(num)?;
    match den {
        None => Ok(Rational::from(n)),
        Some(d) => {
            let d = parse_integer(d)?;
            if d == Integer::ZERO {
                return Err(Error::new(ErrorKind::InvalidValue, format!("zero denominator in {t:?}")));
            }
            Ok(Rational::from_integers(n, d))
        }
    }
}

fn parse_integer(t: &str) -> Result<Integer, Error> {
    let body = t.strip_prefix(['+', '-']).unwrap_or(t);
    if body.is_empty() || !body.bytes().all(|b| b.is_ascii_digit()) {
        return Err(perr(format!("expected an integer, found {t:?}")));
    }
    let n = Natural::from_str(body).map_err(|_| perr(format!("expected an integer, found {t:?}")))?;
    let n = Integer::from(n);
    Ok(if t.starts_with('-') { -n } else { n })
}

/// Reads the a-invariants of a curve from text, without checking that the
/// model is non-singular. Accepted forms:
/// - `[a1,a2,a3,a4,a6]` (entries integers or rationals `n/d`),
/// - `[a4,a6]` for `y^2 = x^3 + a4 x + a6`,
/// - an equation in x and y of the shape
///   `y^2 + a1*x*y + a3*y = x^3 + a2*x^2 + a4*x + a6` (terms in any order, on
///   either side, `*` optional between a coefficient and a variable).
///
/// ```
/// use twofold::curve::parse_coefficients;
/// let a = parse_coefficients("y^2 + x*y + y = x^3 - x^2 - 10*x - 20").unwrap();
/// let s: Vec<String> = a.iter().map(|c| c.to_string()).collect();
/// assert_eq!(s, ["1", "-1", "1", "-10", "-20"]);
/// assert_eq!(parse_coefficients("[-1, 0]").unwrap()[3].to_string(), "-1");
/// ```
pub fn parse_coefficients(text: &str) -> Result<[Rational; 5], Error> {
    if text.len() > MAX_INPUT_LEN {
        return Err(Error::new(ErrorKind::TooLarge, format!("input of {} bytes exceeds the limit of {MAX_INPUT_LEN}", text.len())));
    }
    let t = text.trim();
    if t.is_empty() {
        return Err(perr("empty input: expected [a1,a2,a3,a4,a6], [a4,a6] or an equation y^2 + ... = x^3 + ..."));
    }
    if let Some(rest) = t.strip_prefix('[') {
        let inner = rest
            .strip_suffix(']')
            .ok_or_else(|| perr(format!("missing closing ']' in {t:?}")))?;
        let parts: Vec<&str> = inner.split(',').collect();
        let vals: Vec<Rational> = parts
            .iter()
            .enumerate()
            .map(|(i, p)| parse_rational(p).map_err(|e| Error::new(e.kind().clone(), format!("entry {} of the list: {}", i + 1, e.message()))))
            .collect::<Result<_, _>>()?;
        return match vals.len() {
            // the length is matched: the conversions cannot fail
            5 => Ok(vals.try_into().unwrap_or_default()),
            2 => {
                let [a4, a6]: [Rational; 2] = vals.try_into().unwrap_or_default();
                Ok([Rational::ZERO, Rational::ZERO, Rational::ZERO, a4, a6])
            }
            n => Err(perr(format!("expected 5 entries [a1,a2,a3,a4,a6] or 2 entries [a4,a6], found {n}"))),
        };
    }
    parse_equation(t)
}

/// Monomial x^i y^j, stored as coefficient table index.
#[derive(Clone, Copy, PartialEq, Eq)]
struct Mono {
    x: u32,
    y: u32,
}

fn parse_equation(t: &str) -> Result<[Rational; 5], Error> {
    let (lhs, rhs) = t
        .split_once('=')
        .ok_or_else(|| perr(format!("expected a list [..] or an equation with '=', found {t:?}")))?;
    if rhs.contains('=') {
        return Err(perr("more than one '=' in the equation"));
    }
    // coefficients of y^2, xy, y, x^3, x^2, x, 1 in lhs - rhs
    let mut coef: [Rational; 7] = Default::default();
    for (side, sign) in [(lhs, 1i32), (rhs, -1)] {
        for (mono, c) in parse_polynomial(side)? {
            let idx = match (mono.x, mono.y) {
                (0, 2) => 0,
                (1, 1) => 1,
                (0, 1) => 2,
                (3, 0) => 3,
                (2, 0) => 4,
                (1, 0) => 5,
                (0, 0) => 6,
                (i, j) => {
                    return Err(perr(format!(
                        "the term x^{i}*y^{j} cannot occur in a Weierstrass equation y^2 + a1*x*y + a3*y = x^3 + a2*x^2 + a4*x + a6"
                    )))
                }
            };
            if sign > 0 {
                coef[idx] += c;
            } else {
                coef[idx] -= c;
            }
        }
    }
    let lead = coef[0].clone();
    if lead == Rational::ZERO {
        return Err(perr("the equation has no y^2 term"));
    }
    if coef[3] != -&lead {
        return Err(perr("the coefficient of x^3 must equal that of y^2 on the other side (a Weierstrass equation)"));
    }
    let n = |c: &Rational| c / &lead;
    Ok([n(&coef[1]), -n(&coef[4]), n(&coef[2]), -n(&coef[5]), -n(&coef[6])])
}

fn parse_polynomial(s: &str) -> Result<Vec<(Mono, Rational)>, Error> {
    // spaces separate tokens but may not split a number: "2 362" is an
    // error, not 2362
    let chars: Vec<char> = s.chars().collect();
    for (k, w) in chars.windows(2).enumerate() {
        if w[0].is_ascii_digit() && w[1].is_whitespace() {
            if let Some(next) = chars[k + 1..].iter().find(|c| !c.is_whitespace()) {
                if next.is_ascii_digit() {
                    return Err(perr(format!("a space splits a number in {:?}", s.trim())));
                }
            }
        }
    }
    let s: String = s.chars().filter(|c| !c.is_whitespace()).collect();
    if s.is_empty() {
        return Err(perr("one side of the equation is empty"));
    }
    // split into signed terms
    let mut terms = Vec::new();
    let mut cur = String::new();
    for (i, ch) in s.chars().enumerate() {
        if (ch == '+' || ch == '-') && i > 0 && !cur.ends_with('^') && !cur.is_empty() {
            terms.push(std::mem::take(&mut cur));
        }
        cur.push(ch);
    }
    terms.push(cur);
    let mut out = Vec::new();
    for term in terms {
        out.push(parse_term(&term)?);
    }
    Ok(out)
}

fn parse_term(term: &str) -> Result<(Mono, Rational), Error> {
    let (neg, body) = match term.as_bytes().first() {
        Some(b'-') => (true, &term[1..]),
        Some(b'+') => (false, &term[1..]),
        _ => (false, term),
    };
    if body.is_empty() {
        return Err(perr(format!("dangling sign in term {term:?}")));
    }
    let mut c = Rational::ONE;
    let mut m = Mono { x: 0, y: 0 };
    // factors separated by '*'; a factor may also be a number immediately followed by a variable ("3x")
    for factor in body.split('*') {
        if factor.is_empty() {
            return Err(perr(format!("empty factor in term {term:?}")));
        }
        let split = factor.find(['x', 'y']).unwrap_or(factor.len());
        let (num, var) = factor.split_at(split);
        if !num.is_empty() {
            c *= parse_rational(num).map_err(|e| Error::new(e.kind().clone(), format!("in term {term:?}: {}", e.message())))?;
        }
        if var.is_empty() {
            continue;
        }
        // a run of variables with optional exponents, e.g. "x", "x^2", "xy", "x^2y"
        let bytes = var.as_bytes();
        let mut i = 0;
        while i < bytes.len() {
            let name = bytes[i];
            if name != b'x' && name != b'y' {
                return Err(perr(format!("unknown symbol {:?} in term {term:?}: only x and y are allowed", &var[i..])));
            }
            i += 1;
            let mut power = 1u32;
            if i < bytes.len() && bytes[i] == b'^' {
                let start = i + 1;
                let mut end = start;
                while end < bytes.len() && bytes[end].is_ascii_digit() {
                    end += 1;
                }
                power = var[start..end]
                    .parse()
                    .map_err(|_| perr(format!("bad exponent in term {term:?}")))?;
                if power > 3 {
                    return Err(perr(format!("degree too high in term {term:?}")));
                }
                i = end;
            }
            if name == b'x' { m.x += power } else { m.y += power }
        }
        if m.x > 3 || m.y > 2 {
            return Err(perr(format!("degree too high in term {term:?}")));
        }
    }
    if neg {
        c = -c;
    }
    Ok((m, c))
}

impl super::Curve {
    /// Reads a curve from text (see [`parse_coefficients`] for the forms accepted).
    /// The a-invariants must be integers here; rational a-invariants are
    /// accepted by [`super::Curve::parse_scaled`], which also returns the change of model.
    ///
    /// ```
    /// use twofold::Curve;
    /// let e = Curve::parse("y^2 + y = x^3 - x").unwrap();
    /// assert_eq!(e.discriminant().to_string(), "37");
    /// assert!(Curve::parse("[1,2,3]").is_err());
    /// ```
    pub fn parse(text: &str) -> Result<super::Curve, Error> {
        let a = parse_coefficients(text)?;
        let mut ints: Vec<Integer> = Vec::with_capacity(5);
        for (i, c) in a.iter().enumerate() {
            let (n, d) = c.to_numerator_and_denominator();
            if d != Natural::ONE {
                return Err(Error::new(
                    ErrorKind::InvalidValue,
                    format!("a-invariant {} = {c} is not an integer; use Curve::parse_scaled for rational models", ["a1", "a2", "a3", "a4", "a6"][i]),
                ));
            }
            let n = Integer::from(n);
            ints.push(if *c < Rational::ZERO { -n } else { n });
        }
        // five entries, one per a-invariant: the conversion cannot fail
        super::Curve::new(ints.try_into().unwrap_or_default())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::ErrorKind;

    #[test]
    fn forms_agree() {
        let a = parse_coefficients("[1,-1,1,-10,-20]").unwrap();
        let b = parse_coefficients("y^2+x*y+y=x^3-x^2-10*x-20").unwrap();
        let c = parse_coefficients("  x^3 - x^2 - 10x - 20 = y^2 + xy + y ").unwrap();
        assert_eq!(a, b);
        assert_eq!(a, c);
        let d = parse_coefficients("2y^2 = 2x^3 - 4x").unwrap();
        assert_eq!(d, parse_coefficients("[0,0,0,-2,0]").unwrap());
    }

    #[test]
    fn bad_input_gives_typed_errors() {
        for (t, k) in [
            ("", ErrorKind::Parse),
            ("   ", ErrorKind::Parse),
            ("hello", ErrorKind::Parse),
            ("[1,2,3]", ErrorKind::Parse),
            ("[1,2,3,4,x]", ErrorKind::Parse),
            ("[1,2,3,4,5", ErrorKind::Parse),
            ("[0,0,0,1/0,1]", ErrorKind::InvalidValue),
            ("y^2 = x^4 + 1", ErrorKind::Parse),
            ("y^2 = 2x^3 + 1", ErrorKind::Parse),
            ("y^2 + z = x^3", ErrorKind::Parse),
            ("y^2 = x^3 =", ErrorKind::Parse),
            ("y^2 = x^3 + -", ErrorKind::Parse),
            ("[0,0,0,0,0]", ErrorKind::Singular),
            ("[0,0,0,1/2,0]", ErrorKind::InvalidValue),
            // a space inside a number is an error, not a joined number
            // (issue 12: this was read as -2362x)
            ("y^2 = x^3 - 2 362x", ErrorKind::Parse),
            ("y^2 = x^3 - 2\t362*x + 1", ErrorKind::Parse),
            ("[0,0,0,-2 362,0]", ErrorKind::Parse),
        ] {
            let e = crate::Curve::parse(t).unwrap_err();
            assert_eq!(e.kind(), &k, "input {t:?}: {e}");
        }
        // spaces between tokens stay allowed
        assert_eq!(
            crate::Curve::parse("y ^ 2 = x ^ 3 - 2 x + 1").unwrap(),
            crate::Curve::parse("[0,0,0,-2,1]").unwrap()
        );
        let huge = "9".repeat(MAX_INPUT_LEN + 1);
        assert_eq!(crate::Curve::parse(&format!("[{huge},0]")).unwrap_err().kind(), &ErrorKind::TooLarge);
    }
}

impl super::Curve {
    /// Reads a curve whose a-invariants may be rational, and scales it to an
    /// integral model. Returns the integral curve and the change of model
    /// from the model as written to it (`ModelChange::unmap_point` takes
    /// points back to the model as written).
    ///
    /// ```
    /// use twofold::Curve;
    /// let (e, ch) = Curve::parse_scaled("[0,0,0,1/4,1/8]").unwrap();
    /// assert!(e.coefficients().iter().all(|_| true));
    /// assert!(!ch.is_identity());
    /// ```
    pub fn parse_scaled(text: &str) -> Result<(super::Curve, super::ModelChange), Error> {
        let a = parse_coefficients(text)?;
        super::Curve::from_rational_coefficients(a)
    }
}
