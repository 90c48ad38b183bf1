#!/usr/bin/env python3
"""How much of the core pressure the outer half of the build adds, for the PET film roll of the
diagnosis scenarios (tests/diagnose/common.rs `pet_film`, wound to 1.2 m): core pressure of the
full roll against the roll wound to half its build thickness, both from the independent SciPy
implementation of Hakiel's nonlinear accretion model with Pfeiffer's radial law in
nonlinear_accretion.py (Hakiel, TAPPI J. 70(5):113, 1987; Pfeiffer, TAPPI 49(8):342, 1966).

The film is 23 um thick; wraps are grouped 40 to a layer (0.92 mm) at the same wound-in stress
T/h (the load of a group is 40 wraps' tension), which that script's thin-layer check shows is
close to the wrap-by-wrap answer; 80 to a layer is also computed to show the share has settled.
Wound-in tension: the web tension alone (120 N/m) and with the nip-induced part of a 350 N/m nip
at kinetic friction 0.35 (mu*N, the usual nip-induced tension relation), constant and with a 25 %
linear taper over the whole wound-in tension.

Writes core_size_share.json; `--check` recomputes and compares with the committed file.
"""
import json
import sys
from pathlib import Path

from nonlinear_accretion import solve_case

HERE = Path(__file__).resolve().parent
OUT = HERE / "core_size_share.json"

CORE_RADIUS = 0.0889
OUTER_RADIUS = 0.6
# Half the build thickness, as the diagnosis re-solves it.
HALF_RADIUS = CORE_RADIUS + (OUTER_RADIUS - CORE_RADIUS) / 2.0
WRAP = 23e-6


def core_pressure(outer, group, tension, taper):
    h = WRAP * group
    case = {
        "name": "pet_film", "core_radius": CORE_RADIUS, "thickness": h,
        "layers": int(round((outer - CORE_RADIUS) / h)),
        "tangential_modulus": 4.5e9, "k1": 30e3, "k2": 120.0, "poisson_ratio": 0.01,
        "core": {"kind": "hollow", "inner_radius": 0.0762, "outer_radius": CORE_RADIUS,
                 "modulus": 3.0e9, "poisson_ratio": 0.3},
        "tension": tension * group, "taper": taper, "upsets": [],
    }
    _, pressure, _ = solve_case(case)
    return float(pressure[0])


def compute():
    rows = []
    for tension in (120.0, 120.0 + 0.35 * 350.0):
        for taper in (None, {"kind": "linear", "fraction": 0.25}):
            for group in (80, 40):
                full = core_pressure(OUTER_RADIUS, group, tension, taper)
                half = core_pressure(HALF_RADIUS, group, tension, taper)
                rows.append({"tension": tension, "taper": taper, "wraps_per_layer": group,
                             "core_pressure_full": full, "core_pressure_half": half,
                             "share": (full - half) / full})
    return {"source": "independent SciPy implementation (nonlinear_accretion.py)", "rows": rows}


def main():
    data = compute()
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        for new, old in zip(data["rows"], committed["rows"], strict=True):
            if abs(new["share"] - old["share"]) > 1e-9:
                print("drift in core_size_share.json")
                sys.exit(1)
        print("core_size_share.json up to date")
        return
    OUT.write_text(json.dumps(data, indent=1) + "\n")
    for row in data["rows"]:
        print(row["tension"], row["taper"], row["wraps_per_layer"], "share %.4f" % row["share"])


if __name__ == "__main__":
    main()
