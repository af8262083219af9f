"""Reference values for the log ratios of two groups' SDs and of their median absolute
deviations (tests/spread_checks.rs).

Run:  python3 tests/reference/make_reference_spread.py
Needs: numpy, scipy, pandas. Reads R's sleep and PlantGrowth from tests/reference/data/;
writes expected_spread.json with the versions used.

Computed here, independently of Reshuffle's code:
- the statistics 0.5 log(var(a) / var(b)) with numpy's var(ddof=1), and
  log(MAD(a) / MAD(b)) with scipy.stats.median_abs_deviation (scale 1);
- the exact permutation p-values by scipy.stats.permutation_test over every split of the
  groups aligned at their medians (each value minus its group's median, numpy.median), for
  each alternative (two-sided: scipy's twice the smaller one-sided p-value);
- for the SD ratio, percentile and BCa bounds from scipy.stats.bootstrap on the values
  themselves (10,000 resamples within each group), as mean and SD over 30 seeds. Not for the
  MAD ratio: in groups of 10, some resamples have a MAD of 0 (a ratio of 0 or infinity), and
  scipy's bounds are then undefined.
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


def log_mad_ratio(a, b, axis=-1):
    return np.log(stats.median_abs_deviation(a, axis=axis)
                  / stats.median_abs_deviation(b, axis=axis))


STATISTICS = {"log-sd-ratio": log_sd_ratio, "log-mad-ratio": log_mad_ratio}


def case(name, file, value, group, first, second, key):
    f = STATISTICS[key]
    d = pd.read_csv(os.path.join(HERE, "data", file))
    a = d[d[group].astype(str) == first][value].to_numpy(dtype=float)
    b = d[d[group].astype(str) == second][value].to_numpy(dtype=float)
    print(name, flush=True)
    out = {"file": file, "value": value, "group": group, "first": first, "second": second,
           "statistic": key}
    out["observed"] = float(f(a, b))
    ua, ub = a - np.median(a), b - np.median(b)
    for alt in ["two-sided", "greater", "less"]:
        res = stats.permutation_test((ua, ub), f, permutation_type="independent",
                                     vectorized=True, n_resamples=np.inf, alternative=alt,
                                     batch=50_000)
        out[f"permutation_{alt}"] = float(res.pvalue)
    if key != "log-sd-ratio":
        return f"{name} {key}", out
    bounds = {"percentile": [], "BCa": []}
    for seed in range(30):
        for method in bounds:
            ci = stats.bootstrap((a, b), f, n_resamples=10_000, method=method,
                                 vectorized=True, random_state=seed).confidence_interval
            bounds[method].append((ci.low, ci.high))
    for method, v in bounds.items():
        v = np.array(v)
        out[f"{method}_low_mean"] = float(v[:, 0].mean())
        out[f"{method}_low_sd"] = float(v[:, 0].std(ddof=1))
        out[f"{method}_high_mean"] = float(v[:, 1].mean())
        out[f"{method}_high_sd"] = float(v[:, 1].std(ddof=1))
    return f"{name} {key}", out


def main():
    cases = dict(
        case(name, file, value, group, first, second, key)
        for key in STATISTICS
        for name, file, value, group, first, second in [
            ("sleep", "sleep.csv", "extra", "group", "1", "2"),
            ("plantgrowth-ctrl-trt2", "PlantGrowth.csv", "weight", "group", "ctrl", "trt2"),
        ]
    )
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
