"""Reference values for the Kolmogorov-Smirnov distance of two groups
(tests/ks_checks.rs).

Run:  python3 tests/reference/make_reference_ks.py
Needs: numpy, scipy, pandas. Reads R's sleep and PlantGrowth from tests/reference/data/;
writes expected_ks.json with the versions used.

Computed here, independently of Reshuffle's code:
- the distance sup |F_a - F_b| over the pooled values (vectorised numpy), checked against
  scipy.stats.ks_2samp's statistic;
- the exact permutation p-value of the distance by scipy.stats.permutation_test over every
  split (n_resamples=inf, alternative="greater": the distance has no sign);
- on tie-free data, scipy.stats.ks_2samp(method="exact"), which the enumeration must equal;
- percentile and BCa bounds of the distance from scipy.stats.bootstrap (10,000 resamples
  within each group), as mean and SD over 30 seeds.
"""
import json
import os

import numpy as np
import pandas as pd
import scipy
from scipy import stats

HERE = os.path.dirname(os.path.abspath(__file__))


def ks(a, b, axis=-1):
    a = np.moveaxis(np.asarray(a, float), axis, -1)
    b = np.moveaxis(np.asarray(b, float), axis, -1)
    v = np.concatenate([a, b], axis=-1)
    fa = (a[..., None, :] <= v[..., :, None]).mean(-1)
    fb = (b[..., None, :] <= v[..., :, None]).mean(-1)
    return np.abs(fa - fb).max(-1)


def case(name, file, value, group, first, second, exact_ks):
    d = pd.read_csv(os.path.join(HERE, "data", file))
    a = d[d[group].astype(str) == first][value].to_numpy(dtype=float)
    b = d[d[group].astype(str) == second][value].to_numpy(dtype=float)
    print(name, flush=True)
    out = {"file": file, "value": value, "group": group, "first": first, "second": second}
    out["ties"] = bool(len(np.unique(np.concatenate([a, b]))) < len(a) + len(b))
    dist = float(ks(a, b))
    assert abs(dist - stats.ks_2samp(a, b).statistic) < 1e-12
    out["distance"] = dist
    res = stats.permutation_test((a, b), ks, permutation_type="independent", vectorized=True,
                                 n_resamples=np.inf, alternative="greater", batch=20_000)
    out["permutation"] = float(res.pvalue)
    if exact_ks:
        out["exact_ks_2samp"] = float(stats.ks_2samp(a, b, method="exact").pvalue)
    bounds = {"percentile": [], "BCa": []}
    for seed in range(30):
        for method in bounds:
            ci = stats.bootstrap((a, b), ks, n_resamples=10_000, method=method,
                                 vectorized=True, batch=2_000,
                                 random_state=seed).confidence_interval
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
        case("sleep", "sleep.csv", "extra", "group", "1", "2", exact_ks=False),
        case("plantgrowth-ctrl-trt2", "PlantGrowth.csv", "weight", "group", "ctrl", "trt2",
             exact_ks=True),
    ])
    out = {
        "versions": {"numpy": np.__version__, "scipy": scipy.__version__,
                     "pandas": pd.__version__},
        "cases": cases,
    }
    with open(os.path.join(HERE, "expected_ks.json"), "w") as f:
        json.dump(out, f, indent=1, allow_nan=False)
        f.write("\n")


if __name__ == "__main__":
    main()
