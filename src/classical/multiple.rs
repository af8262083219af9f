//! Adjusting p-values for several tests at once.
//!
//! - Holm (1979), "A simple sequentially rejective multiple test procedure": controls the
//!   family-wise error rate (the chance of any false positive among the tests) under any
//!   dependence between them.
//! - Benjamini & Hochberg (1995), "Controlling the false discovery rate": controls the
//!   expected share of false positives among the results called significant, under
//!   independence or positive dependence of the tests.
//!
//! Both return adjusted p-values in the order of the input: a test is significant at level
//! α after adjustment when its adjusted p-value is at most α.

/// Order of the p-values from smallest to largest (ties keep their input order).
fn ascending(p: &[f64]) -> Vec<usize> {
    let mut idx: Vec<usize> = (0..p.len()).collect();
    idx.sort_by(|&i, &j| p[i].total_cmp(&p[j]));
    idx
}

/// Holm's step-down adjustment: the i-th smallest p (1-based) times m − i + 1, made
/// non-decreasing along the order and capped at 1.
pub fn holm(p: &[f64]) -> Vec<f64> {
    let m = p.len();
    let mut out = vec![0.0; m];
    let mut running: f64 = 0.0;
    for (rank, &i) in ascending(p).iter().enumerate() {
        let v = ((m - rank) as f64 * p[i]).min(1.0);
        running = running.max(v);
        out[i] = running;
    }
    out
}

/// Benjamini–Hochberg step-up adjustment: the i-th smallest p times m / i, made
/// non-increasing from the largest down and capped at 1.
pub fn benjamini_hochberg(p: &[f64]) -> Vec<f64> {
    let m = p.len();
    let mut out = vec![0.0; m];
    let order = ascending(p);
    let mut running: f64 = 1.0;
    for (rank, &i) in order.iter().enumerate().rev() {
        let v = (m as f64 / (rank + 1) as f64 * p[i]).min(1.0);
        running = running.min(v);
        out[i] = running;
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn small_cases_by_hand() {
        // m = 3: Holm multiplies the smallest by 3, the next by 2, the largest by 1, keeping
        // the order; BH multiplies by 3/1, 3/2, 3/3 and keeps the order from the top.
        let p = [0.04, 0.01, 0.03];
        let h = holm(&p);
        assert_eq!(h, vec![0.06, 0.03, 0.06]);
        let b = benjamini_hochberg(&p);
        for (got, want) in b.iter().zip([0.04, 0.03, 0.04]) {
            assert!((got - want).abs() < 1e-15, "{b:?}");
        }
        assert_eq!(holm(&[0.9, 0.8]), vec![1.0, 1.0]);
        assert!(holm(&[]).is_empty());
        // Adjusted p-values are never below the raw ones, and BH never above Holm.
        let p = [0.001, 0.2, 0.013, 0.04, 0.5, 0.0049];
        for ((&raw, &ho), &bh) in p.iter().zip(&holm(&p)).zip(&benjamini_hochberg(&p)) {
            assert!(ho >= raw && bh >= raw && bh <= ho + 1e-15);
        }
    }
}
