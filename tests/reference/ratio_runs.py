#!/usr/bin/env python3
"""Independent reference values for the ratio-pyrometer runs of tests/api/kinds.test.ts and tests/e2e/kinds.test.ts.

The same model and numerical methods as tests/reference/ratio_pyrometer.py (imported from it): band
radiance by scipy.integrate.quad (epsabs=0, epsrel=1e-12), the ratio equation
ln L_1(T) - ln L_2(T) = ln((S_1/S_2)/k) solved by scipy.optimize.brentq on [50 K, 5000 K]
(xtol=1e-12, rtol=1e-15), CODATA 2018 constants.

The runs' inputs (invented for the tests):
- ratio pyrometer, band 1 0.95-1.00 um, band 2 1.00-1.05 um (rectangular);
- a cavity whose emissivity table is linear from 0.92 at 0.6 um to 0.87 at 1.1 um, so that the mean over
  each band (what shared/calibration/setup.ts takes) is its value at the band's middle: eps_1 = 0.8825 at
  0.975 um, eps_2 = 0.8775 at 1.025 um;
- certificate corrections +0.4 K at 1073.15 K and +0.6 K at 1273.15 K (source temperatures 1073.55 K and
  1273.75 K at those set-points); surroundings 296.15 K; ratio setting k = 1.02 (API test) and k = 1
  (browser test, at the 1273.15 K set-point).
Run: python3 tests/reference/ratio_runs.py   (scipy 1.17.1 when the values were made)
"""
import scipy

from ratio_pyrometer import BANDS, ratio_reading

A1, A2 = BANDS['A1'], BANDS['A2']


def eps_at(lam_um):
    return 0.92 + (0.87 - 0.92) * (lam_um - 0.6) / (1.1 - 0.6)


CASES = [
    # (label, T_s K, eps1, eps2, T_w K, k)
    ('api 1073.15 set-point', 1073.55, eps_at(0.975), eps_at(1.025), 296.15, 1.02),
    ('api 1273.15 set-point', 1273.75, eps_at(0.975), eps_at(1.025), 296.15, 1.02),
    ('e2e 1273.15 set-point, k = 1', 1273.75, eps_at(0.975), eps_at(1.025), 296.15, 1.0),
]

if __name__ == '__main__':
    print(f'# scipy {scipy.__version__}')
    print('# [label, T_s, eps1, eps2, T_w, k, T_R (K), T_R - T_s (K)]')
    for label, ts, e1, e2, tw, k in CASES:
        tr = ratio_reading(A1, A2, ts, e1, e2, tw, k)
        print(f"  ['{label}', {ts}, {e1:.6f}, {e2:.6f}, {tw}, {k}, {tr:.9f}, {tr - ts:.9f}],")
