#!/usr/bin/env python3
"""Reference values for tests/degree.rs, computed independently of spreadplan.

Generating-function theory of the configuration model (Newman 2002,
PRE 66:016128; Callaway, Newman, Strogatz & Watts 2000, PRL 85:5468;
Cohen, Havlin & ben-Avraham 2003, PRL 91:247901), evaluated with numpy and
scipy (scipy.stats for the Poisson pmf, scipy.optimize.brentq for roots).

Run:  python3 tests/reference/degree_reference.py > tests/reference/degree_reference.json
"""
import json
import sys

import numpy as np
import scipy
from scipy import optimize, stats


def powerlaw_cutoff(tau, kappa, kmax=5000):
    """p_k ∝ k^-tau e^(-k/kappa), k >= 1 (Newman 2002, section on power laws)."""
    k = np.arange(1, kmax + 1, dtype=float)
    w = k ** (-tau) * np.exp(-k / kappa)
    return k, w / w.sum()


def powerlaw_range(tau, kmin, kmax):
    k = np.arange(kmin, kmax + 1, dtype=float)
    w = k ** (-tau)
    return k, w / w.sum()


def poisson(c, kmax=200):
    k = np.arange(0, kmax + 1, dtype=float)
    return k, stats.poisson.pmf(k, c)


def bond(k, p, T):
    """S and T_c for bond percolation: u = G1(1 - T + T u), S = 1 - G0(1 - T + T u)."""
    m = (k * p).sum()
    g1 = lambda x: (k * p * x ** np.maximum(k - 1, 0)).sum() / m
    g0 = lambda x: (p * x ** k).sum()
    tc = m / (k * (k - 1) * p).sum()
    if T <= tc:
        return 0.0, tc
    f = lambda u: g1(1 - T + T * u) - u
    # The non-trivial root lies strictly below 1; f(0) >= 0 > f(1 - eps).
    hi = 1.0 - 1e-12
    while f(hi) >= 0:
        hi = 1 - 2 * (1 - hi)
    u = optimize.brentq(f, 0.0, hi, xtol=1e-15, rtol=1e-15, maxiter=500)
    return 1.0 - g0(1 - T + T * u), tc


def r_eff(k, p, phi, T):
    return T * (k * (k - 1) * p * phi).sum() / (k * p).sum()


def degree_targeting(k, p, T):
    """Fraction vaccinated, highest degrees first (last class fractional), at r_eff = 1."""
    m = (k * p).sum()
    w = T * k * (k - 1) * p / m  # contribution of each class to r_eff
    excess = w.sum() - 1.0
    if excess <= 0:
        return 0.0
    frac = 0.0
    for i in range(len(k) - 1, -1, -1):
        if w[i] >= excess:
            return frac + p[i] * excess / w[i]
        excess -= w[i]
        frac += p[i]
    return frac


def acquaintance(k, p, T):
    """Fraction vaccinated at r_eff = 1 when v_k = 1 - exp(-x k/<k>) (Cohen et al. 2003)."""
    m = (k * p).sum()
    f = lambda x: r_eff(k, p, np.exp(-x * k / m), T) - 1.0
    if f(0.0) <= 0:
        return 0.0, 0.0
    x = optimize.brentq(f, 0.0, 1e3, xtol=1e-14)
    return (p * (1 - np.exp(-x * k / m))).sum(), x


out = {
    "generator": "tests/reference/degree_reference.py",
    "scipy": scipy.__version__,
    "numpy": np.__version__,
    "python": sys.version.split()[0],
    "powerlaw_cutoff": [],
    "powerlaw_range": [],
    "er_targeting": [],
    "heavy_tail": {},
}
for tau, kappa in [(2.0, 20.0), (2.5, 50.0)]:
    k, p = powerlaw_cutoff(tau, kappa)
    for T in [0.2, 0.5, 0.9]:
        s, tc = bond(k, p, T)
        out["powerlaw_cutoff"].append(
            {"spec": f"powerlaw:exponent={tau},cutoff={kappa}", "T": T, "S": s, "T_c": tc}
        )
k, p = powerlaw_range(2.5, 2, 300)
for T in [0.1, 0.5, 1.0]:
    s, tc = bond(k, p, T)
    out["powerlaw_range"].append(
        {"spec": "powerlaw:exponent=2.5,min=2,max=300", "T": T, "S": s, "T_c": tc}
    )
k, p = poisson(3.5)
for T in [1.0, 0.5, 0.4]:
    out["er_targeting"].append(
        {
            "spec": "poisson:mean=3.5",
            "T": T,
            "degree": degree_targeting(k, p, T),
            "random": 1 - 1 / (T * 3.5),
        }
    )
k, p = powerlaw_range(2.5, 2, 1000)
m = (k * p).sum()
kap = (k * (k - 1) * p).sum() / m
acq, x = acquaintance(k, p, 1.0)
out["heavy_tail"] = {
    "spec": "powerlaw:exponent=2.5,min=2,max=1000",
    "T": 1.0,
    "random": 1 - 1 / kap,
    "degree": degree_targeting(k, p, 1.0),
    "acquaintance": acq,
    "acquaintance_nominations": x,
}
json.dump(out, sys.stdout, indent=1)
print()
