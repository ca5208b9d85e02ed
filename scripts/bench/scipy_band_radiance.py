"""Band radiance by scipy.integrate.quad, for the engine benchmark (scripts/bench/engine.ts).

Reads JSON on stdin: {"c1LUm": W·µm⁴·m⁻²·sr⁻¹, "c2UmK": µm·K, "epsrel": float, "minSeconds": float,
"groups": [{"name": str, "cases": [[λ1 µm, λ2 µm, T K], ...]}, ...]}.
Integrates Planck's law c1L·λ⁻⁵/(exp(c2/(λT)) − 1) over each band with
scipy.integrate.quad(epsabs=0, epsrel=epsrel), repeating each group until minSeconds have passed,
and writes JSON on stdout: {"scipy": version, "groups": [{"name", "secondsPerCall", "values"}]}.
"""
import json
import math
import sys
import time

import scipy
from scipy.integrate import quad


def main():
    req = json.load(sys.stdin)
    c1 = req["c1LUm"]
    c2 = req["c2UmK"]
    epsrel = req["epsrel"]
    min_seconds = req["minSeconds"]

    def planck(lam, t):
        return c1 / lam**5 / math.expm1(c2 / (lam * t))

    out = []
    for g in req["groups"]:
        cases = g["cases"]
        values = [quad(planck, l1, l2, args=(t,), epsabs=0, epsrel=epsrel)[0] for l1, l2, t in cases]
        calls = 0
        t0 = time.perf_counter()
        while True:
            for l1, l2, t in cases:
                quad(planck, l1, l2, args=(t,), epsabs=0, epsrel=epsrel)
            calls += len(cases)
            elapsed = time.perf_counter() - t0
            if elapsed >= min_seconds:
                break
        out.append({"name": g["name"], "secondsPerCall": elapsed / calls, "values": values})
    json.dump({"scipy": scipy.__version__, "groups": out}, sys.stdout)


if __name__ == "__main__":
    main()
