//! Sorting by a number, through one instance of the standard library's sort.
//!
//! Every `sort_by` with its own element type and closure is a separate copy of the
//! standard library's sort in the page's WebAssembly (about 5 KB each; there were
//! thirteen). Here one sort of 128-bit integers serves them all: a number's bits in
//! `total_cmp` order above its position, and the elements are then moved into that order,
//! so the only per-type code is the move.
//!
//! Architecture invariant: pure functions, no allocation beyond the pairs and the result;
//! the order is `f64::total_cmp`'s, ties kept in their original order (a stable sort), so
//! a NaN key sorts after +inf (before -inf when descending) and never panics.

/// `x` as an unsigned integer in `f64::total_cmp` order (the sign bit flipped for
/// positive numbers, every bit for negative ones): the order `total_cmp` documents.
fn ordered_bits(x: f64) -> u64 {
    let b = x.to_bits();
    if b >> 63 == 1 {
        !b
    } else {
        b | (1 << 63)
    }
}

/// The inverse of [`ordered_bits`].
fn from_ordered_bits(u: u64) -> f64 {
    f64::from_bits(if u >> 63 == 1 { u & !(1 << 63) } else { !u })
}

/// The one sort: 128-bit integers, ascending.
fn sort_wide(v: &mut [u128]) {
    v.sort_unstable();
}

/// Positions of `keys` in ascending `f64::total_cmp` order, ties in position order.
pub fn ascending_positions(keys: &[f64]) -> Vec<usize> {
    let mut wide: Vec<u128> =
        keys.iter().zip(0u64..).map(|(&k, i)| (u128::from(ordered_bits(k)) << 64) | u128::from(i)).collect();
    sort_wide(&mut wide);
    wide.into_iter().map(|w| w as u64 as usize).collect()
}

/// Slices up to this long are sorted in place by insertion (no allocation: the optimizer
/// sorts a few gaps per evaluation).
const SHORT: usize = 16;

/// Insertion sort of a short slice by `less`.
fn insertion<T: Copy>(v: &mut [T], less: impl Fn(&T, &T) -> bool) {
    for i in 1..v.len() {
        let x = v[i];
        let mut k = i;
        while k > 0 && less(&x, &v[k - 1]) {
            v[k] = v[k - 1];
            k -= 1;
        }
        v[k] = x;
    }
}

/// Sort numbers ascending in `f64::total_cmp` order (as `v.sort_unstable_by(f64::total_cmp)`).
pub fn sort_numbers(v: &mut [f64]) {
    if v.len() <= SHORT {
        return insertion(v, |a, b| a.total_cmp(b).is_lt());
    }
    let mut wide: Vec<u128> = v.iter().map(|&x| u128::from(ordered_bits(x)) << 64).collect();
    sort_wide(&mut wide);
    for (x, w) in v.iter_mut().zip(wide) {
        *x = from_ordered_bits((w >> 64) as u64);
    }
}

/// Sort indices ascending (as `v.sort_unstable()`).
pub fn sort_indices(v: &mut [usize]) {
    if v.len() <= SHORT {
        return insertion(v, |a, b| a < b);
    }
    let mut wide: Vec<u128> = v.iter().map(|&i| i as u128).collect();
    sort_wide(&mut wide);
    for (x, w) in v.iter_mut().zip(wide) {
        *x = w as usize;
    }
}

/// Sort `v` by `key` ascending, stably (as `v.sort_by(|a, b| key(a).total_cmp(&key(b)))`).
pub fn sort_ascending_by<T>(v: &mut Vec<T>, key: impl Fn(&T) -> f64) {
    let keys: Vec<f64> = v.iter().map(&key).collect();
    reorder(v, &ascending_positions(&keys));
}

/// Sort `v` by `key` descending, stably (as `v.sort_by(|a, b| key(b).total_cmp(&key(a)))`:
/// the key negated, which reverses `total_cmp` for every value, signed zeros and NaN too).
pub fn sort_descending_by<T>(v: &mut Vec<T>, key: impl Fn(&T) -> f64) {
    sort_ascending_by(v, |x| -key(x));
}

/// Move the elements of `v` into the order `positions` (a permutation of 0..v.len()).
fn reorder<T>(v: &mut Vec<T>, positions: &[usize]) {
    let mut slots: Vec<Option<T>> = v.drain(..).map(Some).collect();
    v.extend(positions.iter().filter_map(|&i| slots.get_mut(i).and_then(Option::take)));
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Against the standard library's stable sort (the reference), with ties, signed
    /// zeros, infinities and NaN.
    #[test]
    fn same_order_as_the_standard_stable_sort() {
        let keys = [3.0, -0.0, 0.0, f64::NAN, 1.0, f64::INFINITY, 1.0, f64::NEG_INFINITY, -2.5, 0.0, 3.0];
        let tagged: Vec<(f64, usize)> = keys.iter().copied().zip(0..).collect();
        let mut want = tagged.clone();
        want.sort_by(|a, b| a.0.total_cmp(&b.0));
        let mut got = tagged.clone();
        sort_ascending_by(&mut got, |p| p.0);
        assert_eq!(got.iter().map(|p| p.1).collect::<Vec<_>>(), want.iter().map(|p| p.1).collect::<Vec<_>>());
        let mut want = tagged.clone();
        want.sort_by(|a, b| b.0.total_cmp(&a.0));
        let mut got = tagged;
        sort_descending_by(&mut got, |p| p.0);
        assert_eq!(got.iter().map(|p| p.1).collect::<Vec<_>>(), want.iter().map(|p| p.1).collect::<Vec<_>>());
        // numbers and indices against sort_unstable_by / sort_unstable, bit for bit
        let mut want = keys.to_vec();
        want.sort_unstable_by(f64::total_cmp);
        let mut got = keys.to_vec();
        sort_numbers(&mut got);
        assert_eq!(
            got.iter().map(|x| x.to_bits()).collect::<Vec<_>>(),
            want.iter().map(|x| x.to_bits()).collect::<Vec<_>>()
        );
        let mut idx = vec![7usize, 0, usize::MAX, 3, 3, 1];
        sort_indices(&mut idx);
        assert_eq!(idx, [0, 1, 3, 3, 7, usize::MAX]);
        // longer than the insertion sort's reach: the 128-bit sort
        let long: Vec<f64> = (0..100).map(|i| ((i * 37) % 101) as f64 - 50.0).chain(keys).collect();
        let mut want = long.clone();
        want.sort_unstable_by(f64::total_cmp);
        let mut got = long;
        sort_numbers(&mut got);
        assert_eq!(
            got.iter().map(|x| x.to_bits()).collect::<Vec<_>>(),
            want.iter().map(|x| x.to_bits()).collect::<Vec<_>>()
        );
        let mut idx: Vec<usize> = (0..50).map(|i| (i * 13) % 50).collect();
        sort_indices(&mut idx);
        assert!(idx.iter().enumerate().all(|(i, &x)| i == x));
    }
}
