//! One stable sort for every list the engine and the page sort.
//!
//! `slice::sort_by` is instantiated anew for each element type and each
//! comparison closure, about 3 KB of WebAssembly a call site. [`sort_by`]
//! sorts the positions `0..n` with the one instantiation in
//! [`sorted_positions`] and then moves the elements into that order, so a new
//! call site costs only the small moving code. Same result as
//! `slice::sort_by` (stable), checked against it in the tests.

use std::cmp::Ordering;

/// The positions `0..n` in the order `cmp` puts them (stable: equal
/// positions keep their order).
pub fn sorted_positions(n: usize, cmp: &dyn Fn(usize, usize) -> Ordering) -> Vec<usize> {
    let mut order: Vec<usize> = (0..n).collect();
    #[expect(
        clippy::disallowed_methods,
        reason = "the one instantiation of the standard sort"
    )]
    order.sort_by(|&a, &b| cmp(a, b));
    order
}

/// Sort `v` stably by `cmp`, as `v.sort_by(cmp)` does.
pub fn sort_by<T>(v: &mut [T], cmp: impl Fn(&T, &T) -> Ordering) {
    let order = {
        let items: &[T] = v;
        sorted_positions(items.len(), &|a, b| match (items.get(a), items.get(b)) {
            (Some(x), Some(y)) => cmp(x, y),
            _ => Ordering::Equal,
        })
    };
    // Position i takes the element at order[i]. Sources already moved away
    // (index below i) are followed along the order to where they went.
    for i in 0..v.len() {
        let mut j = order.get(i).copied().unwrap_or(i);
        while j < i {
            j = order.get(j).copied().unwrap_or(i);
        }
        v.swap(i, j);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #[test]
        fn sorts_as_the_standard_stable_sort(keys in proptest::collection::vec(0u8..6, 0..60)) {
            // Pairs (key, original position): stability shows in the positions.
            let mut ours: Vec<(u8, usize)> = keys.iter().copied().zip(0..).collect();
            let mut std_sorted = ours.clone();
            sort_by(&mut ours, |a, b| a.0.cmp(&b.0));
            #[expect(clippy::disallowed_methods, reason = "the standard sort is the oracle")]
            std_sorted.sort_by_key(|a| a.0);
            prop_assert_eq!(ours, std_sorted);
        }
    }

    #[test]
    fn reverse_and_float_orders() {
        let mut v = vec![3.0, -1.0, 2.5, f64::NAN, 0.0];
        sort_by(&mut v, f64::total_cmp);
        assert_eq!(&v[..4], &[-1.0, 0.0, 2.5, 3.0]);
        assert!(v[4].is_nan());
        let mut w = vec!["b", "c", "a"];
        sort_by(&mut w, |a, b| b.cmp(a));
        assert_eq!(w, ["c", "b", "a"]);
    }
}
