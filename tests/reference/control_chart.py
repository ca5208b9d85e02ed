"""Reference values for tests/unit/quality/controlChart.test.ts.

Individuals-chart limits computed independently with numpy (numpy.mean, numpy.std with ddof=1,
numpy.diff) for:
  1. the NIST/SEMATECH e-Handbook of Statistical Methods 6.3.2.2 example (10 batches of flow rate),
     whose published answer is x̄ = 50.81, MR̄ = 1.8778, UCL = 55.8041, LCL = 45.8159;
  2. a check-standard series made up for the test (errors of a check instrument on a blackbody, K).
Run: python3 tests/reference/control_chart.py   (numpy 2.4.6 here)
"""
import numpy as np

D2 = 1.128  # d2 for moving ranges of two, as tabulated in the e-Handbook


def limits(x, method):
    x = np.asarray(x, dtype=float)
    mean = np.mean(x)
    s = np.std(x, ddof=1)
    mr = np.mean(np.abs(np.diff(x)))
    sigma = s if method == "standard-deviation" else mr / D2
    return dict(centre=mean, s=s, mrBar=mr, sigma=sigma,
                warningLower=mean - 2 * sigma, warningUpper=mean + 2 * sigma,
                actionLower=mean - 3 * sigma, actionUpper=mean + 3 * sigma)


nist = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1]
check = [0.12, 0.08, 0.15, 0.10, 0.05, 0.11, 0.14, 0.09, 0.07, 0.13, 0.10, 0.06]

for name, data in (("nist", nist), ("check", check)):
    for method in ("standard-deviation", "moving-range"):
        r = limits(data, method)
        print(name, method, {k: float(f"{v:.15g}") for k, v in r.items()})
