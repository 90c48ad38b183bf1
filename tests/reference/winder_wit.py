#!/usr/bin/env python3
"""Wound-in tension of a simple case on each winder type, computed from the published relations
independently of src/model/winder.rs and wound_in.rs:

* nip-induced tension mu_k * N, proportional at low nip load and independent of it above the
  levelling-off (Good, Wu & Fikes, J. Appl. Mech. 61:182, 1994; Good, Hartwig & Markum, Proc.
  5th Int. Conf. Web Handling, 1999, whose kinetic coefficient 0.19 for newsprint is used here;
  Balaji & Good on the levelling-off); knee 2000 N/m (common practice, trade guidance);
* centre torque M adds M/r; a drum torque differential dM adds dM/Rd (statics);
* two drums: the drum contact forces of a roll of weight W (rho*g*pi*(r^2 - rc^2) per width)
  plus a rider load, found by solving the 2x2 force balance of the roll with numpy.linalg.solve
  (no closed form used).

Writes winder_wit.json; `--check` recomputes and compares with the committed file.
"""
import json
import math
import sys
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
OUT = HERE / "winder_wit.json"

G = 9.80665  # standard gravity, NIST SP 811
MU_K = 0.19  # newsprint on newsprint, Good, Hartwig & Markum (1999)
MU_S = 0.40
KNEE = 2000.0
TENSION = 350.0
CORE_RADIUS = 0.05
RADII = [0.1, 0.2, 0.4]


def nit(n):
    return MU_K * min(max(n, 0.0), KNEE)


def drum_contact_force(weight, rider, radius, drum_radius, centre_distance):
    """Normal force per width on each drum from the roll's force balance."""
    sin_t = 0.5 * centre_distance / (radius + drum_radius)
    cos_t = math.sqrt(1.0 - sin_t * sin_t)
    # Unknowns F1 (entry drum), F2 (front drum); contact forces push the roll along the lines
    # from the drum centres: horizontal (+sin, -sin), vertical (cos, cos).
    a = np.array([[sin_t, -sin_t], [cos_t, cos_t]])
    f = np.linalg.solve(a, np.array([0.0, weight + rider]))
    return float(f[0])


def compute():
    cases = []
    for r in RADII:
        cases.append({"method": "centre", "radius": r, "wit": TENSION})
        cases.append({"method": "centre", "nip_load": 1000.0, "radius": r, "wit": TENSION + nit(1000.0)})
        cases.append({"method": "centre", "nip_load": 3000.0, "radius": r, "wit": TENSION + nit(3000.0)})
        cases.append({"method": "gap", "nip_load": 1000.0, "radius": r, "wit": TENSION})
        cases.append({"method": "surface", "nip_load": 1000.0, "radius": r, "wit": TENSION + nit(1000.0)})
        cases.append({
            "method": "centre_surface", "nip_load": 1000.0, "centre_torque": 50.0, "radius": r,
            "wit": TENSION + nit(1000.0) + 50.0 / r,
        })
        weight = 590.0 * G * math.pi * (r * r - CORE_RADIUS ** 2)
        n = drum_contact_force(weight, 500.0, r, 0.3, 0.7)
        cases.append({
            "method": "two_drum", "nip_load": 500.0, "density": 590.0, "drum_radius": 0.3,
            "centre_distance": 0.7, "torque_differential": 30.0, "radius": r,
            "drum_nip_load": n, "wit": TENSION + nit(n) + 30.0 / 0.3,
        })
    return {
        "source": "published wound-in tension relations (see docstring); two-drum statics by numpy.linalg.solve",
        "tension": TENSION,
        "kinetic_friction": MU_K,
        "static_friction": MU_S,
        "core_radius": CORE_RADIUS,
        "cases": cases,
    }


def main():
    data = compute()
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        for new, old in zip(data["cases"], committed["cases"], strict=True):
            if new["method"] != old["method"] or abs(new["wit"] - old["wit"]) > 1e-9 * old["wit"]:
                print(f"drift in {new['method']} at {new['radius']}: {new['wit']} vs {old['wit']}")
                sys.exit(1)
        print("winder_wit.json up to date")
        return
    OUT.write_text(json.dumps(data, indent=2) + "\n")
    for case in data["cases"]:
        print(case["method"], case["radius"], round(case["wit"], 3))


if __name__ == "__main__":
    main()
