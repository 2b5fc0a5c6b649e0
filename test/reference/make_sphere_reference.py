#!/usr/bin/env python3
"""
Reference values for Mie scattering by homogeneous and coated spheres.

WHAT
    Generates the committed JSON files
        test/reference/sphere-reference.json   homogeneous spheres
        test/reference/water-droplets.json     water droplets at 0.55 um
        test/reference/coated-reference.json   coated (core/shell) spheres
    which the TypeScript test-suite uses to check Motebench's own Mie engine.
    The output is committed; re-run this script only to regenerate it.

FORMULAS (written from the textbook, no Mie program or data was consulted)
    C. F. Bohren & D. R. Huffman (1983), "Absorption and Scattering of Light by
    Small Particles", Wiley:
      ch. 4  homogeneous sphere: a_n, b_n (eq. 4.53, used in the equivalent
             form 4.88 with D_n = psi_n'/psi_n), Qext, Qsca (4.61, 4.62),
             Qback (4.82 ff.), asymmetry parameter g (4.78 ff.),
             S1, S2 (4.74) with the angular functions pi_n, tau_n (4.46, 4.47).
      sec. 8.1  coated sphere a_n, b_n with A_n, B_n (eq. 8.2).
    Riccati-Bessel functions (BH sec. 4.4):
        psi_n(z) = z j_n(z),  chi_n(z) = -z y_n(z),  xi_n(z) = psi_n(z) - i chi_n(z)
        f_n'(z) = f_{n-1}(z) - (n/z) f_n(z)          (f = psi, chi, xi)
    Time dependence exp(-i w t); relative index m = n + i k, k >= 0 absorbing.

METHOD
    Every Riccati-Bessel value is evaluated DIRECTLY (no recurrence in n) with
    the arbitrary-precision library mpmath:
        j_n(z) = sqrt(pi/(2z)) J_{n+1/2}(z),  y_n(z) = sqrt(pi/(2z)) Y_{n+1/2}(z)
    i.e. psi_n(z) = sqrt(pi z/2) J_{n+1/2}(z), chi_n(z) = -sqrt(pi z/2) Y_{n+1/2}(z)
    (mpmath.besselj / mpmath.bessely).  A self-test compares these against the
    exact finite closed form of the spherical Hankel functions.
    Precision: the results are wanted to 40 significant digits.  Each case is
    evaluated with all Bessel values at P_hi = P + 20 decimal digits, where
    P = 50 (+ 2*log10(1/x) for x < 1); the whole algebra is then repeated with
    those inputs rounded to P digits, and the two answers must agree to better
    than 1e-41 relative (otherwise P is raised by 20 and the case redone).
    The series is started at N = x + 4.05 x^(1/3) + 10 terms and extended
    until the last term contributes < 1e-43 relative to every sum.
    The angular functions pi_n, tau_n are computed with BH's upward recurrence
    (4.47), which is exact and stable, at the same high precision.

RUN
    python3 test/reference/make_sphere_reference.py        (about 9 min of CPU time; 18 min wall-clock on a busy 2-core machine)
    python3 test/reference/make_sphere_reference.py --small-g   (g and Qsca of
        small spheres, x 1e-6 to 0.1, into sphere-small-g.json; under a minute)
    Options: --only SUBSTR (cases whose id contains SUBSTR, nothing written),
             --no-write, --no-resonance.
    Needs only python3 and mpmath (pip "mpmath" or Debian "python3-mpmath").
"""

import argparse
import json
import math
import os
import sys
import time

import mpmath
from mpmath import mp, mpf, mpc

TARGET_DIGITS = 40          # digits wanted in the results
BASE_DIGITS = 50            # P for x >= 1
GUARD_DIGITS = 20           # P_hi = P + GUARD_DIGITS
TAIL_EPS_EXP = TARGET_DIGITS + 3
RES_DELTA = '1e-9'          # x(1 +- RES_DELTA) for resonance sensitivity
RES_DIGITS = 30             # precision for the resonance-sensitivity runs

HERE = os.path.dirname(os.path.abspath(__file__))
SCRIPT_NAME = 'test/reference/make_sphere_reference.py'


def log(*args):
    print(*args, file=sys.stderr, flush=True)


# ---------------------------------------------------------------------------
# Riccati-Bessel functions by direct evaluation, cached per argument/precision
# ---------------------------------------------------------------------------

_rb_cache = {}


def _key(z):
    if isinstance(z, mpc):
        return (mp.prec, z.real, z.imag)
    return (mp.prec, z, mpf(0))


def riccati(z, nmax, need_chi):
    """psi_n(z) (and chi_n(z)) for n = 0..nmax at the current mp precision.

    psi_n(z) = sqrt(pi z / 2) J_{n+1/2}(z)      (= z j_n(z))
    chi_n(z) = -sqrt(pi z / 2) Y_{n+1/2}(z)     (= -z y_n(z))
    Principal branches; valid here since Re z > 0 and Im z >= 0.
    Each order is evaluated directly by mpmath (no recurrence in n).
    """
    key = _key(z)
    ent = _rb_cache.get(key)
    if ent is None:
        ent = {'pref': mp.sqrt(mp.pi * z / 2), 'psi': [], 'chi': []}
        _rb_cache[key] = ent
    pref = ent['pref']
    half = mpf(1) / 2
    psi = ent['psi']
    for n in range(len(psi), nmax + 1):
        psi.append(pref * mp.besselj(n + half, z))
    if need_chi:
        chi = ent['chi']
        for n in range(len(chi), nmax + 1):
            chi.append(-pref * mp.bessely(n + half, z))
    return ent


def clear_cache_other_prec(keep_precs):
    for k in list(_rb_cache):
        if k[0] not in keep_precs:
            del _rb_cache[k]


def rounded(lst):
    """Round a list of mp numbers to the current precision (unary plus)."""
    return [+v for v in lst]


# ---------------------------------------------------------------------------
# Mie coefficients
# ---------------------------------------------------------------------------

def homog_coeffs(x, m, n1, n2, R):
    """a_n, b_n for n = n1..n2, homogeneous sphere (BH eq. 4.53 in the form 4.88).

    R: dict with psi_x, chi_x (real argument x) and psi_mx (argument m x).
        a_n = [(D_n/m + n/x) psi_n(x) - psi_{n-1}(x)] / [(D_n/m + n/x) xi_n(x) - xi_{n-1}(x)]
        b_n = [(m D_n + n/x) psi_n(x) - psi_{n-1}(x)] / [(m D_n + n/x) xi_n(x) - xi_{n-1}(x)]
    with D_n = psi_n'(mx)/psi_n(mx) = psi_{n-1}(mx)/psi_n(mx) - n/(mx), obtained
    from the directly evaluated psi_{n-1}(mx), psi_n(mx).  (4.88 is 4.53
    divided through by psi_n(mx).)
    """
    px, cx, pm = R['psi_x'], R['chi_x'], R['psi_mx']
    mx = m * x
    I = mpc(0, 1)
    a, b = [], []
    for n in range(n1, n2 + 1):
        D = pm[n - 1] / pm[n] - n / mx
        xin = px[n] - I * cx[n]
        xin1 = px[n - 1] - I * cx[n - 1]
        ta = D / m + n / x
        tb = m * D + n / x
        a.append((ta * px[n] - px[n - 1]) / (ta * xin - xin1))
        b.append((tb * px[n] - px[n - 1]) / (tb * xin - xin1))
    return a, b


