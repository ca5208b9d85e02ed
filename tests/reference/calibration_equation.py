#!/usr/bin/env python3
"""Independent reference values for the calibration equation (shared/radiometry/calibrationEquation.ts).

Weighted least squares of T_i = f(R_i; p) with the points' standard uncertainties u_i = U_i/k_i
("absolute sigma": the covariance is not rescaled by chi^2/nu):
- straight line f = a + b R: numpy.polyfit(R, T, 1, w=1/u, cov='unscaled');
- Sakuma-Hattori form f = c2/(A ln(C/s(R) + 1)) - B/A, s(R) = 1/(exp(c2/(A_n R + B_n)) - 1), with
  A_n = l0 (1 - 6 sd^2/l0^2), B_n = c2 sd^2/(2 l0^2) of the rectangular band 0.8-1.0 um (l0 = 0.9 um,
  sd = 0.2/sqrt(12) um): scipy.optimize.curve_fit(..., sigma=u, absolute_sigma=True, method='lm',
  xtol=ftol=gtol=1e-15) in the parameters (A, B, ln C), with sigma given as the 2-D covariance matrix
  D K D for correlated points; the covariance is then transformed to (A, B, C).
Interpolated values: at a reading R, T = f(R) and u = sqrt(g^T V g), g = df/dp (written out below:
[1, R] for the line; for Sakuma-Hattori df/dA = -f/A, df/dB = -1/A, df/dC = -c2/(A lg^2 (s + C)),
lg = ln(1 + C/s)); at a reference temperature T, R from scipy.optimize.brentq(f(R) - T)
(xtol=1e-13) and u = sqrt(g^T V g)/|df/dR|, df/dR by a central difference (h = 1e-3 K).
Constants: c2 = hc/k from the exact SI (CODATA 2018) h, c, k.
Run: python3 tests/reference/calibration_equation.py   (numpy 2.4.6, scipy 1.17.1 when the values were made)
"""
import math

import numpy as np
import scipy
from scipy.optimize import brentq, curve_fit

H = 6.62607015e-34
C = 299792458.0
K = 1.380649e-23
C2 = H * C / K * 1e6  # um K

L0 = 0.9
SD2 = 0.2 ** 2 / 12
AN = L0 * (1 - 6 * SD2 / L0 ** 2)
BN = C2 * SD2 / (2 * L0 ** 2)


def s_of_r(r):
    return 1.0 / np.expm1(C2 / (AN * r + BN))


def f_sh(r, a, b, lnc):
    return C2 / (a * np.log1p(np.exp(lnc) / s_of_r(r))) - b / a


def jac_sh(r, a, b, lnc):
    s = s_of_r(r)
    cc = math.exp(lnc)
    lg = np.log1p(cc / s)
    f = C2 / (a * lg) - b / a
    return np.column_stack([-f / a, -np.ones_like(r) / a, -C2 / (a * lg ** 2) * cc / (s + cc)])


def grad_sh(r, a, b, c):
    s = s_of_r(r)
    lg = np.log1p(c / s)
    f = C2 / (a * lg) - b / a
    return np.array([-f / a, -1 / a, -C2 / (a * lg ** 2 * (s + c))])


def grad_line(r, a, b):
    return np.array([1.0, r])


def report(name, fun, grad, p, V, readings, references, chi2):
    print(f'# {name}')
    print('  parameters:', ', '.join(f'{v:.12e}' for v in p))
    print('  covariance:')
    for row in V:
        print('    [' + ', '.join(f'{v:.10e}' for v in row) + '],')
    print(f'  chi2: {chi2:.10e}')
    print('  at readings [R, T, u]:')
    for r in readings:
        g = grad(r, *p)
        print(f'    [{r}, {fun(r, *p):.9f}, {math.sqrt(g @ V @ g):.9e}],')
    print('  at reference temperatures [T, R, u]:')
    for t in references:
        r = brentq(lambda x: fun(x, *p) - t, t - 50, t + 50, xtol=1e-13, rtol=1e-15)
        g = grad(r, *p)
        h = 1e-3
        dfdr = (fun(r + h, *p) - fun(r - h, *p)) / (2 * h)
        print(f'    [{t}, {r:.9f}, {math.sqrt(g @ V @ g) / abs(dfdr):.9e}],')


def fit_sh(name, R, T, U, k, corr, readings, references):
    R = np.array(R); T = np.array(T); u = np.array(U) / np.array(k)
    sigma = u if corr is None else np.outer(u, u) * np.array(corr)
    popt, pcov = curve_fit(f_sh, R, T, p0=[AN, BN, 0.0], sigma=sigma, absolute_sigma=True, method='lm',
                           jac=jac_sh, xtol=1e-15, ftol=1e-15, gtol=1e-15, maxfev=10000)
    a, b, lnc = popt
    Tm = np.diag([1.0, 1.0, math.exp(lnc)])
    V = Tm @ pcov @ Tm
    p = [a, b, math.exp(lnc)]
    res = T - f_sh(R, *popt)
    cov_y = np.diag(u ** 2) if corr is None else sigma
    chi2 = float(res @ np.linalg.solve(cov_y, res))
    fun = lambda r, a, b, c: f_sh(r, a, b, math.log(c))
    report(name, fun, grad_sh, p, V, readings, references, chi2)


def fit_line(name, R, T, U, k, readings, references):
    R = np.array(R); T = np.array(T); u = np.array(U) / np.array(k)
    coef, cov = np.polyfit(R, T, 1, w=1 / u, cov='unscaled')
    b, a = coef
    V = np.array([[cov[1, 1], cov[1, 0]], [cov[0, 1], cov[0, 0]]])  # order (a, b)
    res = T - (a + b * R)
    report(name, lambda r, a, b: a + b * r, grad_line, [a, b], V, readings, references, float(np.sum((res / u) ** 2)))


if __name__ == '__main__':
    print(f'# numpy {np.__version__}, scipy {scipy.__version__}; A_n = {AN:.15e} um, B_n = {BN:.15e} um K')
    fit_line('linear, 3 points (hand case)', [400, 500, 600], [400.5, 500.2, 600.4], [1, 1, 1], [2, 2, 2],
             [400, 450, 500, 600], [400.5, 500.3])
    fit_line('linear, 5 points', [300, 350, 400, 450, 500], [300.42, 350.31, 400.35, 450.12, 500.05],
             [0.3, 0.3, 0.4, 0.5, 0.6], [2, 2, 2, 2, 2], [300, 333.3, 420, 500], [310, 480])
    R5 = [872.40, 1072.10, 1271.65, 1471.20, 1670.90]
    T5 = [873.15, 1073.15, 1273.15, 1473.15, 1673.15]
    U5 = [1.6, 2.0, 2.4, 3.0, 3.6]
    k5 = [2, 2, 2.1, 2, 2.2]
    rd = [872.40, 950, 1173.15, 1400, 1670.90]
    rf = [900, 1173.15, 1600]
    fit_sh('sakuma-hattori, 5 points, uncorrelated', R5, T5, U5, k5, None, rd, rf)
    corr = [[1.0 if i == j else 0.4 for j in range(5)] for i in range(5)]
    fit_sh('sakuma-hattori, 5 points, correlation 0.4', R5, T5, U5, k5, corr, rd, rf)
    fit_sh('sakuma-hattori, 3 points', [R5[0], R5[1], R5[4]], [T5[0], T5[1], T5[4]], [U5[0], U5[1], U5[4]],
           [k5[0], k5[1], k5[4]], None, rd + [1072.10], rf)
