#!/usr/bin/env python3
"""Independent reference values for the ratio (two-colour) pyrometer model (shared/radiometry/ratio.ts).

Model (domain notes, section 7):
    S_i = eps_i * L_i(T_s) + (1 - eps_i) * L_i(T_w),   L_1(T_R) / L_2(T_R) = (S_1 / S_2) / k

Band radiance L_i(T) = integral of R_i(lambda) * Planck(lambda, T) d lambda, by scipy.integrate.quad
(epsabs=0, epsrel=1e-12); a tabulated band (piecewise-linear responsivity, zero outside the table) is
integrated segment by segment with the same linear R. The ratio equation is solved by
scipy.optimize.brentq on ln L_1(T) - ln L_2(T) - ln((S_1/S_2)/k) over [50 K, 5000 K]
(xtol=1e-12, rtol=1e-15).

Also: the single-band reading of a 0.95-1.05 um instrument with emissivity setting 1, solving
L(T_m) = eps_s L(T_s) + (1 - eps_s) L(T_w) by brentq (same tolerances).

Constants: CODATA 2018 / SI 2019 exact h, c, k (c1L = 2hc^2, c2 = hc/k).
Run: python3 tests/reference/ratio_pyrometer.py   (scipy 1.17.1, numpy 2.4.6 when the values were made)
"""
import math

import scipy
from scipy.integrate import quad
from scipy.optimize import brentq

H = 6.62607015e-34
C = 299792458.0
K = 1.380649e-23
C1L_UM = 2 * H * C * C * 1e24  # W um^4 m^-2 sr^-1: spectral radiance per um with lambda in um
C2_UM = H * C / K * 1e6  # um K


def planck(lam_um, t):
    return C1L_UM / (lam_um ** 5 * math.expm1(C2_UM / (lam_um * t)))


def band_radiance(band, t):
    if band[0] == 'rect':
        _, l1, l2 = band
        v, _ = quad(planck, l1, l2, args=(t,), epsabs=0, epsrel=1e-12, limit=200)
        return v
    pts = band[1]
    s = 0.0
    for (la, ra), (lb, rb) in zip(pts[:-1], pts[1:]):
        slope = (rb - ra) / (lb - la)
        f = lambda l, la=la, ra=ra, slope=slope: (ra + slope * (l - la)) * planck(l, t)
        v, _ = quad(f, la, lb, epsabs=0, epsrel=1e-12, limit=200)
        s += v
    return s


def ratio_reading(b1, b2, ts, e1, e2, tw, k):
    s1 = e1 * band_radiance(b1, ts) + (1 - e1) * band_radiance(b1, tw)
    s2 = e2 * band_radiance(b2, ts) + (1 - e2) * band_radiance(b2, tw)
    target = math.log(s1) - math.log(s2) - math.log(k)
    g = lambda t: math.log(band_radiance(b1, t)) - math.log(band_radiance(b2, t)) - target
    return brentq(g, 50.0, 5000.0, xtol=1e-12, rtol=1e-15, maxiter=500)


def single_band_reading(band, ts, es, tw):
    target = es * band_radiance(band, ts) + (1 - es) * band_radiance(band, tw)
    return brentq(lambda t: band_radiance(band, t) - target, 50.0, 5000.0, xtol=1e-12, rtol=1e-15, maxiter=500)


BANDS = {
    'A1': ('rect', 0.95, 1.00),
    'A2': ('rect', 1.00, 1.05),
    'B1': ('rect', 0.75, 0.85),
    'B2': ('rect', 0.95, 1.05),
    'C1': ('rect', 1.5, 1.6),
    'C2': ('rect', 2.0, 2.4),
    'T1': ('tab', [(0.85, 0.0), (0.9, 0.6), (0.95, 1.0), (1.0, 0.7), (1.02, 0.0)]),
    'T2': ('tab', [(1.02, 0.0), (1.05, 0.5), (1.1, 1.0), (1.15, 0.8), (1.2, 0.0)]),
}

# (pair, T_s K, eps1, eps2, T_w K, k)
CASES = [
    ('A', 1273.15, 0.9, 0.9, 296.15, 1.0),
    ('A', 1273.15, 0.9, 0.85, 296.15, 1.0),
    ('A', 1273.15, 0.9, 0.85, 296.15, 0.95),
    ('A', 1273.15, 0.9, 0.9, 296.15, 1.05),
    ('A', 700.0, 0.6, 0.7, 296.15, 1.0),
    ('A', 2500.0, 0.35, 0.4, 300.0, 0.95),
    ('B', 1000.0, 0.8, 0.8, 296.15, 1.05),
    ('B', 1800.0, 0.4, 0.3, 800.0, 1.0),
    ('B', 1800.0, 0.4, 0.3, 800.0, 1.3),
    ('C', 700.0, 0.95, 0.9, 296.15, 1.05),
    ('C', 700.0, 0.7, 0.7, 500.0, 1.0),
    ('C', 1273.15, 0.5, 0.6, 296.15, 0.95),
    ('T', 1000.0, 0.9, 0.9, 296.15, 1.0),
    ('T', 1273.15, 0.85, 0.9, 296.15, 1.05),
    ('T', 1800.0, 0.3, 0.25, 900.0, 0.95),
    ('T', 2500.0, 0.6, 0.55, 296.15, 1.0),
]

if __name__ == '__main__':
    print(f'# scipy {scipy.__version__}')
    print('# ratio readings T_R, K: [pair, T_s, eps1, eps2, T_w, k, T_R]')
    for pair, ts, e1, e2, tw, k in CASES:
        tr = ratio_reading(BANDS[pair + '1'], BANDS[pair + '2'], ts, e1, e2, tw, k)
        print(f"  ['{pair}', {ts}, {e1}, {e2}, {tw}, {k}, {tr:.9f}],")
    print('# single band 0.95-1.05 um, emissivity setting 1, T_s = 1273.15 K: [eps_s, T_w, T_m - T_s]')
    for es in (0.999, 0.995, 0.95):
        for tw in (296.15, 1000.0):
            tm = single_band_reading(BANDS['B2'], 1273.15, es, tw)
            print(f'  [{es}, {tw}, {tm - 1273.15:.9f}],')