def coated_coeffs(xc, xs, m1, m2, n1, n2, R):
    """a_n, b_n for n = n1..n2, coated sphere, BH sec. 8.1 eq. (8.2).

    x = xc (core), y = xs (shell), m1 = core, m2 = shell relative index.
      A_n = [m2 psi_n(m2x) psi_n'(m1x) - m1 psi_n'(m2x) psi_n(m1x)]
            / [m2 chi_n(m2x) psi_n'(m1x) - m1 chi_n'(m2x) psi_n(m1x)]
      B_n = [m2 psi_n(m1x) psi_n'(m2x) - m1 psi_n(m2x) psi_n'(m1x)]
            / [m2 chi_n'(m2x) psi_n(m1x) - m1 psi_n'(m1x) chi_n(m2x)]
      a_n = {psi_n(y)[psi_n'(m2y) - A_n chi_n'(m2y)] - m2 psi_n'(y)[psi_n(m2y) - A_n chi_n(m2y)]}
          / {xi_n(y)[psi_n'(m2y) - A_n chi_n'(m2y)] - m2 xi_n'(y)[psi_n(m2y) - A_n chi_n(m2y)]}
      b_n = {m2 psi_n(y)[psi_n'(m2y) - B_n chi_n'(m2y)] - psi_n'(y)[psi_n(m2y) - B_n chi_n(m2y)]}
          / {m2 xi_n(y)[psi_n'(m2y) - B_n chi_n'(m2y)] - xi_n'(y)[psi_n(m2y) - B_n chi_n(m2y)]}
    Derivatives from f_n' = f_{n-1} - (n/z) f_n with directly evaluated f.
    """
    z1, z2, z3 = m1 * xc, m2 * xc, m2 * xs
    p1, p2, c2 = R['psi_z1'], R['psi_z2'], R['chi_z2']
    p3, c3 = R['psi_z3'], R['chi_z3']
    py, cy = R['psi_y'], R['chi_y']
    y = xs
    I = mpc(0, 1)
    a, b = [], []
    for n in range(n1, n2 + 1):
        P1, dP1 = p1[n], p1[n - 1] - n / z1 * p1[n]
        P2, dP2 = p2[n], p2[n - 1] - n / z2 * p2[n]
        C2, dC2 = c2[n], c2[n - 1] - n / z2 * c2[n]
        P3, dP3 = p3[n], p3[n - 1] - n / z3 * p3[n]
        C3, dC3 = c3[n], c3[n - 1] - n / z3 * c3[n]
        Py, dPy = py[n], py[n - 1] - n / y * py[n]
        Xy = py[n] - I * cy[n]
        dXy = (py[n - 1] - I * cy[n - 1]) - n / y * Xy
        An = (m2 * P2 * dP1 - m1 * dP2 * P1) / (m2 * C2 * dP1 - m1 * dC2 * P1)
        Bn = (m2 * P1 * dP2 - m1 * P2 * dP1) / (m2 * dC2 * P1 - m1 * dP1 * C2)
        UA, VA = dP3 - An * dC3, P3 - An * C3
        UB, VB = dP3 - Bn * dC3, P3 - Bn * C3
        a.append((Py * UA - m2 * dPy * VA) / (Xy * UA - m2 * dXy * VA))
        b.append((m2 * Py * UB - dPy * VB) / (m2 * Xy * UB - dXy * VB))
    return a, b


# ---------------------------------------------------------------------------
# Efficiencies, asymmetry parameter, amplitude functions
# ---------------------------------------------------------------------------

def sums(a, b):
    """a, b: lists for n = 1..N.  Returns the raw series sums."""
    N = len(a)
    s_ext = mpf(0)
    s_sca = mpf(0)
    s_back = mpc(0)
    s_g = mpf(0)
    for i in range(N):
        n = i + 1
        an, bn = a[i], b[i]
        s_ext += (2 * n + 1) * (an.real + bn.real)
        s_sca += (2 * n + 1) * (abs(an) ** 2 + abs(bn) ** 2)
        sign = 1 if n % 2 == 0 else -1
        s_back += (2 * n + 1) * sign * (an - bn)
        s_g += mpf(2 * n + 1) / (n * (n + 1)) * (an * mp.conj(bn)).real
        if i + 1 < N:
            s_g += mpf(n * (n + 2)) / (n + 1) * (an * mp.conj(a[i + 1]) + bn * mp.conj(b[i + 1])).real
    return s_ext, s_sca, s_back, s_g


def efficiencies(x, a, b):
    """Conventions (BH ch. 4):
       Qext = (2/x^2) sum (2n+1) Re(a_n + b_n)
       Qsca = (2/x^2) sum (2n+1) (|a_n|^2 + |b_n|^2)
       Qabs = Qext - Qsca
       Qback = (1/x^2) |sum (2n+1) (-1)^n (a_n - b_n)|^2
       g = 4/(Qsca x^2) sum [ n(n+2)/(n+1) Re(a_n a*_{n+1} + b_n b*_{n+1})
                             + (2n+1)/(n(n+1)) Re(a_n b*_n) ]
       Qpr = Qext - g Qsca
    """
    s_ext, s_sca, s_back, s_g = sums(a, b)
    x2 = x * x
    qext = 2 * s_ext / x2
    qsca = 2 * s_sca / x2
    qback = abs(s_back) ** 2 / x2
    g = 4 * s_g / (qsca * x2)
    return {'qext': qext, 'qsca': qsca, 'qabs': qext - qsca, 'qback': qback,
            'g': g, 'qpr': qext - g * qsca}


def tail_ratio(a, b):
    """Largest relative contribution of the last two terms to any of the sums."""
    s_ext, s_sca, s_back, s_g = sums(a, b)
    N = len(a)
    r = mpf(0)
    for i in (N - 2, N - 1):
        n = i + 1
        aa, bb = abs(a[i]), abs(b[i])
        t1 = (2 * n + 1) * (aa + bb)
        t2 = (2 * n + 1) * (aa ** 2 + bb ** 2)
        r = max(r, t1 / abs(s_ext), t2 / s_sca, t1 / abs(s_back))
        if s_g != 0:
            r = max(r, (n + 1) * (aa * (aa + bb) + bb * (aa + bb)) / abs(s_g))
    return r


