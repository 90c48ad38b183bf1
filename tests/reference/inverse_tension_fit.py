#!/usr/bin/env python3
"""Reference for the inverse estimate of src/evidence/fit.rs: synthetic measurements on a paper
roll made with the independent SciPy implementation of Hakiel's accretion model
(nonlinear_accretion.py in this folder) at a known tension scale (and stiffness scale), plus
seeded noise; then fitted with scipy.optimize.least_squares (3-point Jacobian) in the same
parameterisation (x = ln of the scales) and weighting as the Rust fit. Standard errors from the
Jacobian at the solution: cov = (J^T J)^-1 * chi^2/(m - p) when m > p, (J^T J)^-1 when m = p;
SE(s) = s * SE(ln s).

Data: the mean radial compression from length and diameter,
eps = 1 - pi (R^2 - rc^2)/(L h), with sigma from the stated uncertainties of length, diameter and
caliper; calibrated hardness readings (reading = pressure in kPa: calibration points (0, 0 Pa)
and (1000, 1 MPa)) at five diameters with sigma = 0.1 p + 0.02 max p.

Writes inverse_tension_fit.json; `--check` recomputes and compares with the committed file.
"""
import json
import math
import sys
from pathlib import Path

import numpy as np
from scipy.optimize import least_squares

sys.path.insert(0, str(Path(__file__).resolve().parent))
import nonlinear_accretion as na  # noqa: E402

HERE = Path(__file__).resolve().parent
OUT = HERE / "inverse_tension_fit.json"

BASE = dict(na.CASES[0])  # paper on a hollow fibre core
BASE["layers"] = 300
TRUE_TENSION_SCALE = 0.8
TRUE_STIFFNESS_SCALE = 1.25
FRACTIONS = [0.1, 0.3, 0.5, 0.7, 0.9]
UNCERTAINTY = {"amount": 0.001, "diameter": 1.0e-4, "caliper": 0.005}
SEED = 20261202


def solve(tension_scale, stiffness_scale):
    case = dict(BASE)
    case["tension"] = BASE["tension"] * tension_scale
    case["k1"] = BASE["k1"] * stiffness_scale
    radius, pressure, _ = na.solve_case(case, "secant")
    strain = np.log1p(pressure / case["k1"]) / case["k2"]
    return radius, pressure, strain


def mean_compression(radius, strain):
    dr = np.diff(radius)
    num = np.sum(0.5 * (strain[1:] * radius[1:] + strain[:-1] * radius[:-1]) * dr)
    den = np.sum(0.5 * (radius[1:] + radius[:-1]) * dr)
    return num / den


def synthetic():
    rc, h, n = BASE["core_radius"], BASE["thickness"], BASE["layers"]
    outer = rc + n * h
    radius, pressure, strain = solve(TRUE_TENSION_SCALE, TRUE_STIFFNESS_SCALE)
    rng = np.random.default_rng(SEED)
    length = math.pi * (outer**2 - rc**2) / h
    eps_true = mean_compression(radius, strain)
    r = outer  # measured diameter close to the solved one
    rel = math.sqrt(UNCERTAINTY["amount"] ** 2 + UNCERTAINTY["caliper"] ** 2
                    + (r * UNCERTAINTY["diameter"] / (r * r - rc * rc)) ** 2)
    sigma_eps = rel * (1.0 - eps_true)
    eps_measured = eps_true + 0.5 * sigma_eps * rng.standard_normal()
    diameter = 2.0 * math.sqrt(rc * rc + length * h * (1.0 - eps_measured) / math.pi)
    readings = []
    for f in FRACTIONS:
        rr = rc + f * (outer - rc)
        p = float(np.interp(rr, radius, pressure))
        readings.append({"diameter": 2.0 * rr, "value": p * (1.0 + 0.05 * rng.standard_normal()) / 1e3})
    return {"length": length, "diameter": diameter, "readings": readings}


def data_of(meas):
    rc, h = BASE["core_radius"], BASE["thickness"]
    r = meas["diameter"] / 2.0
    eps = 1.0 - math.pi * (r * r - rc * rc) / (meas["length"] * h)
    rel = math.sqrt(UNCERTAINTY["amount"] ** 2 + UNCERTAINTY["caliper"] ** 2
                    + (r * UNCERTAINTY["diameter"] / (r * r - rc * rc)) ** 2)
    pressures = [(x["diameter"] / 2.0, x["value"] * 1e3) for x in meas["readings"]]
    largest = max(p for _, p in pressures)
    sig_p = [max(0.1 * p + 0.02 * largest, 1.0) for _, p in pressures]
    return eps, rel * (1.0 - eps), pressures, sig_p


def fit(meas, parameters, use_pressures):
    eps, sig_eps, pressures, sig_p = data_of(meas)
    if not use_pressures:
        pressures, sig_p = [], []

    def residuals(x):
        s_t = math.exp(x[0])
        s_k = math.exp(x[1]) if parameters == 2 else 1.0
        radius, pressure, strain = solve(s_t, s_k)
        res = [(mean_compression(radius, strain) - eps) / sig_eps]
        for (rr, p), s in zip(pressures, sig_p):
            res.append((float(np.interp(rr, radius, pressure)) - p) / s)
        return np.array(res)

    sol = least_squares(residuals, np.zeros(parameters), jac="3-point", xtol=1e-10, ftol=1e-10,
                        gtol=1e-10)
    m = sol.fun.size
    chi2 = float(np.sum(sol.fun**2))
    cov = np.linalg.inv(sol.jac.T @ sol.jac)
    if m > parameters:
        cov = cov * chi2 / (m - parameters)
    scales = np.exp(sol.x)
    se = scales * np.sqrt(np.diag(cov))
    return {"parameters": parameters, "use_pressures": use_pressures,
            "scales": scales.tolist(), "standard_errors": se.tolist(),
            "chi_square": chi2, "data_points": m}


def compute():
    meas = synthetic()
    return {
        "source": "scipy.optimize.least_squares on the SciPy accretion model (nonlinear_accretion.py)",
        "case": BASE,
        "true_tension_scale": TRUE_TENSION_SCALE,
        "true_stiffness_scale": TRUE_STIFFNESS_SCALE,
        "uncertainty": UNCERTAINTY,
        "measurements": meas,
        "fits": [fit(meas, 1, True), fit(meas, 2, True), fit(meas, 1, False)],
    }


def main():
    data = compute()
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        for new, old in zip(data["fits"], committed["fits"], strict=True):
            for key in ("scales", "standard_errors"):
                a, b = np.array(new[key]), np.array(old[key])
                if a.shape != b.shape or np.max(np.abs(a - b) / np.abs(b)) > 1e-6:
                    print(f"drift in fit {new['parameters']} {key}: {a} vs {b}")
                    sys.exit(1)
        print("inverse_tension_fit.json up to date")
        return
    OUT.write_text(json.dumps(data, indent=1) + "\n")
    for f in data["fits"]:
        print(f)


if __name__ == "__main__":
    main()
