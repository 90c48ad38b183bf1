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
r d' = (Et/Ec - 1 + nu) d through a ghost node. The finished profile ends with the outer surface
(pressure 0).

Hoop stress in the conservative thin-ring form: wrap j is the ring from r_j to r_{j+1} (the last
wrap ends at the outer surface) and carries a hoop force F_j = sigma_t * h. Radial statics of the
ring, d(r sigma_r)/dr = sigma_t integrated over it, say every increment d moves it by
r_{j+1} d_{j+1} - r_j d_j (zero above the loaded wrap: free surface), the wrap's own load included,
which gives it T_j. The accumulated F_j / h must equal (r_j P_j - r_{j+1} P_{j+1}) / h of the
finished roll; the script checks that and also winds one soft roll from ever thinner wraps at the
same wound-in stress (thin-layer limit by Richardson extrapolation of the two thinnest).

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
    """Secant of Pfeiffer's law P = K1 (exp(K2 eps) - 1) from p to p + dp (arrays)."""
    x = dp / (k1 + p)
    small = np.abs(x) < 1e-9
    safe = np.where(small, 1.0, x)
    return np.where(small, k2 * (k1 + p + 0.5 * dp), k2 * dp / np.log1p(safe))


def solve_case(case, update="secant"):
    rc, h, n = case["core_radius"], case["thickness"], case["layers"]
    et, k1, k2, nu = case["tangential_modulus"], case["k1"], case["k2"], case["poisson_ratio"]
    ec = core_stiffness(case["core"])
    c_core = (0.0 if math.isinf(ec) else et / ec) - 1.0 + nu
    outer = rc + n * h
    r = rc + h * np.arange(n)
    wit = np.array([tension_at(case, ri, rc, outer) for ri in r])
    pressure = np.zeros(n)
    # Hoop force per unit width of each wrap's ring, accumulated from every increment.
    force = np.zeros(n)
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
                er = secant_modulus(k1, k2, pressure[:m], dp)
            else:
                raise RuntimeError("secant iteration did not converge")
        pressure[:m] -= delta
        flux = r[:m] * delta
        force[:m] -= flux
        force[: m - 1] += flux[1:]
    radius = np.append(r, outer)
    pressure = np.append(pressure, 0.0)
    sigma_t = force / np.diff(radius)
    statics = (radius[:-1] * pressure[:-1] - radius[1:] * pressure[1:]) / np.diff(radius)
    error = np.max(np.abs(sigma_t - statics)) / np.max(np.abs(sigma_t))
    if error > 1e-10:
        raise RuntimeError(f"hoop stress off wrap statics by {error}")
    sigma_t = np.append(sigma_t, sigma_t[-1])
    return radius, pressure, sigma_t


# The soft roll wound from ever thinner wraps at the same wound-in stress T/h.
THIN_LAYER = {
    "name": "soft_paper_thin_layer",
    "core_radius": 0.05, "thickness": 76e-6, "layers": 300,
    "tangential_modulus": 5.0e9, "k1": 5.0e3, "k2": 50.0, "poisson_ratio": 0.01,
    "core": {"kind": "rigid"},
    "tension": 350.0, "taper": None, "upsets": [],
}
THIN_LAYER_SPLITS = [1, 2, 4, 8]


def thin_layer():
    minima = []
    for split in THIN_LAYER_SPLITS:
        case = dict(THIN_LAYER)
        case["thickness"] = THIN_LAYER["thickness"] / split
        case["layers"] = THIN_LAYER["layers"] * split
        case["tension"] = THIN_LAYER["tension"] / split
        _, _, sigma_t = solve_case(case, "secant")
        minima.append(float(np.min(sigma_t)))
    limit = 2.0 * minima[-1] - minima[-2]
    return {"case": THIN_LAYER, "splits": THIN_LAYER_SPLITS, "min_tangential_stress": minima,
            "limit": limit}


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
    return {"source": "independent SciPy implementation (scipy.linalg.solve_banded)", "results": out,
            "thin_layer": thin_layer()}


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
        new, old = data["thin_layer"], committed.get("thin_layer")
        if old is None or np.max(np.abs(np.array(new["min_tangential_stress"])
                                        - np.array(old["min_tangential_stress"]))) > 1e-9 * abs(old["limit"]):
            print("drift in the thin-layer sequence")
            sys.exit(1)
        print("nonlinear_accretion.json up to date")
        return
    OUT.write_text(json.dumps(data) + "\n")
    for res in data["results"]:
        print(res["case"]["name"], "core pressure", res["pressure"][0],
              "explicit", res["core_pressure_explicit"], "min sigma_t", min(res["tangential_stress"]))
    print("thin layer", data["thin_layer"]["min_tangential_stress"], "limit", data["thin_layer"]["limit"])


if __name__ == "__main__":
    main()