def amplitudes(a, b, angles_deg):
    """S1, S2 of BH eq. 4.74:
         S1 = sum (2n+1)/(n(n+1)) (a_n pi_n + b_n tau_n)
         S2 = sum (2n+1)/(n(n+1)) (a_n tau_n + b_n pi_n)
       pi_n, tau_n from BH (4.47): pi_0 = 0, pi_1 = 1,
         pi_n = (2n-1)/(n-1) mu pi_{n-1} - n/(n-1) pi_{n-2},
         tau_n = n mu pi_n - (n+1) pi_{n-1},   mu = cos(theta)."""
    out1, out2 = [], []
    N = len(a)
    for deg in angles_deg:
        mu = mp.cospi(mpf(deg) / 180)   # exact 1, 0, -1 at 0, 90, 180 deg
        pim2, pim1 = mpf(0), mpf(1)     # pi_{n-2}, pi_{n-1} for n = 2
        S1 = mpc(0)
        S2 = mpc(0)
        for i in range(N):
            n = i + 1
            if n == 1:
                pin, piprev = mpf(1), mpf(0)
            else:
                pin = (mpf(2 * n - 1) / (n - 1)) * mu * pim1 - (mpf(n) / (n - 1)) * pim2
                piprev = pim1
            taun = n * mu * pin - (n + 1) * piprev
            f = mpf(2 * n + 1) / (n * (n + 1))
            S1 += f * (a[i] * pin + b[i] * taun)
            S2 += f * (a[i] * taun + b[i] * pin)
            if n >= 2:
                pim2, pim1 = pim1, pin
            else:
                pim2, pim1 = mpf(0), mpf(1)
        out1.append(S1)
        out2.append(S2)
    return out1, out2


# ---------------------------------------------------------------------------
# Case evaluation with adaptive truncation and precision control
# ---------------------------------------------------------------------------

def n_start(x):
    return int(math.ceil(float(x) + 4.05 * float(x) ** (1.0 / 3.0) + 10))


class Homog:
    def __init__(self, x, m):
        self.x, self.m = x, m      # mp values

    def size(self):
        return self.x

    def bessel(self, nmax):
        x, m = self.x, self.m
        rx = riccati(x, nmax, True)
        rm = riccati(m * x if m.imag != 0 else (m.real * x), nmax, False)
        return {'psi_x': rx['psi'][:nmax + 1], 'chi_x': rx['chi'][:nmax + 1],
                'psi_mx': rm['psi'][:nmax + 1]}

    def coeffs(self, N, R):
        return homog_coeffs(self.x, self.m, 1, N, R)


class Coated:
    def __init__(self, xc, xs, m1, m2):
        self.xc, self.xs, self.m1, self.m2 = xc, xs, m1, m2

    def size(self):
        return self.xs

    def bessel(self, nmax):
        xc, xs, m1, m2 = self.xc, self.xs, self.m1, self.m2

        def arg(mm, xx):
            return mm * xx if mm.imag != 0 else mm.real * xx
        r1 = riccati(arg(m1, xc), nmax, False)
        r2 = riccati(arg(m2, xc), nmax, True)
        r3 = riccati(arg(m2, xs), nmax, True)
        ry = riccati(xs, nmax, True)
        k = nmax + 1
        return {'psi_z1': r1['psi'][:k], 'psi_z2': r2['psi'][:k], 'chi_z2': r2['chi'][:k],
                'psi_z3': r3['psi'][:k], 'chi_z3': r3['chi'][:k],
                'psi_y': ry['psi'][:k], 'chi_y': ry['chi'][:k]}

    def coeffs(self, N, R):
        return coated_coeffs(self.xc, self.xs, self.m1, self.m2, 1, N, R)


def make_problem(case, scale=None):
    """Build the mp problem from the case's double inputs (exact binary values)."""
    def cm(pair):
        return mpc(mpf(pair[0]), mpf(pair[1]))
    s = mpf(1) if scale is None else scale
    if 'x_core' in case:
        return Coated(mpf(case['x_core']) * s, mpf(case['x_shell']) * s,
                      cm(case['m_core']), cm(case['m_shell']))
    return Homog(mpf(case['x']) * s, cm(case['m']))


def solve_series(prob):
    """Adaptive truncation at the current precision. Returns (N, a, b, R, tail)."""
    x = prob.size()
    N = n_start(x)
    step = max(4, int(math.ceil(2 * float(x) ** (1.0 / 3.0))))
    eps = mpf(10) ** (-TAIL_EPS_EXP)
    a, b = [], []
    while True:
        R = prob.bessel(N)
        na, nb = prob.coeffs(N, R) if not a else _extend(prob, a, b, N, R)
        a, b = na, nb
        tail = tail_ratio(a, b)
        if tail < eps:
            return N, a, b, R, tail
        if N > 20 * n_start(x) + 500:
            raise RuntimeError('series did not converge')
        N += step


def _extend(prob, a, b, N, R):
    n1 = len(a) + 1
    if isinstance(prob, Homog):
        ea, eb = homog_coeffs(prob.x, prob.m, n1, N, R)
    else:
        ea, eb = coated_coeffs(prob.xc, prob.xs, prob.m1, prob.m2, n1, N, R)
    return a + ea, b + eb


def rel_diff(u, v, scale=None):
    d = abs(u - v)
    s = abs(v) if scale is None else scale
    if s == 0:
        return mpf(0) if d == 0 else mpf(1)
    return d / s


def start_digits(case):
    x = case['x_core'] if 'x_core' in case else case['x']
    extra = 0
    if x < 1:
        extra = int(math.ceil(2 * math.log10(1.0 / x)))
    return BASE_DIGITS + extra


