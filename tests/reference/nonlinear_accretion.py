#!/usr/bin/env python3
"""Independent implementation of Hakiel's nonlinear accretion model (Hakiel, TAPPI J. 70(5):113,
1987) with Pfeiffer's radial stiffness law (TAPPI 49(8):342, 1966): per-layer increments, each a
finite-difference boundary-value problem assembled as a banded matrix and solved with LAPACK
through scipy.linalg.solve_banded. The modulus of each increment is the secant modulus of the
Pfeiffer law over the increment, iterated to convergence (starting from the tangent modulus),
plus the explicit (tangent at the start) variant for the core pressure.

Discretisation (the same scheme the Rust solver documents in docs/theory.md): node j is wrap j
at r = rc + j*h; wrap j is added as a Dirichlet load d(r_j) = -WIT_j / r_j on nodes 0..j; rows
r^2 d'' + 3 r d' + (1 - Et/Er) d = 0 with central differences; the core condition
r d' = (Et/Ec - 1 + nu) d through a ghost node. Tangential stress starts at WIT/h and gains
d + r d' from later wraps. The finished profile ends with the outer surface (pressure 0).

Writes nonlinear_accretion.json; `--check` recomputes and compares with the committed file.
"""
import json
import math
import sys
from pathlib import Path

import numpy as np
from scipy.linalg import solve_banded

HERE = Path(__file__).resolve().parent
OUT = HERE / "nonlinear_accretion.json"

CASES = [
    {
        # Soft paper-like web on a hollow fibre core (Lame: Ec = E/((b^2+a^2)/(b^2-a^2) - nu)).
        "name": "paper_hollow_core",
        "core_radius": 0.0508, "thickness": 76e-6, "layers": 500,
        "tangential_modulus": 5.0e9, "k1": 5.0e3, "k2": 50.0, "poisson_ratio": 0.01,
        "core": {"kind": "hollow", "inner_radius": 0.0381, "outer_radius": 0.0508,
                 "modulus": 3.0e9, "poisson_ratio": 0.3},
        "tension": 350.0, "taper": None, "upsets": [],
    },
    {
        # Stiff film on a rigid core.
        "name": "film_rigid_core",
        "core_radius": 0.0762, "thickness": 23e-6, "layers": 600,
        "tangential_modulus": 4.5e9, "k1": 1.0e4, "k2": 300.0, "poisson_ratio": 0.01,
        "core": {"kind": "rigid"},
        "tension": 175.0, "taper": None, "upsets": [],
    },
    {
        # Linear 30 % taper with a high-tension upset band, measured core stiffness.
        "name": "tapered_with_upset",
        "core_radius": 0.05, "thickness": 100e-6, "layers": 500,
        "tangential_modulus": 4.0e9, "k1": 2.0e4, "k2": 80.0, "poisson_ratio": 0.01,
        "core": {"kind": "measured", "stiffness": 5.0e8},
        "tension": 300.0, "taper": {"kind": "linear", "fraction": 0.3},
        "upsets": [{"from_radius": 0.075, "to_radius": 0.0775, "tension": 500.0}],
    },
]


def core_stiffness(core):
    if core["kind"] == "rigid":
        return math.inf
    if core["kind"] == "measured":
        return core["stiffness"]
    a, b = core["inner_radius"], core["outer_radius"]
    return core["modulus"] / ((b * b + a * a) / (b * b - a * a) - core["poisson_ratio"])


def tension_at(case, r, rc, outer):
    t = case["tension"]
    taper = case["taper"]
    if taper and taper["kind"] == "linear":
        t = t * (1.0 - taper["fraction"] * (r - rc) / (outer - rc))
    for band in case["upsets"]:
        if band["from_radius"] <= r < band["to_radius"]:
            t = band["tension"]
    return t


def secant_modulus(k1, k2, p, dp):
    x = dp / (k1 + p)
    if abs(x) < 1e-9:
        return k2 * (k1 + p + 0.5 * dp)
    return k2 * dp / math.log1p(x)


