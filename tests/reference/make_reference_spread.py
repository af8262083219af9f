"""Reference values for the log ratio of two groups' SDs (tests/spread_checks.rs).

Run:  python3 tests/reference/make_reference_spread.py
Needs: numpy, scipy, pandas. Reads R's sleep and PlantGrowth from tests/reference/data/;
writes expected_spread.json with the versions used.

Computed here, independently of Reshuffle's code:
- the statistic 0.5 log(var(a) / var(b)) with numpy's var(ddof=1);
- the exact permutation p-values by scipy.stats.permutation_test over every split of the
  groups aligned at their medians (each value minus its group's median, numpy.median), for
  each alternative (two-sided: scipy's twice the smaller one-sided p-value);
- percentile and BCa bounds from scipy.stats.bootstrap on the values themselves (10,000
  resamples within each group), as mean and SD over 30 seeds.
"""
import json
import os

import numpy as np
import pandas as pd
import scipy
from scipy import stats

HERE = os.path.dirname(os.path.abspath(__file__))


def log_sd_ratio(a, b, axis=-1):
    return 0.5 * np.log(np.var(a, ddof=1, axis=axis) / np.var(b, ddof=1, axis=axis))


def case(name, file, value, group, first, second):
    d = pd.read_csv(os.path.join(HERE, "data", file))
    a = d[d[group].astype(str) == first][value].to_numpy(dtype=float)
    b = d[d[group].astype(str) == second][value].to_numpy(dtype=float)
    print(name, flush=True)
    out = {"file": file, "value": value, "group": group, "first": first, "second": second}
    out["observed"] = float(log_sd_ratio(a, b))
    ua, ub = a - np.median(a), b - np.median(b)
    for alt in ["two-sided", "greater", "less"]:
        res = stats.permutation_test((ua, ub), log_sd_ratio, permutation_type="independent",
                                     vectorized=True, n_resamples=np.inf, alternative=alt,
                                     batch=50_000)
        out[f"permutation_{alt}"] = float(res.pvalue)
    bounds = {"percentile": [], "BCa": []}
    for seed in range(30):
        for method in bounds:
            ci = stats.bootstrap((a, b), log_sd_ratio, n_resamples=10_000, method=method,
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
        case("sleep", "sleep.csv", "extra", "group", "1", "2"),
        case("plantgrowth-ctrl-trt2", "PlantGrowth.csv", "weight", "group", "ctrl", "trt2"),
    ])
    out = {
        "versions": {"numpy": np.__version__, "scipy": scipy.__version__,
                     "pandas": pd.__version__},
        "cases": cases,
    }
    with open(os.path.join(HERE, "expected_spread.json"), "w") as f:
        json.dump(out, f, indent=1, allow_nan=False)
        f.write("\n")


if __name__ == "__main__":
    main()