def evaluate(case, angles=None):
    """Full-precision evaluation with precision control. Returns a result dict."""
    P = start_digits(case)
    absorbing = (case.get('m', [0, 0])[1] > 0 or case.get('m_core', [0, 0])[1] > 0
                 or case.get('m_shell', [0, 0])[1] > 0)
    for attempt in range(4):
        Phi = P + GUARD_DIGITS
        with mp.workdps(Phi):
            prob = make_problem(case)
            N, a, b, R, tail = solve_series(prob)
            Q = efficiencies(prob.size(), a, b)
            S = amplitudes(a, b, angles) if angles else None
            # repeat the algebra with all Bessel inputs rounded to P digits
            with mp.workdps(P):
                R_lo = {k: rounded(v) for k, v in R.items()}
                prob_lo = make_problem(case)
                a_lo, b_lo = prob_lo.coeffs(N, R_lo)
                Q_lo = efficiencies(prob_lo.size(), a_lo, b_lo)
                S_lo = amplitudes(a_lo, b_lo, angles) if angles else None
            worst = mpf(0)
            for k in ('qext', 'qsca', 'qback', 'g', 'qpr'):
                worst = max(worst, rel_diff(Q_lo[k], Q[k]))
            if absorbing:
                worst = max(worst, rel_diff(Q_lo['qabs'], Q['qabs']))
            if S:
                for L, Llo in ((S[0], S_lo[0]), (S[1], S_lo[1])):
                    scale = max(abs(v) for v in L)
                    for v, vlo in zip(L, Llo):
                        # each component to 41 digits relative to its own size,
                        # or relative to the largest amplitude for tiny ones
                        worst = max(worst, rel_diff(vlo, v, max(abs(v), scale * mpf(10) ** -20)))
            ok = worst < mpf(10) ** -(TARGET_DIGITS + 1)
            if ok:
                res = {'N': N, 'Q': Q, 'S': S, 'tail': tail, 'P': P, 'Phi': Phi,
                       'agree': worst, 'a1': a[0], 'b1': b[0],
                       'energy_residual': None}
                if not absorbing:
                    res['energy_residual'] = abs(Q['qabs']) / Q['qext']
                if S:
                    # optical theorem and backscatter consistency (BH 4.76, 4.82)
                    x = prob.size()
                    i0 = angles.index(0)
                    i180 = angles.index(180)
                    c1 = rel_diff(4 / x ** 2 * S[0][i0].real, Q['qext'])
                    c2 = rel_diff(4 / x ** 2 * abs(S[0][i180]) ** 2, Q['qback'])
                    c3 = rel_diff(S[0][i0], S[1][i0])
                    c4 = rel_diff(-S[0][i180], S[1][i180])
                    res['angular_checks'] = max(c1, c2, c3, c4)
                return res
        log('   precision raised for', case['id'], 'agreement was', mp.nstr(worst, 3))
        P += 20
        clear_cache_other_prec(set())
    raise RuntimeError('precision control failed for ' + case['id'])


def qext_only(case, scale):
    """Qext at x*scale (all sizes scaled, m fixed), RES_DIGITS precision."""
    with mp.workdps(RES_DIGITS + GUARD_DIGITS):
        prob = make_problem(case, scale)
        N, a, b, R, tail = solve_series(prob)
        return efficiencies(prob.size(), a, b)['qext']


def resonance_sensitivity(case, q0):
    with mp.workdps(RES_DIGITS + GUARD_DIGITS):
        d = mpf(RES_DELTA)
        qp = qext_only(case, 1 + d)
        qm = qext_only(case, 1 - d)
        return max(abs(qp - q0), abs(qm - q0)) / abs(q0)


# ---------------------------------------------------------------------------
# Self-tests
# ---------------------------------------------------------------------------

def closed_form_jy(n, z, dps):
    """Spherical j_n, y_n from the exact finite form (BH 4.13 ff.):
       h_n^(1)(z) = (-i)^(n+1) e^{iz}/z sum_{k=0}^n i^k (n+k)!/(k!(n-k)!(2z)^k),
       h_n^(2) the conjugate-form; j = (h1+h2)/2, y = (h1-h2)/(2i)."""
    ipow = [mpc(1, 0), mpc(0, 1), mpc(-1, 0), mpc(0, -1)]
    with mp.workdps(dps):
        z = mp.mpmathify(z)
        s1 = mpc(0)
        s2 = mpc(0)
        for k in range(n + 1):
            t = mp.factorial(n + k) / (mp.factorial(k) * mp.factorial(n - k) * (2 * z) ** k)
            s1 += ipow[k % 4] * t
            s2 += ipow[(-k) % 4] * t
        h1 = ipow[(-(n + 1)) % 4] * mp.exp(1j * z) / z * s1
        h2 = ipow[(n + 1) % 4] * mp.exp(-1j * z) / z * s2
        return (h1 + h2) / 2, (h1 - h2) / (2j)


def selftest_bessel():
    worst = mpf(0)
    pts = [(0, '0.3'), (3, '2.5'), (40, '30'), (120, '100'), (300, '1000'),
           (5, ('1.2', '0.4')), (60, ('75', '0.0001')), (100, ('100', '100')),
           (30, ('0.05', '2')), (400, ('1330', '0.0133'))]
    with mp.workdps(TARGET_DIGITS + GUARD_DIGITS):
        for n, zs in pts:
            z = mpf(zs) if isinstance(zs, str) else mpc(mpf(zs[0]), mpf(zs[1]))
            r = riccati(z, n, True)
            jc, yc = closed_form_jy(n, z, 400)
            worst = max(worst, rel_diff(r['psi'][n], z * jc), rel_diff(r['chi'][n], -z * yc))
    return worst


# ---------------------------------------------------------------------------
# Cases
# ---------------------------------------------------------------------------

ANGLES = [0, 10, 30, 60, 90, 120, 150, 179, 180]

BH_X = 2 * math.pi * 0.525 / 0.6328          # double; reference is for this double


