#!/usr/bin/env python3
"""Closed-form core pressure of a constant-modulus wound roll (linear accretion theory of
Altmann, TAPPI 51(4):176, 1968, and Yagoda, J. Appl. Mech. 47:847, 1980), integrated with
SciPy's quad.

For constant g = Et/Er the increment equation r^2 d'' + 3 r d' + (1 - g) d = 0 has the solutions
r^m with m = -1 +- sqrt(g). With the core condition rc d'(rc) = c d(rc) (c = Et/Ec - 1 + nu) and
the outer load d(s) = -T/s, the pressure a wrap at s adds on the core is (T/s) phi(s) with
phi(s) = d(rc)/d(s). Summing wraps (ds/h of them) gives Pcore/sigma_w = int_rc^R phi(s)/s ds,
sigma_w = T/h.

Writes closed_form.json; `--check` recomputes and compares with the committed file.
"""
import json
import math
import sys
from pathlib import Path

from scipy.integrate import quad

HERE = Path(__file__).resolve().parent
OUT = HERE / "closed_form.json"


def core_pressure_ratio(g, c, rc, outer):
    root = math.sqrt(g)
    m1, m2 = -1.0 + root, -1.0 - root

    def phi(s):
        # d(r) = (r/rc)^m1 + k (r/rc)^m2 with k chosen for the core condition.
        k = -(m1 - c) / (m2 - c)
        at_core = 1.0 + k
        at_s = (s / rc) ** m1 + k * (s / rc) ** m2
        return at_core / at_s

    value, _err = quad(lambda s: phi(s) / s, rc, outer, epsabs=1e-14, epsrel=1e-12, limit=200)
    return value


CASES = [
    # name, Et/Er, Et/Ec (0 = rigid), nu, rc, R, h
    ("isotropic_rigid_x2", 1.0, 0.0, 0.0, 0.05, 0.10, 25e-6),
    ("isotropic_rigid_x4", 1.0, 0.0, 0.0, 0.05, 0.20, 25e-6),
    ("orthotropic100_rigid_x2", 100.0, 0.0, 0.0, 0.05, 0.10, 25e-6),
    ("orthotropic100_core4_x2", 100.0, 4.0, 0.01, 0.05, 0.10, 25e-6),
]


def tangential_ratio(g, c, rc, outer, r):
    """sigma_theta(r)/sigma_w = 1 - int_r^R (f(r) + r f'(r)) / (s f(s)) ds: the wound-in stress
    minus the hoop increments d + r d' of every later wrap."""
    root = math.sqrt(g)
    m1, m2 = -1.0 + root, -1.0 - root
    k = -(m1 - c) / (m2 - c)

    def f(x):
        return (x / rc) ** m1 + k * (x / rc) ** m2

    hoop = (1.0 + m1) * (r / rc) ** m1 + k * (1.0 + m2) * (r / rc) ** m2
    value, _err = quad(lambda s: 1.0 / (s * f(s)), r, outer, epsabs=1e-14, epsrel=1e-12, limit=200)
    return 1.0 - hoop * value


FRACTIONS = [0.0, 0.25, 0.5, 0.9, 0.99]


def compute():
    results = []
    for name, g, core_ratio, nu, rc, outer, h in CASES:
        c = core_ratio - 1.0 + nu
        results.append(
            {
                "name": name,
                "modulus_ratio": g,
                "core_ratio": core_ratio,
                "poisson_ratio": nu,
                "core_radius": rc,
                "outer_radius": outer,
                "thickness": h,
                "core_pressure_over_web_stress": core_pressure_ratio(g, c, rc, outer),
                "build_fractions": FRACTIONS,
                "tangential_over_web_stress": [
                    tangential_ratio(g, c, rc, outer, rc + f * (outer - rc)) for f in FRACTIONS
                ],
            }
        )
    return {
        "source": "linear accretion theory (Altmann 1968, Yagoda 1980), scipy.integrate.quad",
        "cases": results,
    }


def main():
    data = compute()
    # Sanity: the isotropic rigid-core closed form ln((X^2 + 1)/2).
    for case in data["cases"][:2]:
        x = case["outer_radius"] / case["core_radius"]
        exact = math.log((x * x + 1.0) / 2.0)
        assert abs(case["core_pressure_over_web_stress"] - exact) < 1e-9, case
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        for new, old in zip(data["cases"], committed["cases"], strict=True):
            a = new["core_pressure_over_web_stress"]
            b = old["core_pressure_over_web_stress"]
            ta, tb = new["tangential_over_web_stress"], old["tangential_over_web_stress"]
            drift = any(abs(x - y) > 1e-9 * max(1.0, abs(y)) for x, y in zip(ta, tb, strict=True))
            if new["name"] != old["name"] or abs(a - b) > 1e-9 * max(1.0, abs(b)) or drift:
                print(f"drift in {new['name']}: {a} vs committed {b}")
                sys.exit(1)
        print("closed_form.json up to date")
        return
    OUT.write_text(json.dumps(data, indent=2) + "\n")
    for case in data["cases"]:
        print(f"{case['name']}: {case['core_pressure_over_web_stress']:.6f}",
              [round(x, 6) for x in case["tangential_over_web_stress"]])


if __name__ == "__main__":
    main()
