#!/usr/bin/env python3
"""Starring margin (src/mechanics/starring.rs) on a simple roll, computed independently with NumPy.

A wrap of caliper h and machine-direction modulus Et is a beam (per unit width) of bending
stiffness D = Et*h^3/12 on a Winkler foundation k = 2*Er(P)/h (the wraps on both sides, one
caliper deep, Pfeiffer's tangent modulus Er = K2*(P + K1)). The axial force that holds a
sinusoidal buckle of wavenumber q in equilibrium is N(q) = D*q^2 + k/q^2 (Hetenyi, Beams on
Elastic Foundation, 1946; Timoshenko & Gere, Theory of Elastic Stability); the critical force is
its minimum over q, found here numerically on a dense logarithmic grid refined by bounded scalar
minimisation, not from the closed form 2*sqrt(k*D) the crate uses. Critical stress = N/h.

The roll: prescribed pressure falling linearly from P0 at the core to 0 at the outside and a
prescribed hoop stress rising linearly from -S0 at the core to +S1 at the outside, on N nodes
(node 0 = core/web interface; the outside node is not an interface). Demand = max(-sigma_t, 0);
margin = capacity / demand, capped at 1000 (no demand = the cap).

Writes starring_buckling.json; `--check` recomputes and compares with the committed file.
"""
import json
import sys
from pathlib import Path

import numpy as np
from scipy.optimize import minimize_scalar

HERE = Path(__file__).resolve().parent
OUT = HERE / "starring_buckling.json"

ROLL = {
    "core_radius": 0.05,
    "outer_radius": 0.30,
    "core_pressure": 20e3,
    "core_hoop_stress": -5e6,
    "outer_hoop_stress": 2e6,
    "tangential_modulus": 1e9,
    "k1": 1e3,
    "k2": 10.0,
    "caliper": 100e-6,
    "nodes": 2001,
}
CAP = 1.0e3


def critical_stress(er):
    h, et = ROLL["caliper"], ROLL["tangential_modulus"]
    d = et * h**3 / 12.0
    k = 2.0 * er / h
    force = lambda q: d * q * q + k / (q * q)
    qs = np.logspace(0, 8, 4001)
    q0 = qs[np.argmin(force(qs))]
    best = minimize_scalar(
        lambda lq: force(np.exp(lq)),
        bounds=(np.log(q0) - 0.01, np.log(q0) + 0.01),
        method="bounded",
        options={"xatol": 1e-12},
    )
    return float(force(np.exp(best.x))) / h


def compute():
    rc, big_r, n = ROLL["core_radius"], ROLL["outer_radius"], ROLL["nodes"]
    r = np.linspace(rc, big_r, n)
    s = (r - rc) / (big_r - rc)
    p = ROLL["core_pressure"] * (1.0 - s)
    hoop = ROLL["core_hoop_stress"] + (ROLL["outer_hoop_stress"] - ROLL["core_hoop_stress"]) * s
    best, best_r = CAP, float(r[0])
    samples = []
    for i in range(n - 1):
        demand = max(-hoop[i], 0.0)
        cap = critical_stress(ROLL["k2"] * (p[i] + ROLL["k1"]))
        m = min(cap / demand, CAP) if demand > 0 else CAP
        if m < best:
            best, best_r = m, float(r[i])
        if i % 200 == 0:
            samples.append({"radius": float(r[i]), "demand": demand, "capacity": cap})
    return {"roll": ROLL, "min_margin": best, "min_radius": best_r, "samples": samples}


def main():
    result = compute()
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        for key in ("min_margin", "min_radius"):
            a, b = result[key], committed[key]
            if abs(a - b) > 1e-9 * max(abs(b), 1e-12):
                sys.exit(f"starring_buckling: {key} drifted: {a} vs {b}")
        for a, b in zip(result["samples"], committed["samples"]):
            for key in ("radius", "demand", "capacity"):
                if abs(a[key] - b[key]) > 1e-9 * max(abs(b[key]), 1e-12):
                    sys.exit(f"starring_buckling: sample {key} drifted: {a[key]} vs {b[key]}")
        print("starring_buckling: ok")
        return
    OUT.write_text(json.dumps(result, indent=1) + "\n")
    print(f"wrote {OUT}: min margin {result['min_margin']:.6g} at r = {result['min_radius']:.6g}")


if __name__ == "__main__":
    main()