def homog_cases():
    C = []

    def add(x, n, k, tags, **extra):
        cid = 'm=%s%+gi,x=%s' % (repr(n), k, repr(x))
        c = {'id': cid, 'x': x, 'm': [n, k], 'tags': list(tags)}
        c.update(extra)
        C.append(c)

    W = 'wiscombe1979'
    # Wiscombe (1979) NCAR TN-140+STR test cases
    add(0.099, 0.75, 0.0, [W, 'small_x', 'm_lt_1', 'nonabsorbing'])
    add(0.101, 0.75, 0.0, [W, 'small_x', 'm_lt_1', 'nonabsorbing'], angles=True)
    add(10.0, 0.75, 0.0, [W, 'm_lt_1', 'nonabsorbing'], angles=True)
    add(1000.0, 0.75, 0.0, [W, 'large_x', 'm_lt_1', 'nonabsorbing'])
    add(1.0, 1.33, 1e-5, [W, 'weakly_absorbing'], angles=True)
    add(100.0, 1.33, 1e-5, [W, 'weakly_absorbing'])
    add(1000.0, 1.33, 1e-5, [W, 'large_x', 'weakly_absorbing'])
    add(0.055, 1.5, 1.0, [W, 'small_x', 'absorbing'])
    add(1.0, 1.5, 1.0, [W, 'absorbing'], angles=True)
    add(100.0, 1.5, 1.0, [W, 'absorbing'])
    add(1.0, 10.0, 10.0, [W, 'large_m', 'absorbing'], angles=True)
    add(100.0, 10.0, 10.0, [W, 'large_m', 'absorbing'])
    # Bohren & Huffman appendix A example
    add(BH_X, 1.55, 0.0, ['bohren_huffman_appendixA', 'nonabsorbing'], angles=True,
        x_formula='2*pi*0.525/0.6328 (radius 0.525 um, wavelength 0.6328 um)')
    # very small x
    for x in (1e-6, 1e-4, 1e-3, 0.01):
        add(x, 1.5, 0.0, ['small_x', 'nonabsorbing'])
        add(x, 1.95, 0.79, ['small_x', 'absorbing', 'soot'])
    add(1e-6, 10.0, 10.0, ['small_x', 'large_m', 'absorbing'])
    add(1e-3, 10.0, 10.0, ['small_x', 'large_m', 'absorbing'])
    add(1e-3, 0.1, 0.5, ['small_x', 'm_lt_1', 'absorbing'])
    add(1e-4, 1.333, 1e-8, ['small_x', 'water', 'weakly_absorbing'])
    add(1e-3, 0.5, 0.0, ['small_x', 'm_lt_1', 'nonabsorbing'])
    add(1e-3, 0.05, 2.0, ['small_x', 'm_lt_1', 'absorbing', 'metal_like'])
    # real index 1.5 across sizes
    for x in (0.1, 0.5, 1.0, 2.0, 5.0, 20.0, 50.0, 100.0):
        add(x, 1.5, 0.0, ['nonabsorbing'], **({'angles': True} if x == 20.0 else {}))
    # soot-like
    for x in (0.1, 0.5, 1.0, 3.0, 10.0, 30.0, 100.0):
        add(x, 1.95, 0.79, ['absorbing', 'soot'], **({'angles': True} if x == 10.0 else {}))
    # water, nearly non-absorbing
    for x in (1.0, 10.0, 100.0):
        add(x, 1.333, 1e-8, ['water', 'weakly_absorbing'])
    # dust
    add(1.0, 1.53, 0.008, ['dust', 'absorbing'])
    add(10.0, 1.53, 0.008, ['dust', 'absorbing'])
    add(150.0, 1.53, 0.008, ['dust', 'weakly_absorbing', 'weakly_absorbing_large'])
    for x in (1.0, 10.0, 50.0, 150.0):
        add(x, 1.53, 0.01, ['dust', 'absorbing'] + (['weakly_absorbing_large'] if x >= 50 else []),
            **({'angles': True} if x == 50.0 else {}))
    # m < 1
    for x in (0.1, 1.0, 10.0):
        add(x, 0.5, 0.0, ['m_lt_1', 'nonabsorbing'])
        add(x, 0.1, 0.5, ['m_lt_1', 'absorbing'])
    add(1.0, 0.75, 0.0, ['m_lt_1', 'nonabsorbing'])
    add(100.0, 0.75, 0.0, ['m_lt_1', 'nonabsorbing'])
    add(0.1, 0.05, 0.0, ['m_lt_1', 'nonabsorbing'])
    add(1.0, 0.05, 0.0, ['m_lt_1', 'nonabsorbing'])
    add(1.0, 0.05, 2.0, ['m_lt_1', 'absorbing', 'metal_like'])
    add(10.0, 0.05, 2.0, ['m_lt_1', 'absorbing', 'metal_like'])
    # large |m|
    add(0.1, 10.0, 10.0, ['large_m', 'absorbing'])
    add(10.0, 10.0, 10.0, ['large_m', 'absorbing'])
    add(1.0, 10.0, 0.0, ['large_m', 'nonabsorbing'])
    add(10.0, 10.0, 0.0, ['large_m', 'nonabsorbing'])
    add(1.0, 1.0, 10.0, ['large_m', 'absorbing'])
    add(10.0, 2.0, 1.0, ['absorbing'])
    add(50.0, 2.0, 1.0, ['absorbing'])
    add(5.0, 5.0, 0.1, ['large_m', 'absorbing'])
    # index close to 1
    add(10.0, 1.01, 0.0, ['near_1', 'nonabsorbing'])
    add(100.0, 1.01, 0.0, ['near_1', 'nonabsorbing'])
    add(3.0, 1.2, 0.2, ['absorbing'])
    # large x
    # (x = 2000 was tried: mpmath's direct J_{n+1/2}(z) costs ~0.1-1 s per order for
    #  |z| ~ 2000-3000, i.e. 10+ minutes per case, so the largest cases are x = 1000)
    add(1000.0, 1.5, 0.0, ['large_x', 'nonabsorbing'])
    add(500.0, 1.333, 1e-8, ['large_x', 'water', 'weakly_absorbing'])
    add(1000.0, 1.95, 0.79, ['large_x', 'absorbing', 'soot'])
    # shared with the coated file (equal core/shell index, vacuum shell)
    add(60.0, 1.33, 1e-5, ['weakly_absorbing'])
    add(0.5, 1.5, 0.0, ['coated_crosscheck', 'nonabsorbing'])
    add(5.0, 1.95, 0.79, ['coated_crosscheck', 'absorbing', 'soot'])
    add(20.0, 2.5, 0.0, ['coated_crosscheck', 'nonabsorbing'])
    return C


WATER_D = [0.05, 0.1, 0.2, 0.5, 1.0, 2.0, 5.0, 10.0, 20.0]
WATER_LAMBDA = 0.55
WATER_M = (1.333, 1.96e-9)


def water_cases():
    C = []
    for D in WATER_D:
        x = math.pi * D / WATER_LAMBDA
        C.append({'id': 'water D=%gum' % D, 'x': x, 'm': list(WATER_M),
                  'diameter_um': D, 'wavelength_um': WATER_LAMBDA,
                  'x_formula': 'pi*%r/%r' % (D, WATER_LAMBDA),
                  'tags': ['water', 'water_droplet', 'weakly_absorbing']})
    return C


