"""Fixture values for the sample-ratio-mismatch tests (sample-ratio-chi-square.ts, dirichlet-multinomial-log-bayes-factor.ts).

Run: /usr/bin/python3 tests/reference/srm-reference.py -> tests/reference/fixtures/srm-reference.json
Calls (scipy 1.10.1):
  chi-square: scipy.stats.chisquare(f_obs, f_exp = total * shares) -> statistic, pvalue; scipy.stats.chi2.sf for tails
  Bayes factor, two arms: scipy.stats.betabinom.pmf(x1, n, a1, a2) / scipy.stats.binom.pmf(x1, n, theta1)
     (Dirichlet-multinomial with 2 cells = beta-binomial; Lindon & Malek 2022)
  Bayes factor, three arms: E over theta ~ Dirichlet(a) of prod (theta_i/theta0_i)^x_i, by scipy.integrate.dblquad
     over the simplex (no closed form used)
  log-gamma: scipy.special.gammaln
"""
import json
import math
import os

import numpy as np
import scipy
from scipy import integrate, special, stats

chi = []
for counts, shares in [([5100, 4900], [0.5, 0.5]), ([9150, 850], [0.9, 0.1]), ([1000, 1000, 1100], [1 / 3, 1 / 3, 1 / 3]),
                       ([50200, 49100, 10300], [0.45, 0.45, 0.1]), ([520, 480, 490, 530, 470], [0.2] * 5), ([10400, 9600], [0.5, 0.5]),
                       ([3, 9], [0.5, 0.5])]:
    total = sum(counts)
    result = stats.chisquare(counts, f_exp=[total * s for s in shares])
    chi.append({"counts": counts, "shares": shares, "statistic": float(result.statistic), "p": float(result.pvalue)})
tails = [{"statistic": x, "df": k, "p": float(stats.chi2.sf(x, k))} for x, k in [(3.841458820694124, 1), (60.0, 1), (30.0, 3), (80.0, 4), (5.0, 7), (150.0, 10), (0.5, 5), (12.0, 2)]]

two_arm = []
for x1, n, theta1, strength in [(60, 100, 0.5, 2), (5100, 10000, 0.5, 100), (9150, 10000, 0.9, 100), (9300, 10000, 0.9, 100), (510, 1000, 0.5, 10), (52000, 100000, 0.5, 1000)]:
    a1, a2 = strength * theta1, strength * (1 - theta1)
    log_bf = stats.betabinom.logpmf(x1, n, a1, a2) - stats.binom.logpmf(x1, n, theta1)
    two_arm.append({"counts": [x1, n - x1], "shares": [theta1, 1 - theta1], "priorStrength": strength, "logBayesFactor": float(log_bf)})

three_arm = []
for counts, shares, strength in [([12, 9, 4], [0.4, 0.4, 0.2], 5.0), ([20, 5, 5], [1 / 3, 1 / 3, 1 / 3], 3.0), ([30, 28, 2], [0.45, 0.45, 0.1], 10.0)]:
    a = [strength * s for s in shares]
    norm = special.gammaln(sum(a)) - sum(special.gammaln(ai) for ai in a)

    def integrand(t2, t1):
        t3 = 1 - t1 - t2
        if t3 <= 0:
            return 0.0
        theta = [t1, t2, t3]
        log_value = norm + sum((a[i] - 1) * math.log(theta[i]) + counts[i] * (math.log(theta[i]) - math.log(shares[i])) for i in range(3))
        return math.exp(log_value)

    value, _ = integrate.dblquad(integrand, 0, 1, lambda t1: 0, lambda t1: 1 - t1, epsabs=0, epsrel=1e-10)
    three_arm.append({"counts": counts, "shares": shares, "priorStrength": strength, "logBayesFactor": math.log(value)})

log_gamma = [{"z": z, "value": float(special.gammaln(z))} for z in [0.1, 0.5, 1, 1.5, 2, 3.7, 10, 14.99, 15, 50.5, 1e3, 123456.75, 1e7]]

out = {"source": f"scipy {scipy.__version__}, numpy {np.__version__}; tests/reference/srm-reference.py",
       "chiSquare": chi, "chiSquareTails": tails, "bayesFactorTwoArms": two_arm, "bayesFactorThreeArms": three_arm, "logGamma": log_gamma}
path = os.path.join(os.path.dirname(__file__), "fixtures", "srm-reference.json")
with open(path, "w") as handle:
    json.dump(out, handle, indent=1)
print("wrote", path)
