"""Reference values for tests/unit/quality/intervals.test.ts (drift method).

Straight-line fit of as-found deviations d(t) = a + b*t, t in years (365.25 days) from the last
calibration, computed independently with
  - numpy.polyfit(t, d, 1, w=1/u, cov='unscaled')   weighted fit, covariance (X'WX)^-1
  - numpy.polyfit(t, d, 1, cov=True)                ordinary fit, covariance scaled by RSS/(n-2);
                                                    its residual standard deviation sqrt(RSS/(n-2))
  - scipy.optimize.curve_fit(..., sigma=u, absolute_sigma=True)   cross-check of the weighted fit
and the interval limit D* where |a + b*D| + k*sqrt(Var a + 2D Cov + D^2 Var b + u_m^2) = TL with
  - scipy.optimize.brentq(xtol=1e-14)
then the largest whole calendar month m with the condition true on the date m months after the
last calibration (month arithmetic as shared/registers/dates.ts addMonths: day clamped to the end
of a shorter month).
Run: python3 tests/reference/drift_interval.py   (numpy 2.4.6, scipy 1.17.1 here)
"""
import calendar
import datetime as dt
import math

import numpy as np
from scipy.optimize import brentq, curve_fit


def d(s):
    return dt.date.fromisoformat(s)


def add_months(s, m):
    x = d(s)
    total = x.year * 12 + (x.month - 1) + m
    y, mo = divmod(total, 12)
    day = min(x.day, calendar.monthrange(y, mo + 1)[1])
    return dt.date(y, mo + 1, day).isoformat()


def years(origin, s):
    return (d(s) - d(origin)).days / 365.25


def analyse(name, hist, TL, k, max_months, weighting="weighted", um=None):
    hist = sorted(hist)
    origin = hist[-1][0]
    t = np.array([years(origin, h[0]) for h in hist])
    y = np.array([h[1] for h in hist])
    u = np.array([h[2] for h in hist])
    if weighting == "weighted":
        p, cov = np.polyfit(t, y, 1, w=1 / u, cov="unscaled")
        popt, pcov = curve_fit(lambda x, a, b: a + b * x, t, y, sigma=u, absolute_sigma=True)
        assert abs(popt[0] - p[1]) < 1e-9 and abs(popt[1] - p[0]) < 1e-9  # curve_fit: numerical Jacobian
        assert np.allclose(pcov[::-1, ::-1], cov, rtol=1e-6, atol=0)
    else:
        p, cov = np.polyfit(t, y, 1, cov=True)
    b, a = p
    vb, cab, va = cov[0, 0], cov[0, 1], cov[1, 1]
    # ordinary fit: residual standard deviation s = sqrt(RSS/(n - 2)), the scale numpy applies to its covariance
    rsd = float(np.sqrt(np.sum((y - np.polyval(p, t)) ** 2) / (len(t) - 2))) if weighting == "ordinary" else None
    um = u[-1] if um is None else um

    def f(D):
        return abs(a + b * D) + k * math.sqrt(va + 2 * D * cab + D * D * vb + um ** 2)

    ymax = years(origin, add_months(origin, max_months))
    if f(ymax) <= TL:
        Dstar, months = None, max_months
    else:
        Dstar = brentq(lambda D: f(D) - TL, 0.0, ymax, xtol=1e-14)
        months = max(m for m in range(0, max_months + 1) if f(years(origin, add_months(origin, m))) <= TL)
    print(name, dict(weighting=weighting, intercept=float(f"{a:.15g}"), slopePerYear=float(f"{b:.15g}"),
                     varA=float(f"{va:.15g}"), covAB=float(f"{cab:.15g}"), varB=float(f"{vb:.15g}"),
                     residualSD=None if rsd is None else float(f"{rsd:.15g}"),
                     limitYears=None if Dstar is None else float(f"{Dstar:.15g}"), months=months,
                     dueDate=add_months(origin, months)))


# 1. exact drift 0.1 K/yr, u = 0.1 K, TL = 1 K, k = 2 (hand-computed closed form in the test)
exact = [("2016-01-01", -0.6, 0.1), ("2020-01-01", -0.2, 0.1), ("2024-01-01", 0.2, 0.1)]
analyse("exact", exact, 1.0, 2.0, 120)
print("exact closed form D* =", (408 - math.sqrt(52224)) / 42)

# 2. irregular dates, unequal u (a made-up history of a reference thermometer, K)
irregular = [("2019-03-14", 0.05, 0.08), ("2020-02-27", 0.11, 0.06), ("2021-03-02", 0.16, 0.06),
             ("2022-02-15", 0.27, 0.10), ("2023-03-09", 0.30, 0.05), ("2024-02-20", 0.38, 0.05)]
analyse("irregular", irregular, 0.8, 2.0, 120)
analyse("irregular", irregular, 0.8, 2.0, 120, weighting="ordinary")

# 3. drift towards zero, then through it
towards = [("2016-01-01", 0.6, 0.1), ("2020-01-01", 0.4, 0.1), ("2024-01-01", 0.2, 0.1)]
analyse("towards", towards, 1.0, 2.0, 180)
print("towards closed form D* =", (312 - math.sqrt(57984)) / 6)

# 4. no drift
flat = [("2020-01-01", 0.3, 0.1), ("2024-01-01", 0.3, 0.1)]
analyse("flat", flat, 1.0, 2.0, 120)
print("flat closed form D* =", math.sqrt(86) - 2)