def coated_cases():
    C = []

    def add(xc, xs, mc, ms, tags, **extra):
        cid = 'core m=%r%+gi x=%r / shell m=%r%+gi x=%r' % (mc[0], mc[1], xc, ms[0], ms[1], xs)
        c = {'id': cid, 'x_core': xc, 'm_core': list(mc), 'x_shell': xs, 'm_shell': list(ms),
             'tags': list(tags)}
        c.update(extra)
        C.append(c)

    bc, sh = (1.95, 0.79), (1.53, 0.0)
    for xs, fr in ((0.1, 0.5), (0.1, 0.9), (1.0, 0.2), (1.0, 0.5), (1.0, 0.8),
                   (5.0, 0.3), (5.0, 0.7), (10.0, 0.2), (10.0, 0.5), (10.0, 0.9),
                   (25.0, 0.4), (50.0, 0.1), (50.0, 0.5)):
        add(xs * fr, xs, bc, sh, ['black_carbon_core'], core_fraction=fr)
    big, bsh = (2.0, 1.0), (1.5, 0.001)
    for xc, xs in ((30.0, 40.0), (30.0, 100.0), (100.0, 150.0), (200.0, 300.0), (200.0, 600.0),
                   (200.0, 1000.0)):
        add(xc, xs, big, bsh, ['large_absorbing_core'])
    dust, water = (1.53, 0.008), (1.33, 0.0)
    for xc, xs in ((1.0, 2.0), (5.0, 10.0), (10.0, 12.0), (20.0, 40.0)):
        add(xc, xs, dust, water, ['water_shell_on_dust'])
    # thin shells (< 1 % of the radius)
    add(9.95, 10.0, bc, sh, ['thin_shell', 'black_carbon_core'])
    add(0.995, 1.0, bc, sh, ['thin_shell', 'black_carbon_core'])
    add(0.995, 1.0, (1.45, 0.0), (0.3, 3.0), ['thin_shell', 'metal_like_shell'])
    add(0.9, 1.0, (1.45, 0.0), (0.3, 3.0), ['metal_like_shell'])
    add(49.9, 50.0, (1.5, 0.0), (2.0, 1.0), ['thin_shell', 'absorbing_shell'])
    # equal indices -> homogeneous sphere (same (x, m) in sphere-reference.json)
    add(0.25, 0.5, (1.5, 0.0), (1.5, 0.0), ['equal_index', 'homogeneous_crosscheck'])
    add(2.5, 5.0, bc, bc, ['equal_index', 'homogeneous_crosscheck'])
    add(10.0, 20.0, (2.5, 0.0), (2.5, 0.0), ['equal_index', 'homogeneous_crosscheck'])
    add(50.0, 150.0, dust, dust, ['equal_index', 'homogeneous_crosscheck'])
    add(60.0, 100.0, (1.33, 1e-5), (1.33, 1e-5), ['equal_index', 'homogeneous_crosscheck'])
    # vacuum shell -> homogeneous core sphere, Q scaled by (x_core/x_shell)^2
    add(1.0, 2.0, (1.5, 1.0), (1.0, 0.0), ['vacuum_shell', 'homogeneous_crosscheck'])
    # tiny core -> homogeneous shell sphere
    add(0.001, 1.0, bc, sh, ['tiny_core'])
    # other combinations
    add(5.0, 10.0, (1.0, 0.0), (1.33, 0.0), ['hollow', 'nonabsorbing'])
    add(8.0, 20.0, (2.5, 0.0), (1.4, 0.0), ['nonabsorbing'])
    add(40.0, 80.0, (2.5, 0.0), (1.4, 0.0), ['nonabsorbing'])
    add(3.0, 4.0, (1.33, 0.0), (1.95, 0.79), ['absorbing_shell'])
    return C


# ---------------------------------------------------------------------------
# Output
# ---------------------------------------------------------------------------

def s40(v):
    return mp.nstr(v, TARGET_DIGITS, min_fixed=-5, max_fixed=6)


class Num:
    """A number written with 17 significant digits."""
    def __init__(self, v):
        if isinstance(v, float):
            self.f = v
        else:
            # correctly rounded double of the 40-digit decimal result
            self.f = float(mp.nstr(v, TARGET_DIGITS))

    def dump(self):
        if self.f == 0:
            return '0'
        return '%.17g' % self.f


def jdump(o, ind=0):
    sp = '  '
    if isinstance(o, Num):
        return o.dump()
    if isinstance(o, bool) or o is None or isinstance(o, (str, int)):
        return json.dumps(o)
    if isinstance(o, float):
        return repr(o) if math.isfinite(o) else json.dumps(str(o))
    if isinstance(o, (list, tuple)):
        parts = [jdump(v, ind + 1) for v in o]
        if all(not isinstance(v, (dict,)) for v in o) and sum(len(p) for p in parts) < 400 \
                and not any(isinstance(v, list) and v and isinstance(v[0], list) for v in o):
            return '[' + ', '.join(parts) + ']'
        return '[\n' + ',\n'.join(sp * (ind + 1) + p for p in parts) + '\n' + sp * ind + ']'
    if isinstance(o, dict):
        items = ['%s%s: %s' % (sp * (ind + 1), json.dumps(k), jdump(v, ind + 1)) for k, v in o.items()]
        return '{\n' + ',\n'.join(items) + '\n' + sp * ind + '}'
    raise TypeError(type(o))


def case_record(case, res, res_sens):
    Q = res['Q']
    rec = {}
    if 'x_core' in case:
        rec['x_core'] = case['x_core']
        rec['m_core'] = case['m_core']
        rec['x_shell'] = case['x_shell']
        rec['m_shell'] = case['m_shell']
    else:
        rec['x'] = case['x']
        rec['m'] = case['m']
    for k in ('x_formula', 'diameter_um', 'wavelength_um', 'core_fraction'):
        if k in case:
            rec[k] = case[k]
    nonabs = all(v[1] == 0 for v in (case.get('m'), case.get('m_core'), case.get('m_shell')) if v)
    for k in ('qext', 'qsca', 'qabs', 'qback', 'qpr', 'g'):
        if k == 'qabs' and nonabs:
            rec[k] = Num(0.0)
        else:
            rec[k] = Num(Q[k])
    rec['terms_used'] = res['N']
    rec['tags'] = case['tags']
    rec['digits40'] = {k: s40(Q[k]) for k in ('qext', 'qsca', 'qabs', 'qback', 'qpr', 'g')
                       if not (k == 'qabs' and nonabs)}
    if res['S']:
        rec['angles_deg'] = ANGLES
        rec['s1'] = [[Num(v.real), Num(v.imag)] for v in res['S'][0]]
        rec['s2'] = [[Num(v.real), Num(v.imag)] for v in res['S'][1]]
    if res_sens is not None:
        rec['resonance_sensitivity'] = Num(res_sens)
        if res_sens > mpf(10) ** -5:
            rec['tags'] = rec['tags'] + ['narrow_resonance']
    rec['check'] = {
        'precision_digits_used': res['Phi'],
        'agreement_with_P_digit_inputs': mp.nstr(res['agree'], 3),
        'last_terms_relative': mp.nstr(res['tail'], 3),
    }
    if res['energy_residual'] is not None:
        rec['check']['abs_qext_minus_qsca_over_qext'] = mp.nstr(res['energy_residual'], 3)
    if res.get('angular_checks') is not None:
        rec['check']['angular_consistency'] = mp.nstr(res['angular_checks'], 3)
    return rec


