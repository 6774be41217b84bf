//! Probe: time the class group (mode `cg`) or K(S,2) for S = primes dividing
//! 2 disc (mode `ks`) of cubic fields x^3 + a x + b given on the command line:
//! `fieldprobe MODE a b [a b ...]` (deadline: `FIELDPROBE_SECONDS`, default 60).
use malachite::Integer;
use std::time::Instant;
use twofold::numfield::{ClassGroupOptions, NumberField};

fn main() {
    let mut args: Vec<String> = std::env::args().skip(1).collect();
    let mode = if args.first().is_some_and(|m| m == "cg" || m == "ks") { args.remove(0) } else { "cg".to_string() };
    for pair in args.chunks(2) {
        let a: Integer = pair[0].parse().unwrap();
        let b: Integer = pair[1].parse().unwrap();
        let f = vec![b, a, Integer::from(0), Integer::from(1)];
        let t = Instant::now();
        let k = match NumberField::new(&f) { Ok(k) => k, Err(e) => { println!("{:?} {}", pair, e); continue; } };
        let t1 = t.elapsed();
        // wall-clock deadline, 60 s unless FIELDPROBE_SECONDS says otherwise (a loaded machine needs more)
        let secs: u64 = std::env::var("FIELDPROBE_SECONDS").ok().and_then(|s| s.parse().ok()).unwrap_or(60);
        let opts = ClassGroupOptions::default().with_deadline(Instant::now() + std::time::Duration::from_secs(secs));
        if mode == "ks" {
            let s: Vec<u64> = vec![2];
            let r = k.square_classes(&s, &opts);
            let t2 = t.elapsed();
            match r {
                Ok(ks) => println!("a={} b={} d={} field {:?} total {:?} dim={} fb={} bound={} grh={}", pair[0], pair[1], k.discriminant(), t1, t2, ks.dimension(), ks.factor_base.len(), ks.generation_bound, ks.conditional_on_grh()),
                Err(e) => println!("a={} b={} d={} field {:?} total {:?} ERR {}", pair[0], pair[1], k.discriminant(), t1, t2, e),
            }
            continue;
        }
        let r = k.class_group(&opts);
        let t2 = t.elapsed();
        match r {
            Ok(cg) => {
                let bits: Vec<u64> = cg.unit_products.iter().map(|u| u.exponent_bits()).collect();
                println!("a={} b={} d={} field {:?} total {:?} h={} R={:.6} ratio={:.3} fb={} kind={:?} unit-exponent-bits={:?} compact={}", pair[0], pair[1], k.discriminant(), t1, t2, cg.class_number, cg.regulator, cg.analytic_ratio, cg.factor_base.len(), cg.bound_kind, bits, !cg.units.is_empty() || bits.is_empty())
            }
            Err(e) => println!("a={} b={} d={} field {:?} total {:?} ERR {}", pair[0], pair[1], k.discriminant(), t1, t2, e),
        }
    }
}
