"""Reference values for check values that the tests used to quote from memory.

Each block computes, independently of Bandlight, a value that a published table states, prints the
value the tests compare with, and shows that the published (recalled) entry is that value rounded to
the table's digits. Nothing here is run by the tests (CI has no scipy); the printed values are pasted
into the TypeScript tests with a comment naming this script.

  1. Blackbody fraction F(0→λT) (the "blackbody radiation functions" table of heat-transfer handbooks,
     e.g. Incropera, Fundamentals of Heat and Mass Transfer, Table 12.x):
     F = (15/π⁴)·∫_x^∞ t³/(eᵗ − 1) dt with x = c2/(λT), c2 = hc/k from the exact SI values of
     h, c, k (CODATA 2018); scipy.integrate.quad(epsabs=0, epsrel=1e-13, limit=200).
  2. Coverage factors of JCGM 100:2008 (GUM) Table G.2: t_p(ν) = scipy.stats.t.ppf((1 + p)/2, ν),
     and scipy.stats.norm.ppf((1 + p)/2) for ν = ∞.
  3. Standard normal distribution function Φ(z) (Abramowitz & Stegun, Table 26.1):
     scipy.stats.norm.cdf, and the 97.5 % point scipy.stats.norm.ppf(0.975).

Run: python3 tests/reference/published_tables.py   (scipy 1.17)
"""
import math

import scipy
from scipy.integrate import quad
from scipy.stats import norm, t

H = 6.62607015e-34
C = 299792458.0
K = 1.380649e-23
C2_UMK = H * C / K * 1e6  # second radiation constant, µm·K

print(f"# scipy {scipy.__version__}")

print("\n# 1. blackbody fraction F(0→λT), CODATA 2018 c2 =", repr(C2_UMK), "µm·K")
print("#    [λT µm·K, F from quad, quad's error estimate, handbook entry (recalled), F − handbook]")
HANDBOOK_F = {2898.0: 0.2501, 6000.0: 0.7378, 10000.0: 0.9142}
for lt, book in HANDBOOK_F.items():
    x = C2_UMK / lt
    val, err = quad(lambda u: u**3 * math.exp(-u) / -math.expm1(-u), x, math.inf, epsabs=0, epsrel=1e-13, limit=200)
    f = 15 / math.pi**4 * val
    print(f"  [{lt!r}, {f!r}, {15 / math.pi**4 * err:.1e}, {book}, {f - book:+.1e}]")

print("\n# 2. GUM Table G.2 coverage factors t_p(ν) = t.ppf((1 + p)/2, ν); ν = None is ∞ (norm.ppf)")
print("#    [ν, p, scipy value, published entry (recalled), entry == scipy rounded to its digits]")
G2 = [  # (ν, p, published entry)
    (1, 0.9545, '13.97'), (2, 0.9545, '4.53'), (3, 0.9545, '3.31'), (4, 0.9545, '2.87'), (5, 0.9545, '2.65'),
    (10, 0.9545, '2.28'), (20, 0.9545, '2.13'), (50, 0.9545, '2.05'), (None, 0.9545, '2.00'),
    (1, 0.99, '63.66'), (10, 0.99, '3.17'), (None, 0.99, '2.576'),
    (1, 0.6827, '1.84'),
    (1, 0.95, '12.71'), (None, 0.95, '1.960'),
]
for nu, p, entry in G2:
    q = (1 + p) / 2
    k = float(norm.ppf(q)) if nu is None else float(t.ppf(q, nu))
    digits = len(entry.split('.')[1])
    print(f"  [{'null' if nu is None else nu}, {p}, {k!r}, '{entry}', {f'{k:.{digits}f}' == entry}]")

print("\n# 3. Φ(z) = norm.cdf(z) and the 97.5 % point; [z, Φ(z), A&S entry (recalled, 10 decimals), equal when rounded]")
AS = {1.0: '0.8413447461', 2.0: '0.9772498681', 3.0: '0.9986501020'}
for z, entry in AS.items():
    v = float(norm.cdf(z))
    print(f"  [{z}, {v!r}, '{entry}', {f'{v:.10f}' == entry}]")
print("  norm.ppf(0.975) =", repr(float(norm.ppf(0.975))))