CONVENTIONS = (
    "Bohren & Huffman (1983) conventions: time dependence exp(-i omega t); relative refractive index "
    "m = n + i k with k >= 0 absorbing, written as [n, k]; size parameter x = 2 pi r / lambda (medium "
    "wavelength). Qext = (2/x^2) sum (2n+1) Re(a_n+b_n); Qsca = (2/x^2) sum (2n+1)(|a_n|^2+|b_n|^2); "
    "Qabs = Qext - Qsca (written as exactly 0 when every index is real); "
    "Qback = (1/x^2) |sum (2n+1)(-1)^n (a_n - b_n)|^2 (= 4|S1(180)|^2/x^2); "
    "g = (4/(Qsca x^2)) sum [ n(n+2)/(n+1) Re(a_n a*_{n+1} + b_n b*_{n+1}) + (2n+1)/(n(n+1)) Re(a_n b*_n) ]; "
    "Qpr = Qext - g Qsca. S1 = sum (2n+1)/(n(n+1)) (a_n pi_n + b_n tau_n), "
    "S2 = sum (2n+1)/(n(n+1)) (a_n tau_n + b_n pi_n) (BH eq. 4.74), with pi_n, tau_n of cos(theta) "
    "(BH 4.46-4.47), theta in degrees in angles_deg, values as [re, im]; S1(0) = S2(0), "
    "Qext = 4 Re S(0)/x^2. Inputs x and m are IEEE doubles and every reference value is for the exact "
    "binary value of those doubles (derived sizes like pi*D/lambda are first rounded to double). "
    "Outputs are the correctly rounded doubles of the 40-digit results, printed with 17 significant "
    "digits; digits40 holds the 40-significant-digit strings. terms_used = number of series terms N "
    "(n = 1..N) actually summed, started at x + 4.05 x^(1/3) + 10 and extended until the last terms "
    "are below 1e-43 relative. resonance_sensitivity (weakly absorbing cases with x >= 10) = "
    "max |Qext(x(1 +- 1e-9)) - Qext(x)| / Qext(x) with m fixed; the tag narrow_resonance is added "
    "when it exceeds 1e-5 (i.e. 1e4 times the relative change of x).")

COATED_CONVENTIONS = (
    "Coated sphere: core radius a, shell (outer) radius b; x_core = 2 pi a/lambda, x_shell = 2 pi b/lambda; "
    "m_core, m_shell relative indices [n, k]; coefficients a_n, b_n of Bohren & Huffman (1983) sec. 8.1 "
    "eq. 8.2. All efficiencies are relative to the OUTER geometric cross-section pi b^2 and use "
    "x = x_shell in the formulas below. " + CONVENTIONS)

METHOD = (
    "Mie series written from Bohren & Huffman (1983) ch. 4 (homogeneous, a_n, b_n eq. 4.53 in the "
    "form 4.88) and sec. 8.1 (coated, eq. 8.2). Riccati-Bessel functions psi_n(z) = sqrt(pi z/2) "
    "J_{n+1/2}(z), chi_n(z) = -sqrt(pi z/2) Y_{n+1/2}(z) evaluated directly, order by order, with "
    "mpmath.besselj/bessely (no recurrences in n), derivatives f_n' = f_{n-1} - n f_n/z. Bessel "
    "values at P+20 digits (P = 50, plus 2 log10(1/x) for x < 1); the algebra is repeated with the "
    "inputs rounded to P digits and must agree to 1e-41 relative, else P is raised. Angular functions "
    "pi_n, tau_n by BH's exact upward recurrence (4.47) at the same precision. mpmath version %s." %
    mpmath.__version__)


def file_object(cases_out, conventions, extra=None):
    o = {'generator': SCRIPT_NAME, 'method': METHOD, 'precision_digits': TARGET_DIGITS,
         'conventions': conventions}
    if extra:
        o.update(extra)
    o['cases'] = cases_out
    return o


# ---------------------------------------------------------------------------
# Validation against published values
# ---------------------------------------------------------------------------

PUBLISHED = [
    # (x, [n, k], {quantity: value}, source)
    (10.0, [0.75, 0.0], {'qext': 2.232265, 'qsca': 2.232265, 'g': 0.8964726}, 'Wiscombe 1979'),
    (1.0, [1.5, 1.0], {'qext': 2.336321, 'qsca': 0.6634538, 'g': 0.1921364}, 'Wiscombe 1979'),
    (100.0, [10.0, 10.0], {'qext': 2.071124, 'qsca': 1.836785, 'g': 0.5562155}, 'Wiscombe 1979'),
    (100.0, [1.33, 1e-5], {'qext': 2.101321, 'qsca': 2.096594, 'g': 0.8689593}, 'Wiscombe 1979'),
    (BH_X, [1.55, 0.0], {'qext': 3.105426, 'qsca': 3.105426, 'qback': 2.925341},
     'Bohren & Huffman 1983 appendix A'),
]


def validate(results):
    lines = []
    worst = 0.0
    for x, m, vals, src in PUBLISHED:
        hit = [r for c, r in results if c.get('x') == x and c.get('m') == m]
        if not hit:
            continue
        Q = hit[0]['Q']
        for k, v in vals.items():
            d = abs(float(Q[k]) - v) / abs(v)
            worst = max(worst, d)
            lines.append('%s x=%g m=%s %s: ours %s published %s rel.diff %.1e'
                         % (src, x, m, k, mp.nstr(Q[k], 10), v, d))
    return worst, lines


# ---------------------------------------------------------------------------

def run_cases(cases, angles_flag, do_res, label):
    out = []
    t0 = time.time()
    for i, c in enumerate(cases):
        t = time.time()
        res = evaluate(c, ANGLES if (angles_flag and c.get('angles')) else None)
        sens = None
        m = c.get('m') or c.get('m_shell')
        mc = c.get('m_core')
        size = c.get('x', c.get('x_shell'))
        weak = m[1] <= 0.01 and (mc is None or mc[1] <= 0.01)
        if do_res and weak and size >= 10:
            sens = resonance_sensitivity(c, res['Q']['qext'])
        out.append((c, res, sens))
        log('[%s %d/%d] %-45s N=%-5d P=%d Qext=%s g=%s agree=%s%s  %.1fs'
            % (label, i + 1, len(cases), c['id'], res['N'], res['Phi'], mp.nstr(res['Q']['qext'], 12),
               mp.nstr(res['Q']['g'], 10), mp.nstr(res['agree'], 2),
               '' if sens is None else ' res=%s' % mp.nstr(sens, 3), time.time() - t))
        # keep the cache small: only values at the current case's precision are reused
        clear_cache_other_prec({mpmath.libmp.dps_to_prec(res['Phi'])})
    log('%s: %d cases in %.0f s' % (label, len(cases), time.time() - t0))
    return out


def large_cases():
    """Spheres beyond x = 1000, kept apart because each takes minutes at 40 digits."""
    return [
        {'id': 'm=1.5+0i,x=1500.0', 'x': 1500.0, 'm': [1.5, 0.0], 'tags': ['large_x', 'nonabsorbing']},
        {'id': 'm=1.33+0.001i,x=1200.0', 'x': 1200.0, 'm': [1.33, 0.001], 'tags': ['large_x', 'weakly_absorbing']},
    ]


