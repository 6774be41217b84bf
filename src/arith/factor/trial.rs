//! Trial division by the primes below 2^16 and the perfect-power test.

use super::*;

const TRIAL_BOUND: u64 = 1 << 16;

fn trial_primes() -> &'static [u64] {
    static P: OnceLock<Vec<u64>> = OnceLock::new();
    P.get_or_init(|| primes_up_to(TRIAL_BOUND))
}

/// Remove all prime factors below 2^16 from `m`, recording them; returns the cofactor.
/// `None` when `stop` says so (looked at every 64 groups on numbers of more
/// than 64 limbs, where one group costs a pass over the limbs).
pub(super) fn trial_divide(m: &Natural, found: &mut BTreeMap<Natural, u32>, stop: &dyn Fn() -> bool) -> Option<Natural> {
    let mut m = m.clone();
    let primes = trial_primes();
    let mut i = 0;
    let mut groups = 0u32;
    while i < primes.len() && m > 1u32 {
        groups += 1;
        if groups % 64 == 0 && m.limb_count() > 64 && stop() {
            return None;
        }
        // group primes so their product fits a word
        let mut prod: u64 = 1;
        let mut j = i;
        while j < primes.len() && (prod as u128 * primes[j] as u128) < (1u128 << 64) {
            prod *= primes[j];
            j += 1;
        }
        let r = rem_u64(&m, prod);
        for &p in &primes[i..j] {
            if r % p == 0 {
                let pn = Natural::from(p);
                let mut k = 0;
                while rem_u64(&m, p) == 0 {
                    m /= &pn;
                    k += 1;
                }
                found.insert(pn, k);
            }
        }
        i = j;
        // once m is small, stop early: what remains is prime or factored later
        if m.limb_count() <= 1 && u64::saturating_from(&m) < primes[i.min(primes.len() - 1)].saturating_mul(primes[i.min(primes.len() - 1)]) {
            break;
        }
    }
    Some(m)
}

/// `Some((r, k))` with `n = r^k`, `k > 1` maximal-ish (a prime `k`), for `n`
/// without prime factors below 2^16.
/// The outer `None` when `stop` said so first (looked at before each root).
pub(super) fn perfect_power(n: &Natural, stop: &dyn Fn() -> bool) -> Option<Option<(Natural, u32)>> {
    let bits = n.significant_bits();
    for k in primes_up_to(bits / 16 + 1) {
        if bits > 4096 && stop() {
            return None;
        }
        if let Some(r) = n.checked_root(k) {
            return Some(Some((r, k as u32)));
        }
    }
    Some(None)
}
