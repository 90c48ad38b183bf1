#!/usr/bin/env python3
"""Hollow cylindrically orthotropic core under external pressure, solved numerically with
SciPy's solve_bvp from the displacement equations (plane stress), independently of the closed
form in src/model/core.rs (Lekhnitskii's ring solution as used by Gerhardt, J. Eng. Mater.
Technol. 112:144, 1990, for spiral paper tubes).

Compliance: eps_r = s_r/Er - nu*s_t/Et, eps_t = s_t/Et - nu*s_r/Et (symmetric). Equilibrium
d(s_r)/dr + (s_r - s_t)/r = 0 with eps_r = u', eps_t = u/r. Boundary: s_r(b) = -p and either a
free bore s_r(a) = 0 or a bore held by a shaft u(a) = 0.

Reported per case: effective core stiffness Ec = p*b/(-u(b)) over the hoop modulus, and the
hoop stress at the bore and at the outside over p. The isotropic free cases must match Lame
(Roark's thick cylinder): Ec/E = 1/((b^2+a^2)/(b^2-a^2) - nu), bore hoop = -2 b^2/(b^2-a^2).

Writes orthotropic_core.json; `--check` recomputes and compares with the committed file.
"""
import json
import sys
from pathlib import Path

import numpy as np
from scipy.integrate import solve_bvp

HERE = Path(__file__).resolve().parent
OUT = HERE / "orthotropic_core.json"

INCH = 0.0254
CASES = [
    # name, a, b, E_theta, E_r, nu, support
    ("lame_3in_half_wall", 1.5 * INCH, 2.0 * INCH, 2e9, 2e9, 0.3, "free"),
    ("lame_3in_half_wall_shaft", 1.5 * INCH, 2.0 * INCH, 2e9, 2e9, 0.3, "shaft"),
    ("paper_3in_half_wall", 1.5 * INCH, 2.0 * INCH, 2e9, 40e6, 0.3, "free"),
    ("paper_3in_half_wall_shaft", 1.5 * INCH, 2.0 * INCH, 2e9, 40e6, 0.3, "shaft"),
    ("paper_6in_half_wall", 3.0 * INCH, 3.5 * INCH, 2e9, 40e6, 0.3, "free"),
    ("paper_ratio10", 1.5 * INCH, 2.0 * INCH, 2e9, 200e6, 0.3, "free"),
]


def solve(a, b, et, er, nu, support):
    # Dimensionless: x = r/b, v = u*Et/(p*b), stresses over p, stiffness matrix over Et.
    s = np.array([[et / er, -nu], [-nu, 1.0]])
    q = np.linalg.inv(s)
    x0 = a / b

    def rhs(x, y):
        v, sr = y
        dv = (sr - q[0, 1] * v / x) / q[0, 0]
        st = q[1, 0] * dv + q[1, 1] * v / x
        return np.vstack([dv, (st - sr) / x])

    def bc(ya, yb):
        inner = ya[1] if support == "free" else ya[0]
        return np.array([inner, yb[1] + 1.0])

    x = np.linspace(x0, 1.0, 200)
    guess = np.vstack([-x, -(x - x0) / (1.0 - x0)])
    sol = solve_bvp(rhs, bc, x, guess, tol=1e-10, max_nodes=100000)
    assert sol.success, sol.message

    def hoop(at):
        v, sr = sol.sol(at)
        dv = (sr - q[0, 1] * v / at) / q[0, 0]
        return q[1, 0] * dv + q[1, 1] * v / at

    vb = sol.sol(1.0)[0]
    return {
        "effective_over_hoop_modulus": float(1.0 / (-vb)),
        "hoop_at_bore_over_pressure": float(hoop(x0)),
        "hoop_at_outside_over_pressure": float(hoop(1.0)),
    }


def compute():
    cases = []
    for name, a, b, et, er, nu, support in CASES:
        entry = {
            "name": name,
            "inner_radius": a,
            "outer_radius": b,
            "hoop_modulus": et,
            "radial_modulus": er,
            "poisson_ratio": nu,
            "support": support,
        }
        entry.update(solve(a, b, et, er, nu, support))
        cases.append(entry)
    return {
        "source": "plane-stress displacement equations of a cylindrically orthotropic tube, scipy.integrate.solve_bvp",
        "cases": cases,
    }


KEYS = ["effective_over_hoop_modulus", "hoop_at_bore_over_pressure", "hoop_at_outside_over_pressure"]


def main():
    data = compute()
    lame = data["cases"][0]
    a, b, nu = lame["inner_radius"], lame["outer_radius"], lame["poisson_ratio"]
    ratio = (b * b + a * a) / (b * b - a * a)
    assert abs(lame["effective_over_hoop_modulus"] - 1.0 / (ratio - nu)) < 1e-6, lame
    assert abs(lame["hoop_at_bore_over_pressure"] + 2 * b * b / (b * b - a * a)) < 1e-6, lame
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        for new, old in zip(data["cases"], committed["cases"], strict=True):
            for key in KEYS:
                if new["name"] != old["name"] or abs(new[key] - old[key]) > 1e-7 * max(1.0, abs(old[key])):
                    print(f"drift in {new['name']} {key}: {new[key]} vs committed {old[key]}")
                    sys.exit(1)
        print("orthotropic_core.json up to date")
        return
    OUT.write_text(json.dumps(data, indent=2) + "\n")
    for case in data["cases"]:
        print(case["name"], [round(case[k], 6) for k in KEYS])


if __name__ == "__main__":
    main()
