//! Standard normal distribution and log-gamma from the pure-Rust `libm` crate, so that
//! results which pass through them (BCa limits, Hedges' correction) are bit-identical in the
//! browser and natively: the platform's own libm (glibc, the browser's) is never used.

/// Φ(x), the standard normal CDF.
pub fn cdf(x: f64) -> f64 {
    0.5 * libm::erfc(-x / std::f64::consts::SQRT_2)
}

/// Φ⁻¹(p): Acklam's rational approximation, refined by two Halley steps on `cdf`
/// (relative error near machine precision). p outside (0, 1) gives ±∞ or NaN.
// The coefficients are quoted as published.
#[allow(clippy::excessive_precision)]
pub fn quantile(p: f64) -> f64 {
    if p.is_nan() || !(0.0..=1.0).contains(&p) {
        return f64::NAN;
    }
    if p == 0.0 {
        return f64::NEG_INFINITY;
    }
    if p == 1.0 {
        return f64::INFINITY;
    }
    const A: [f64; 6] = [
        -3.969683028665376e+01,
        2.209460984245205e+02,
        -2.759285104469687e+02,
        1.383577518672690e+02,
        -3.066479806614716e+01,
        2.506628277459239e+00,
    ];
    const B: [f64; 5] = [
        -5.447609879822406e+01,
        1.615858368580409e+02,
        -1.556989798598866e+02,
        6.680131188771972e+01,
        -1.328068155288572e+01,
    ];
    const C: [f64; 6] = [
        -7.784894002430293e-03,
        -3.223964580411365e-01,
        -2.400758277161838e+00,
        -2.549732539343734e+00,
        4.374664141464968e+00,
        2.938163982698783e+00,
    ];
    const D: [f64; 4] = [
        7.784695709041462e-03,
        3.224671290700398e-01,
        2.445134137142996e+00,
        3.754408661907416e+00,
    ];
    const LOW: f64 = 0.02425;
    let tail = |q: f64| {
        let r = libm::sqrt(-2.0 * libm::log(q));
        (((((C[0] * r + C[1]) * r + C[2]) * r + C[3]) * r + C[4]) * r + C[5])
            / ((((D[0] * r + D[1]) * r + D[2]) * r + D[3]) * r + 1.0)
    };
    let mut x = if p < LOW {
        tail(p)
    } else if p > 1.0 - LOW {
        -tail(1.0 - p)
    } else {
        let q = p - 0.5;
        let r = q * q;
        (((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q
            / (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1.0)
    };
    for _ in 0..2 {
        // Work in the smaller tail for accuracy.
        let e = if x < 0.0 {
            cdf(x) - p
        } else {
            (1.0 - p) - 0.5 * libm::erfc(x / std::f64::consts::SQRT_2)
        };
        let u = e * libm::sqrt(2.0 * std::f64::consts::PI) * libm::exp(0.5 * x * x);
        x -= u / (1.0 + 0.5 * x * u);
    }
    x
}

/// ln Γ(x) for x > 0.
pub fn ln_gamma(x: f64) -> f64 {
    libm::lgamma(x)
}

#[cfg(test)]
mod tests {
    use super::*;
    use statrs::distribution::{ContinuousCDF, Normal};

    #[test]
    fn quantiles_match_table_values() {
        // Standard normal table values (common handbook values).
        assert!((quantile(0.975) - 1.959963984540054).abs() < 1e-14);
        assert!((quantile(0.95) - 1.6448536269514722).abs() < 1e-14);
        assert!((quantile(0.5)).abs() < 1e-15);
        assert!((cdf(1.959963984540054) - 0.975).abs() < 1e-15);
    }

    #[test]
    fn matches_scipy_in_the_tails() {
        // scipy.special.ndtr / ndtri, scipy 1.17.1 computed.
        for (x, want) in [
            (-5.994, 1.0237068584888017e-09),
            (-4.212, 1.2655977218552828e-05),
            (-1.0, 0.15865525393145707),
            (2.5, 0.9937903346742238),
        ] {
            assert!((cdf(x) - want).abs() < 1e-14 * want, "x = {x}: {}", cdf(x));
        }
        for (p, want) in [
            (1e-12, -7.034483825301131),
            (1e-5, -4.264890793922825),
            (0.025, -1.9599639845400545),
            (0.3, -0.5244005127080409),
        ] {
            let got = quantile(p);
            assert!((got - want).abs() < 1e-14 * want.abs(), "p = {p}: {got}");
        }
    }

    #[test]
    fn agrees_with_statrs_everywhere() {
        // statrs 0.19 as an independent reference.
        let n = Normal::standard();
        for i in 1..2000 {
            let p = i as f64 / 2000.0;
            assert!((quantile(p) - n.inverse_cdf(p)).abs() < 1e-12, "p = {p}");
            let x = -6.0 + 12.0 * p;
            let want = n.cdf(x);
            // statrs's erfc is accurate to about 1e-10 relative (ours matches scipy above).
            assert!((cdf(x) - want).abs() < 1e-9 * want, "x = {x}");
        }
        for p in [1e-12, 1e-8, 1e-5, 1.0 - 1e-9] {
            let got = quantile(p);
            assert!((got - n.inverse_cdf(p)).abs() < 1e-9 * got.abs(), "p = {p}");
        }
        assert_eq!(quantile(0.0), f64::NEG_INFINITY);
        assert!(quantile(1.5).is_nan());
    }
}
