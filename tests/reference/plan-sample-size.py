"""Fixture values for unequal allocation and mean metrics (sample-size-two-proportions.ts, sample-size-two-means.ts).

Run: /usr/bin/python3 tests/reference/plan-sample-size.py -> tests/reference/fixtures/plan-sample-size-statsmodels.json
Calls (statsmodels 0.13.5):
  proportions: statsmodels.stats.proportion.samplesize_proportions_2indep_onetail(diff, prop2, power, ratio, alpha, alternative)
               -> nobs1 (treatment), with ratio = nobs2/nobs1 = holdoutShare/(1 - holdoutShare); pooled variance under H0
  means:       statsmodels.stats.power.NormalIndPower().solve_power(effect_size=delta/sd, alpha, power, ratio, alternative)
               -> nobs1; it keeps the far tail of a two-sided test, a relative difference of about 1e-6 or less here
"""
import json
import os

import statsmodels
from statsmodels.stats.power import NormalIndPower
from statsmodels.stats.proportion import samplesize_proportions_2indep_onetail

proportions = []
for baseline, lift, alpha, power, sides, holdout_share in [
    (0.1, 0.1, 0.05, 0.8, 2, 0.5), (0.1, 0.1, 0.05, 0.8, 2, 0.1), (0.05, 0.2, 0.05, 0.8, 2, 0.2),
    (0.3, 0.05, 0.01, 0.9, 2, 0.1), (0.02, 0.15, 0.05, 0.8, 1, 0.1), (0.12, 0.1, 0.025, 0.8, 1, 0.25),
]:
    ratio = holdout_share / (1 - holdout_share)
    nobs1 = samplesize_proportions_2indep_onetail(diff=baseline * lift, prop2=baseline, power=power, ratio=ratio, alpha=alpha,
                                                  alternative="two-sided" if sides == 2 else "larger")
    proportions.append({"baseline": baseline, "lift": lift, "alpha": alpha, "power": power, "sides": sides,
                        "holdoutShare": holdout_share, "treatment": float(nobs1), "holdout": float(nobs1 * ratio)})
means = []
for mean, lift, sd, alpha, power, sides, holdout_share in [
    (10.0, 0.05, 20.0, 0.05, 0.8, 2, 0.5), (10.0, 0.05, 20.0, 0.05, 0.8, 1, 0.5), (3.0, 0.1, 6.0, 0.05, 0.9, 2, 0.1),
]:
    ratio = holdout_share / (1 - holdout_share)
    nobs1 = NormalIndPower().solve_power(effect_size=mean * lift / sd, alpha=alpha, power=power, ratio=ratio,
                                         alternative="two-sided" if sides == 2 else "larger")
    means.append({"mean": mean, "lift": lift, "sd": sd, "alpha": alpha, "power": power, "sides": sides,
                  "holdoutShare": holdout_share, "treatment": float(nobs1), "holdout": float(nobs1 * ratio)})
out = {"source": f"statsmodels {statsmodels.__version__}; tests/reference/plan-sample-size.py", "proportions": proportions, "means": means}
path = os.path.join(os.path.dirname(__file__), "fixtures", "plan-sample-size-statsmodels.json")
with open(path, "w") as handle:
    json.dump(out, handle, indent=1)
print("wrote", path)
