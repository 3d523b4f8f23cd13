"""Cross-check of the exact tests with scipy (exact-binomial-test.ts, fisher-exact-test.ts).

Run: /usr/bin/python3 tests/reference/exact-tests.py -> tests/reference/fixtures/exact-tests-scipy.json
Calls (scipy 1.10.1): scipy.stats.binomtest(x, n, p, alternative).pvalue;
scipy.stats.fisher_exact([[a, b], [c, d]], alternative) -> (sample odds ratio, p-value).
"""
import json
import os

import scipy
from scipy.stats import binomtest, fisher_exact

binomial = [(7, 20, 0.5), (3, 100, 0.1), (40, 1000, 0.02), (500, 1000, 0.45), (90, 30000, 0.002)]
tables = [[[3, 1], [1, 3]], [[12, 28], [5, 33]], [[20, 180], [5, 195]], [[130, 870], [100, 900]], [[50, 950], [20, 980]]]
out = {"source": f"scipy {scipy.__version__}; tests/reference/exact-tests.py", "binomial": [], "fisher": []}
for x, n, p in binomial:
    for alternative in ["two-sided", "greater", "less"]:
        out["binomial"].append({"x": x, "n": n, "p": p, "alternative": alternative, "pValue": float(binomtest(x, n, p, alternative=alternative).pvalue)})
for table in tables:
    for alternative in ["two-sided", "greater", "less"]:
        odds, pvalue = fisher_exact(table, alternative=alternative)
        out["fisher"].append({"table": table, "alternative": alternative, "pValue": float(pvalue), "sampleOddsRatio": float(odds)})
path = os.path.join(os.path.dirname(__file__), "fixtures", "exact-tests-scipy.json")
with open(path, "w") as handle:
    json.dump(out, handle, indent=1)
print("wrote", path)
