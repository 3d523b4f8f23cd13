"""Fixture values for the fixed-horizon z-tests of lib/sequential (two-sample-z-test.ts).

Run with Debian's Python: /usr/bin/python3 tests/reference/fixed-ztest.py
Writes tests/reference/fixtures/fixed-ztest.json. Calls (statsmodels 0.13.5, scipy 1.10.1):
  proportions: statsmodels.stats.proportion.proportions_ztest([xT, xC], [nT, nC], alternative=...)   (pooled)
               statsmodels.stats.proportion.test_proportions_2indep(xT, nT, xC, nC, method="wald", compare="diff", alternative=...)   (unpooled)
               statsmodels.stats.proportion.confint_proportions_2indep(xT, nT, xC, nC, method="wald", compare="diff", alpha=a)
               statsmodels.stats.proportion.confint_proportions_2indep(xT, nT, xC, nC, method="log", compare="ratio", alpha=a)
  means:       statsmodels.stats.weightstats.CompareMeans.from_data(x, y).ztest_ind(usevar="pooled"|"unequal", alternative=...)
               ... .zconfint_diff(alpha=a, usevar="unequal")
"""
import json
import os

import numpy as np
import scipy
import statsmodels
from statsmodels.stats.proportion import confint_proportions_2indep, proportions_ztest, test_proportions_2indep
from statsmodels.stats.weightstats import CompareMeans

ALTERNATIVE = {2: "two-sided", 1: "larger"}

proportion_cases = [
    # (xT, nT, xC, nC, sides, alpha)
    (130, 1000, 100, 1000, 2, 0.05),
    (130, 1000, 100, 1000, 1, 0.05),
    (12, 40, 5, 38, 2, 0.05),
    (3, 25, 7, 30, 2, 0.10),
    (5321, 50000, 5012, 50000, 2, 0.05),
    (5321, 50000, 5012, 50000, 1, 0.01),
    (10950, 90000, 1050, 10000, 2, 0.05),
    (23000, 180000, 2210, 20000, 1, 0.025),
    (900, 10000, 1300, 10000, 2, 0.05),
    (2200, 10000, 1300, 10000, 2, 0.05),
    (1, 500, 0, 500, 2, 0.05),
    (480, 500, 450, 500, 2, 0.05),
]

rows = []
for xT, nT, xC, nC, sides, alpha in proportion_cases:
    alternative = ALTERNATIVE[sides]
    z_pooled, p_pooled = proportions_ztest([xT, xC], [nT, nC], alternative=alternative)
    entry = {
        "treatment": [xT, nT], "holdout": [xC, nC], "sides": sides, "alpha": alpha,
        "pooled": {"z": float(z_pooled), "p": float(p_pooled)},
    }
    if xC > 0:  # statsmodels 0.13.5 divides by the holdout rate here
        wald = test_proportions_2indep(xT, nT, xC, nC, method="wald", compare="diff", alternative=alternative)
        entry["unpooled"] = {"z": float(wald.statistic), "p": float(wald.pvalue)}
    if sides == 2:
        low, upp = confint_proportions_2indep(xT, nT, xC, nC, method="wald", compare="diff", alpha=alpha)
        entry["ciAbsolute"] = [float(low), float(upp)]
        if xT > 0 and xC > 0:
            low, upp = confint_proportions_2indep(xT, nT, xC, nC, method="log", compare="ratio", alpha=alpha)
            entry["ciRelative"] = [float(low) - 1, float(upp) - 1]
    rows.append(entry)

rng = np.random.default_rng(20260301)
mean_rows = []
for nT, nC, meanT, meanC, sd, sides, alpha in [
    (400, 380, 10.4, 10.0, 4.0, 2, 0.05),
    (400, 380, 10.4, 10.0, 4.0, 1, 0.05),
    (2000, 220, 3.1, 3.0, 6.0, 2, 0.05),
    (50, 60, 1.0, 1.5, 1.2, 2, 0.10),
]:
    x = np.round(rng.gamma(shape=(meanT / sd) ** 2, scale=sd ** 2 / meanT, size=nT), 2)
    y = np.round(rng.gamma(shape=(meanC / sd) ** 2, scale=sd ** 2 / meanC, size=nC), 2)
    compare = CompareMeans.from_data(x, y)
    alternative = ALTERNATIVE[sides]
    zp, pp = compare.ztest_ind(usevar="pooled", alternative=alternative)
    zu, pu = compare.ztest_ind(usevar="unequal", alternative=alternative)
    entry = {
        "treatment": {"n": int(nT), "sum": float(np.sum(x)), "sumSq": float(np.sum(x * x))},
        "holdout": {"n": int(nC), "sum": float(np.sum(y)), "sumSq": float(np.sum(y * y))},
        "sides": sides, "alpha": alpha,
        "pooled": {"z": float(zp), "p": float(pp)},
        "unpooled": {"z": float(zu), "p": float(pu)},
    }
    if sides == 2:
        low, upp = compare.zconfint_diff(alpha=alpha, usevar="unequal")
        entry["ciAbsolute"] = [float(low), float(upp)]
    mean_rows.append(entry)

out = {
    "source": f"statsmodels {statsmodels.__version__}, scipy {scipy.__version__}, numpy {np.__version__}; tests/reference/fixed-ztest.py",
    "proportions": rows,
    "means": mean_rows,
}
path = os.path.join(os.path.dirname(__file__), "fixtures", "fixed-ztest.json")
with open(path, "w") as handle:
    json.dump(out, handle, indent=1)
print("wrote", path)