def solve_case(case, update="secant"):
    rc, h, n = case["core_radius"], case["thickness"], case["layers"]
    et, k1, k2, nu = case["tangential_modulus"], case["k1"], case["k2"], case["poisson_ratio"]
    ec = core_stiffness(case["core"])
    c_core = (0.0 if math.isinf(ec) else et / ec) - 1.0 + nu
    outer = rc + n * h
    r = rc + h * np.arange(n)
    wit = np.array([tension_at(case, ri, rc, outer) for ri in r])
    pressure = np.zeros(n)
    sigma_t = wit / h
    for top in range(n):
        load = wit[top] / r[top]
        m = top + 1
        if m == 1:
            delta = np.array([-load])
        else:
            delta_prev = None
            er = k2 * (pressure[:m] + k1)
            for _ in range(200):
                g = et / er
                ab = np.zeros((3, m))
                rr = r[:m]
                # Interior rows 1..m-2: a d[i-1] + b d[i] + c d[i+1] = 0 (times h^2).
                a = rr * rr - 1.5 * rr * h
                b = -2.0 * rr * rr + (1.0 - g) * h * h
                c = rr * rr + 1.5 * rr * h
                ab[1, :] = b
                ab[0, 1:] = c[:-1]
                ab[2, :-1] = a[1:]
                # Core row with the ghost node d[-1] = d[1] - 2 h c_core d[0] / r0.
                r0 = rr[0]
                ab[1, 0] = -2.0 * r0 * r0 - 2.0 * r0 * c_core * h + (3.0 * c_core + 1.0 - g[0]) * h * h
                ab[0, 1] = 2.0 * r0 * r0
                # Dirichlet row at the top.
                ab[1, m - 1] = 1.0
                ab[2, m - 2] = 0.0
                rhs = np.zeros(m)
                rhs[m - 1] = -load
                delta = solve_banded((1, 1), ab, rhs)
                if update == "explicit":
                    break
                if delta_prev is not None and np.max(np.abs(delta - delta_prev)) <= 1e-11 * load:
                    break
                delta_prev = delta
                dp = -delta
                er = np.array([secant_modulus(k1, k2, pressure[i], dp[i]) for i in range(m)])
            else:
                raise RuntimeError("secant iteration did not converge")
        pressure[:m] -= delta
        if m >= 2:
            inner = np.arange(1, m - 1)
            deriv = np.zeros(m)
            deriv[0] = c_core * delta[0]
            deriv[inner] = r[inner] * (delta[inner + 1] - delta[inner - 1]) / (2.0 * h)
            sigma_t[: m - 1] += delta[: m - 1] + deriv[: m - 1]
    radius = np.append(r, outer)
    pressure = np.append(pressure, 0.0)
    sigma_t = np.append(sigma_t, wit[-1] / h)
    return radius, pressure, sigma_t


def compute():
    out = []
    for case in CASES:
        radius, pressure, sigma_t = solve_case(case, "secant")
        _, p_explicit, _ = solve_case(case, "explicit")
        out.append({
            "case": case,
            "radius": radius.tolist(),
            "pressure": pressure.tolist(),
            "tangential_stress": sigma_t.tolist(),
            "core_pressure_explicit": float(p_explicit[0]),
        })
    return {"source": "independent SciPy implementation (scipy.linalg.solve_banded)", "results": out}


def main():
    data = compute()
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        for new, old in zip(data["results"], committed["results"], strict=True):
            for key in ("pressure", "tangential_stress"):
                a, b = np.array(new[key]), np.array(old[key])
                scale = np.max(np.abs(b))
                if a.shape != b.shape or np.max(np.abs(a - b)) > 1e-9 * scale:
                    print(f"drift in {new['case']['name']} {key}")
                    sys.exit(1)
        print("nonlinear_accretion.json up to date")
        return
    OUT.write_text(json.dumps(data) + "\n")
    for res in data["results"]:
        print(res["case"]["name"], "core pressure", res["pressure"][0],
              "explicit", res["core_pressure_explicit"], "min sigma_t", min(res["tangential_stress"]))


if __name__ == "__main__":
    main()
