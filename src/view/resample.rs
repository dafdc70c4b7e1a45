//! Fewer points for a long table, for the page: a share link must hold the whole scenario,
//! so a table of a million rows is offered resampled before it is used. The resampled table
//! keeps the original's integral over every bin: each new value is the original's mean over
//! the bin around its node (the trapezoid integral of the original between the bin's edges,
//! over the bin's width), and the two end points stay where they were.
//!
//! Architecture invariant: pure functions of the table's numbers, on the table's own axis.

/// Most points a table may have on the page; longer ones are offered resampled.
pub const PAGE_MAX_TABLE_POINTS: usize = 50_000;
/// How many points a long table is resampled to.
pub const RESAMPLED_POINTS: usize = 20_000;

/// Integral of the piecewise-linear table (x ascending) from x[0] to each node: the
/// cumulative trapezoid sums.
fn cumulative(x: &[f64], y: &[f64]) -> Vec<f64> {
    let mut c = Vec::with_capacity(x.len());
    let mut s = 0.0;
    c.push(0.0);
    for i in 1..x.len() {
        s += 0.5 * (y[i] + y[i - 1]) * (x[i] - x[i - 1]);
        c.push(s);
    }
    c
}

/// The integral of the table from x[0] to `t` (x[0] <= t <= x[last]), exact for the
/// piecewise-linear table.
fn integral_to(x: &[f64], y: &[f64], c: &[f64], t: f64) -> f64 {
    let i = x.partition_point(|v| *v <= t).clamp(1, x.len() - 1) - 1;
    let h = t - x[i];
    let w = x[i + 1] - x[i];
    let yt = if w > 0.0 { y[i] + (y[i + 1] - y[i]) * h / w } else { y[i] };
    c[i] + 0.5 * (y[i] + yt) * h
}

/// `x`, `y` (ascending `x`, at least two points) on `n` nodes (2 <= n): the nodes are
/// original points at evenly spaced indices, so the nodes are dense where the table is;
/// each value is the original's mean over the bin from the midpoint to the previous node to
/// the midpoint to the next (half-bins at the ends). A table of `n` points or fewer is
/// returned as it is.
pub fn resample(x: &[f64], y: &[f64], n: usize) -> (Vec<f64>, Vec<f64>) {
    let len = x.len().min(y.len());
    if len <= n || n < 2 || len < 2 {
        return (x[..len].to_vec(), y[..len].to_vec());
    }
    let (x, y) = (&x[..len], &y[..len]);
    let c = cumulative(x, y);
    // index arithmetic in u64: k (len - 1) exceeds a 32-bit usize (the page's) for long tables
    let at = |k: usize| ((k as u64 * (len as u64 - 1) + (n as u64 - 1) / 2) / (n as u64 - 1)) as usize;
    let nodes: Vec<f64> = (0..n).map(|k| x[at(k)]).collect();
    let mut nodes = nodes;
    nodes[0] = x[0];
    nodes[n - 1] = x[len - 1];
    nodes.dedup();
    let m = nodes.len();
    let edge = |k: usize| -> f64 {
        // bin edges: the midpoints between nodes, the table's ends outside
        if k == 0 {
            x[0]
        } else if k >= m {
            x[len - 1]
        } else {
            0.5 * (nodes[k - 1] + nodes[k])
        }
    };
    let values = (0..m)
        .map(|k| {
            let (a, b) = (edge(k), edge(k + 1));
            if b > a {
                (integral_to(x, y, &c, b) - integral_to(x, y, &c, a)) / (b - a)
            } else {
                y[x.partition_point(|v| *v < nodes[k]).min(len - 1)]
            }
        })
        .collect();
    (nodes, values)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn trapezoid(x: &[f64], y: &[f64]) -> f64 {
        x.windows(2).zip(y.windows(2)).map(|(a, b)| 0.5 * (b[0] + b[1]) * (a[1] - a[0])).sum()
    }

    #[test]
    fn node_indices_do_not_overflow_a_32_bit_index() {
        // 20,000 nodes over 1,000,001 rows: k (len - 1) reaches 2e10, past u32::MAX (the
        // page's usize); the nodes must still be the table's own points, ascending
        let x: Vec<f64> = (0..1_000_001).map(|i| i as f64).collect();
        let y = vec![1.0; x.len()];
        let (rx, _) = resample(&x, &y, RESAMPLED_POINTS);
        assert!(rx.windows(2).all(|w| w[1] > w[0]));
        assert!(rx.iter().all(|v| v.fract() == 0.0) && rx[RESAMPLED_POINTS - 1] == 1_000_000.0);
        let k = RESAMPLED_POINTS - 2;
        assert!(k * 1_000_000 > u32::MAX as usize, "the case needs indices past 32 bits");
    }

    #[test]
    fn short_tables_are_kept() {
        let (x, y) = resample(&[1.0, 2.0, 3.0], &[1.0, 4.0, 9.0], 10);
        assert_eq!((x, y), (vec![1.0, 2.0, 3.0], vec![1.0, 4.0, 9.0]));
    }

    #[test]
    fn a_linear_table_is_reproduced_exactly() {
        // the mean of a linear function over a bin centred on a node is its value there
        // (inner nodes), so a straight line stays straight
        let x: Vec<f64> = (0..100_001).map(|i| i as f64 * 0.01).collect();
        let y: Vec<f64> = x.iter().map(|v| 3.0 + 2.0 * v).collect();
        let (rx, ry) = resample(&x, &y, 1001);
        assert_eq!(rx.len(), 1001);
        for (a, b) in rx.iter().zip(&ry).skip(1).take(999) {
            assert!((b - (3.0 + 2.0 * a)).abs() < 1e-9, "{a} {b}");
        }
    }

    #[test]
    fn a_million_row_spectrum_keeps_its_integral() {
        // a blackbody-like curve with sharp absorption lines: the resampled table's trapezoid
        // integral stays within 1e-4 of the original's (bin means conserve each bin's
        // integral; what remains is the trapezoid rule's error on the coarser grid)
        let x: Vec<f64> = (0..1_000_000).map(|i| 280.0 + i as f64 * 0.00372).collect();
        let y: Vec<f64> = x
            .iter()
            .map(|l| {
                let u = 1240.0 / l / 0.5;
                let planck = u.powi(3) / (u.exp() - 1.0);
                let line = if (l * 7.0).sin() > 0.995 { 0.3 } else { 1.0 };
                planck * line
            })
            .collect();
        let (rx, ry) = resample(&x, &y, RESAMPLED_POINTS);
        assert_eq!(rx.len(), RESAMPLED_POINTS);
        assert_eq!((rx[0], rx[rx.len() - 1]), (x[0], x[x.len() - 1]));
        assert!(rx.windows(2).all(|w| w[1] > w[0]));
        let (a, b) = (trapezoid(&x, &y), trapezoid(&rx, &ry));
        assert!((b / a - 1.0).abs() < 1e-4, "{a} {b}");
    }
}
