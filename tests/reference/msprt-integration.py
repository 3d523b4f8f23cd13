"""The mSPRT closed form checked against numerical integration over the mixing distribution.

Robbins (1970); Johari, Koomen, Pekelis & Walsh (2022): for an estimate D ~ N(theta, V) and the
mixture theta ~ N(0, tau^2), the mixture likelihood ratio against theta = 0 is
    Lambda = integral  phi((D - theta)/sqrt(V)) / phi(D/sqrt(V)) * N(theta; 0, tau^2) d theta.
We integrate it with scipy.integrate.quad (no closed form used), and find the confidence-sequence
bounds as the theta0 where the mixture ratio of D - theta0 equals 1/alpha (scipy.optimize.brentq).
Run: /usr/bin/python3 tests/reference/msprt-integration.py -> tests/reference/fixtures/msprt-integration.json
"""
import json
import math
import os

import numpy as np
import scipy
from scipy import integrate, optimize, stats


def mixture_ratio(estimate, variance, tau):
    sd = math.sqrt(variance)
    log_null = stats.norm.logpdf(estimate, 0, sd)

    def integrand(theta):
        return math.exp(stats.norm.logpdf(estimate, theta, sd) - log_null + stats.norm.logpdf(theta, 0, tau))

    centre = estimate * tau ** 2 / (tau ** 2 + variance)
    spread = math.sqrt(tau ** 2 * variance / (tau ** 2 + variance))
    value, _ = integrate.quad(integrand, centre - 40 * spread, centre + 40 * spread, points=[centre], epsabs=0, epsrel=1e-13, limit=400)
    return value


cases = []
for estimate, variance, tau in [(0.0, 1.0, 1.0), (0.5, 0.01, 0.2), (0.02, 1.2e-4, 0.01), (-0.03, 1e-4, 0.02), (0.004, 1e-5, 0.0098), (1.5, 0.3, 3.0), (0.001, 1e-6, 0.0005)]:
    cases.append({"estimate": estimate, "variance": variance, "tau": tau, "likelihoodRatio": mixture_ratio(estimate, variance, tau)})

intervals = []
for estimate, variance, tau, alpha in [(0.02, 1.2e-4, 0.01, 0.05), (0.5, 0.01, 0.2, 0.05), (0.0, 1.0, 1.0, 0.05), (0.004, 1e-5, 0.0098, 0.025)]:
    target = 1 / alpha
    sd = math.sqrt(variance)
    upper = optimize.brentq(lambda theta0: mixture_ratio(estimate - theta0, variance, tau) - target, estimate, estimate + 20 * sd, xtol=1e-15, rtol=1e-14)
    lower = optimize.brentq(lambda theta0: mixture_ratio(estimate - theta0, variance, tau) - target, estimate - 20 * sd, estimate, xtol=1e-15, rtol=1e-14)
    intervals.append({"estimate": estimate, "variance": variance, "tau": tau, "alpha": alpha, "lower": lower, "upper": upper})

out = {"source": f"scipy {scipy.__version__} integrate.quad / optimize.brentq, numpy {np.__version__}; tests/reference/msprt-integration.py",
       "likelihoodRatios": cases, "confidenceSequences": intervals}
path = os.path.join(os.path.dirname(__file__), "fixtures", "msprt-integration.json")
with open(path, "w") as handle:
    json.dump(out, handle, indent=1)
print("wrote", path)
