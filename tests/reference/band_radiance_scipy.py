"""Reference band radiances for tests/unit/radiometry/bandIntegral.test.ts.

Integrates Planck's law L(λ,T) = c1L·λ⁻⁵/(exp(c2/(λT)) − 1) over rectangular bands with
scipy.integrate.quad (QUADPACK QAGS, epsabs=0, epsrel=1e-13, limit=200) and prints TypeScript rows
[λ1 µm, λ2 µm, T K, S W·m⁻²·sr⁻¹, quad's error estimate]. Constants: CODATA 2018 (exact h, c, k).
Run: python3 tests/reference/band_radiance_scipy.py   (scipy 1.17)
"""
import math

import scipy
from scipy.integrate import quad

H = 6.62607015e-34
C = 299792458.0
K = 1.380649e-23
C1L_UM = 2 * H * C * C * 1e24  # W·µm⁴·m⁻²·sr⁻¹
C2_UM = H * C / K * 1e6  # µm·K


def planck_um(lam_um, t):
    return C1L_UM / lam_um**5 / math.expm1(C2_UM / (lam_um * t))


CASES = [
    (0.645, 0.655, 80.0), (0.645, 0.655, 1234.93), (0.645, 0.655, 5000.0),
    (0.95, 1.05, 300.0), (0.95, 1.05, 2000.0),
    (1.5, 1.7, 150.0), (1.5, 1.7, 1000.0),
    (2.0, 2.4, 500.0), (3.8, 4.0, 900.0),
    (8.0, 14.0, 50.0), (8.0, 14.0, 273.15), (8.0, 14.0, 373.15), (8.0, 14.0, 5000.0),
    (0.65, 14.0, 60.0), (0.65, 14.0, 3000.0),
]

print(f"// scipy {scipy.__version__}: quad(epsabs=0, epsrel=1e-13, limit=200)")
for l1, l2, t in CASES:
    val, err = quad(planck_um, l1, l2, args=(t,), epsabs=0, epsrel=1e-13, limit=200)
    print(f"  [{l1!r}, {l2!r}, {t!r}, {val!r}, {err:.1e}],")