def run_large_cases():
    t_all = time.time()
    res = run_cases(large_cases(), False, False, 'large')
    recs = [case_record(c, r, s) for c, r, s in res]
    obj = file_object(recs, CONVENTIONS, {'validation': {'run_time_seconds': round(time.time() - t_all)}})
    path = os.path.join(HERE, 'sphere-reference-large.json')
    with open(path, 'w') as f:
        f.write(jdump(obj) + '\n')
    log('wrote', path)


def crosschecks(hres, cres):
    """Coated cases that must reduce to homogeneous ones."""
    lines = []
    worst = mpf(0)
    hmap = {(c['x'], tuple(c['m'])): r for c, r, s in hres}
    for c, r, s in cres:
        tags = c['tags']
        if 'equal_index' in tags:
            key = (c['x_shell'], tuple(c['m_shell']))
            scale = mpf(1)
        elif 'vacuum_shell' in tags:
            key = (c['x_core'], tuple(c['m_core']))
            scale = (mpf(c['x_core']) / mpf(c['x_shell'])) ** 2
        else:
            continue
        if key not in hmap:
            lines.append('no homogeneous partner for ' + c['id'])
            continue
        h = hmap[key]['Q']
        for k in ('qext', 'qsca', 'qback'):
            d = rel_diff(r['Q'][k], h[k] * scale)
            worst = max(worst, d)
        if 'equal_index' in tags:
            worst = max(worst, rel_diff(r['Q']['g'], h['g']))
        lines.append('%s vs homogeneous %s: ok' % (c['id'], key))
    return worst, lines


def small_g_cases():
    """Small spheres, where g ~ x^2 comes from the cancelling leading terms of b_1 and a_2."""
    C = []
    for m in ([1.53, 0.008], [1.33, 0.0], [1.5, 1.0], [1.9, 0.6], [10.0, 10.0], [0.75, 0.0]):
        for x in (1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.1):
            C.append({'id': 'm=%s%+gi,x=%s' % (repr(m[0]), m[1], repr(x)), 'x': x, 'm': m})
    return C


def run_small_g_cases():
    out = []
    for c in small_g_cases():
        res = evaluate(c)
        out.append({'x': c['x'], 'm': c['m'], 'g': Num(res['Q']['g']), 'qsca': Num(res['Q']['qsca'])})
        log('  ', c['id'], 'g =', mp.nstr(res['Q']['g'], 17))
    obj = {
        'description': 'Asymmetry parameter g and Qsca of small homogeneous spheres, 40-digit mpmath '
                       '(test/reference/make_sphere_reference.py --small-g), rounded to doubles.',
        'cases': out,
    }
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), 'sphere-small-g.json')
    with open(path, 'w') as f:
        f.write(jdump(obj) + '\n')
    log('wrote', path)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument('--only', default=None)
    ap.add_argument('--no-write', action='store_true')
    ap.add_argument('--no-resonance', action='store_true')
    ap.add_argument('--skip-coated', action='store_true')
    ap.add_argument('--small-g', action='store_true',
                    help='only g and Qsca of small spheres (x 1e-6 to 0.1), written to sphere-small-g.json (seconds)')
    ap.add_argument('--large', action='store_true',
                    help='only the cases beyond x = 1000 (slow: minutes each), written to sphere-reference-large.json')
    args = ap.parse_args()
    t_all = time.time()
    # default precision for everything done outside evaluate() (checks, comparisons)
    mp.dps = TARGET_DIGITS + GUARD_DIGITS + 40

    bt = selftest_bessel()
    log('self-test: mpmath Bessel vs closed-form spherical Hankel, worst rel. error', mp.nstr(bt, 3))
    if bt > mpf(10) ** -(TARGET_DIGITS + 5):
        raise SystemExit('Bessel self-test failed')
    _rb_cache.clear()

    if args.large:
        run_large_cases()
        return
    if args.small_g:
        run_small_g_cases()
        return
    H = homog_cases()
    Wt = water_cases()
    Ct = [] if args.skip_coated else coated_cases()
    if args.only:
        H = [c for c in H if args.only in c['id']]
        Wt = [c for c in Wt if args.only in c['id']]
        Ct = [c for c in Ct if args.only in c['id']]
        args.no_write = True

    hres = run_cases(H, True, not args.no_resonance, 'sphere')
    wres = run_cases(Wt, True, not args.no_resonance, 'water')
    cres = run_cases(Ct, True, not args.no_resonance, 'coated')

    vworst, vlines = validate([(c, r) for c, r, s in hres])
    for l in vlines:
        log('  ' + l)
    log('published-value check: worst rel. diff %.1e' % vworst)
    if vlines and vworst > 5e-7:
        raise SystemExit('disagreement with published values: formula error')
    xworst, xlines = crosschecks(hres, cres)
    for l in xlines:
        log('  ' + l)
    log('coated/homogeneous reduction check: worst rel. diff %s' % mp.nstr(xworst, 3))
    if xlines and xworst > mpf(10) ** -(TARGET_DIGITS - 2):
        raise SystemExit('coated reduction check failed')

    elapsed = time.time() - t_all
    log('total time %.0f s' % elapsed)
    if args.no_write:
        return

    validation = {
        'bessel_selftest_worst_rel_error': mp.nstr(bt, 3),
        'published_values': vlines,
        'published_worst_rel_diff': '%.1e' % vworst,
        'coated_to_homogeneous_worst_rel_diff': mp.nstr(xworst, 3),
        'run_time_seconds': round(elapsed),
    }
    hs = [case_record(c, r, s) for c, r, s in hres]
    ws = [case_record(c, r, s) for c, r, s in wres]
    cs = [case_record(c, r, s) for c, r, s in cres]
    files = [
        ('sphere-reference.json', file_object(hs, CONVENTIONS, {'validation': validation})),
        ('water-droplets.json', file_object(ws, CONVENTIONS, {
            'description': 'Water droplets in air at wavelength 0.55 um, x = pi D / lambda, '
                           'm = 1.333 + 1.96e-9 i',
            'index_source': 'Hale & Querry (1973), Appl. Opt. 12:555 (from memory)'})),
        ('coated-reference.json', file_object(cs, COATED_CONVENTIONS, {
            'validation': {'coated_to_homogeneous_worst_rel_diff': mp.nstr(xworst, 3),
                           'checks': xlines}})),
    ]
    for name, obj in files:
        path = os.path.join(HERE, name)
        with open(path, 'w') as f:
            f.write(jdump(obj) + '\n')
        json.load(open(path))   # must parse
        log('wrote', path)


if __name__ == '__main__':
    main()
