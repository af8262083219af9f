"""Reference values for Kendall's tau-b as an association statistic
(tests/kendall_checks.rs).

Run:  python3 tests/reference/make_reference_kendall.py
Needs: numpy, scipy, pandas. Reads mtcars8.csv (R's mtcars, first 8 rows; ties in mpg) and
law-school.csv (Efron & Tibshirani's 15 law schools; no ties) from tests/reference/data/;
writes expected_kendall.json with the versions used.

Computed here, independently of Reshuffle's code:
- tau-b, (C - D) / sqrt((n0 - n1)(n0 - n2)), from the signs of all pairwise differences
  (vectorised numpy), checked against scipy.stats.kendalltau;
- exact re-pairing p-values by scipy.stats.permutation_test(permutation_type="pairings",
  n_resamples=inf) re-ordering y against x (the n! pairings) for each alternative
  (two-sided: twice the smaller one-sided p-value);
- scipy.stats.kendalltau's exact p-value (no ties) and its asymptotic one (normal
  approximation with the tie-corrected variance);
- percentile and BCa bounds of tau-b from scipy.stats.bootstrap (10,000 resampled pairs),
  as mean and SD over 30 seeds.
"""
import json
import os

import numpy as np
import pandas as pd
import scipy
from scipy import stats

HERE = os.path.dirname(os.path.abspath(__file__))


def tau_b(x, y, axis=-1):
    x = np.moveaxis(np.asarray(x, dtype=float), axis, -1)
    y = np.moveaxis(np.asarray(y, dtype=float), axis, -1)
    sx = np.sign(x[..., :, None] - x[..., None, :])
    sy = np.sign(y[..., :, None] - y[..., None, :])
    n = x.shape[-1]
    upper = np.triu(np.ones((n, n), dtype=bool), 1)
    s = (sx * sy)[..., upper].sum(-1)
    d = np.sqrt((sx[..., upper] ** 2).sum(-1) * (sy[..., upper] ** 2).sum(-1))
    return s / d


def case(name, x, y, exact, enumerate_pairings):
    x, y = np.asarray(x, float), np.asarray(y, float)
    print(name, flush=True)
    out = {"x": [float(v) for v in x], "y": [float(v) for v in y]}
    tau = float(tau_b(x, y))
    ref = stats.kendalltau(x, y)
    assert abs(tau - ref.statistic) < 1e-12
    out["tau"] = tau
    for alt in ["two-sided", "greater", "less"]:
        out[f"asymptotic_{alt}"] = float(
            stats.kendalltau(x, y, method="asymptotic", alternative=alt).pvalue)
        if exact:
            out[f"exact_{alt}"] = float(
                stats.kendalltau(x, y, method="exact", alternative=alt).pvalue)
        if enumerate_pairings:
            # One sample, y, re-ordered against the fixed x: the n! pairings.
            res = stats.permutation_test((y,), lambda yy, axis=-1: tau_b(x, yy, axis=axis),
                                         permutation_type="pairings", vectorized=True,
                                         n_resamples=np.inf, alternative=alt, batch=20_000)
            out[f"permutation_{alt}"] = float(res.pvalue)
    print("  bootstrap", flush=True)
    bounds = {"percentile": [], "BCa": []}
    for seed in range(30):
        for method in bounds:
            ci = stats.bootstrap((x, y), tau_b, paired=True, vectorized=True,
                                 n_resamples=10_000, method=method,
                                 batch=2_000, random_state=seed).confidence_interval
            bounds[method].append((ci.low, ci.high))
    # A seed whose resamples include one with a constant column (tau undefined) gives scipy
    # no interval; the mean and SD are over the other seeds (None if there are none).
    num = lambda v: None if np.isnan(v).all() else float(v)
    for method, v in bounds.items():
        v = np.array(v)
        out[f"{method}_seeds"] = int(np.isfinite(v).all(axis=1).sum())
        out[f"{method}_low_mean"] = num(np.nanmean(v[:, 0]))
        out[f"{method}_low_sd"] = num(np.nanstd(v[:, 0], ddof=1))
        out[f"{method}_high_mean"] = num(np.nanmean(v[:, 1]))
        out[f"{method}_high_sd"] = num(np.nanstd(v[:, 1], ddof=1))
    return name, out


def main():
    cars = pd.read_csv(os.path.join(HERE, "data", "mtcars8.csv"))
    law = pd.read_csv(os.path.join(HERE, "data", "law-school.csv"), comment="#")
    cases = dict([
        # Ties in mpg: the exact null is over the pairings of the tied values.
        case("mtcars8 mpg wt", cars["wt"], cars["mpg"], exact=False, enumerate_pairings=True),
        # No ties, 9 rows: enumeration and scipy's exact test agree.
        case("law-school first 9", law["LSAT"][:9], law["GPA"][:9], exact=True,
             enumerate_pairings=True),
        # No ties, 15 rows: too many pairings to list; random ones against the exact test.
        case("law-school", law["LSAT"], law["GPA"], exact=True, enumerate_pairings=False),
    ])
    out = {
        "versions": {"numpy": np.__version__, "scipy": scipy.__version__,
                     "pandas": pd.__version__},
        "cases": cases,
    }
    with open(os.path.join(HERE, "expected_kendall.json"), "w") as f:
        json.dump(out, f, indent=1, allow_nan=False)
        f.write("\n")


if __name__ == "__main__":
    main()
