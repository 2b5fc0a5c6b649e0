#!/usr/bin/env python3
"""
Reference values for blackbody emission integrated over wavelength bands.

WHAT
    Writes test/reference/planck-bands.json: the hemispheric blackbody flux
        pi * integral of B_lambda(T) d lambda   over [lo, hi] micrometres, W m^-2,
    for the thermal-infrared bands of Motebench's infrared forcing (their edges
    repeated here: 4, 5.5, 7.5, 8.5, 9.5, 10.5, 11.5, 12.5, 14, 16, 20, 25, 40 um),
    for the stretches below 4 um and beyond 40 um, and for a few other bands, at
    temperatures from 180 K to 350 K and at the Sun's 5772 K. Used by
    test/climate/planck.test.ts to check src-core/climate/planck.ts.

FORMULA
    Planck's law, B_lambda(T) = 2 h c^2 lambda^-5 / (exp(h c / (lambda k T)) - 1),
    with the exact SI 2019 values of h, c and k.

METHOD
    Each band integral is evaluated twice, independently:
      - mpmath.quad at 30 significant digits, in the variable x = h c/(lambda k T)
        (pi B_lambda d lambda = (2 pi k^4 T^4 / (h^3 c^2)) x^3/(e^x - 1) dx), with
        the interval split at x = 1, 10, 50 for the quadrature;
      - scipy.integrate.quad in wavelength (double precision, epsrel 1e-12).
    The two must agree to 1e-9 relative, otherwise the script stops.
    Runs in a few seconds: python3 test/reference/make_planck_reference.py
"""
import json
import math
import os

import mpmath
from scipy import integrate

H = 6.62607015e-34
C = 299792458.0
K = 1.380649e-23
EDGES = [4, 5.5, 7.5, 8.5, 9.5, 10.5, 11.5, 12.5, 14, 16, 20, 25, 40]
TEMPS = [180, 220, 255, 288.15, 310, 350]
OTHER = [(0.3, 0.7, 5772), (0.7, 4, 5772), (3, 100, 5772), (8, 13, 288.15), (8, 13, 250)]


def mp_band(lo, hi, t):
    mpmath.mp.dps = 30
    h, c, k = mpmath.mpf(H), mpmath.mpf(C), mpmath.mpf(K)
    pref = 2 * mpmath.pi * k**4 * mpmath.mpf(t) ** 4 / (h**3 * c**2)
    x_hi = h * c / (mpmath.mpf(lo) * mpmath.mpf('1e-6') * k * t)
    x_lo = mpmath.mpf(0) if hi == math.inf else h * c / (mpmath.mpf(hi) * mpmath.mpf('1e-6') * k * t)
    pts = [x_lo] + [p for p in (1, 10, 50) if x_lo < p < x_hi] + [x_hi]
    f = lambda x: x**3 / mpmath.expm1(x)
    return float(pref * mpmath.quad(f, pts))


def sp_band(lo, hi, t):
    def f(lam_um):
        lam = lam_um * 1e-6
        x = H * C / (lam * K * t)
        if x > 700:
            return 0.0
        return 2 * math.pi * H * C**2 / lam**5 / math.expm1(x) * 1e-6
    if hi == math.inf:
        # beyond 40 um: in 1/lambda, from 0 to 1/lo
        g = lambda s: f(1 / s) / s**2 if s > 0 else 0.0
        v, _ = integrate.quad(g, 0, 1 / lo, epsabs=0, epsrel=1e-12, limit=200)
        return v
    v, _ = integrate.quad(f, lo, hi, epsabs=0, epsrel=1e-12, limit=200)
    return v


def main():
    cases = []
    bands = [(0.1, 4)] + list(zip(EDGES[:-1], EDGES[1:])) + [(40, math.inf)]
    for t in TEMPS:
        for lo, hi in bands:
            cases.append((lo, hi, t))
    cases += OTHER
    out = []
    for lo, hi, t in cases:
        a = mp_band(lo, hi, t)
        b = sp_band(lo, hi, t)
        if abs(a - b) > 1e-9 * abs(a) + 1e-300:
            raise SystemExit(f'mpmath and scipy disagree for {lo}-{hi} um at {t} K: {a} vs {b}')
        out.append({'lo_um': lo, 'hi_um': None if hi == math.inf else hi, 't_k': t, 'flux_w_m2': a})
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), 'planck-bands.json')
    with open(path, 'w') as fh:
        json.dump({'source': 'test/reference/make_planck_reference.py (mpmath.quad, checked by scipy.integrate.quad)', 'cases': out}, fh, indent=1)
    print(f'wrote {len(out)} cases to {path}')


if __name__ == '__main__':
    main()
