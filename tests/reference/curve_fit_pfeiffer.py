#!/usr/bin/env python3
"""Reference fit of Pfeiffer's law P = K1*(exp(K2*eps) - 1) with SciPy's curve_fit.

Reads the demo stack tests in cases/calibration/, keeps the loading branch (rows up to the first
row where strain falls), converts units independently of the Rust code and fits with
scipy.optimize.curve_fit (MINPACK Levenberg-Marquardt), once with plain residuals and once with
relative weights (sigma = max(P, 1 % of max P)). Standard errors are sqrt(diag(pcov)) with
absolute_sigma=False, i.e. covariance = s^2 (J^T J)^-1. R^2 is that of the weighted sum the fit
minimises: 1 - sum(w^2 r^2) / sum(w^2 (P - Pw)^2), w = 1/sigma, Pw the weighted mean (the plain
R^2 for absolute weighting). Externally studentized residuals (Belsley, Kuh and Welsch 1980):
t_i = e_i / (s_(i) sqrt(1 - h_ii)), e the weighted residuals, h the leverages of the weighted
Jacobian, s_(i)^2 = (sum e^2 - e_i^2/(1 - h_ii)) / (n - 3). The extra file
tests/fixtures/stack_one_absurd_row.csv (one row 10 000 times too large) checks them.

Writes curve_fit_pfeiffer.json; `--check` recomputes and exits non-zero on drift.
"""
import json
import math
import sys
from pathlib import Path

import numpy as np
from scipy.optimize import curve_fit

HERE = Path(__file__).resolve().parent
DATA = HERE.parent.parent / "cases" / "calibration"
OUT = HERE / "curve_fit_pfeiffer.json"
PSI = 4.4482216152605 / 0.0254**2  # Pa (NIST SP 811 exact definitions)
PRESSURE_UNITS = {"Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "psi": PSI}
LENGTH_UNITS = {"m": 1.0, "mm": 1e-3, "um": 1e-6, "in": 0.0254}
FILES = ["harbour_news_45.csv", "harbour_lwc_60_height.csv", "harbour_bopp_25.csv"]
# (path from the repository root, weightings): test files outside the demo set.
EXTRA = [("tests/fixtures/stack_one_absurd_row.csv", ("relative",))]


def unit_of(header):
    return header[header.index("[") + 1 : header.index("]")] if "[" in header else None


def read(path):
    meta, rows, header = {}, [], None
    for line in path.read_text().splitlines():
        s = line.strip()
        if not s:
            continue
        if s.startswith("#"):
            if ":" in s and header is None:
                k, v = s[1:].split(":", 1)
                meta[k.strip()] = v.strip()
            continue
        cells = [c.strip() for c in s.split(",")]
        if header is None:
            header = cells
        else:
            rows.append([float(c) for c in cells])
    x_header, p_header = header
    pressure = np.array([r[1] for r in rows]) * PRESSURE_UNITS[unit_of(p_header)]
    x = np.array([r[0] for r in rows])
    if x_header.startswith("height"):
        value, unit = meta["initial_height"].split()
        h0 = float(value) * LENGTH_UNITS[unit]
        strain = (h0 - x * LENGTH_UNITS[unit_of(x_header)]) / h0
    else:
        strain = x * (0.01 if unit_of(x_header) == "%" else 1.0)
    # Loading branch: stop at the first row where strain falls (unloading starts).
    end = len(strain)
    for i in range(1, len(strain)):
        if strain[i] <= strain[i - 1]:
            end = i
            break
    return strain[:end], pressure[:end]


def pfeiffer(eps, k1, k2):
    return k1 * np.expm1(k2 * eps)


def fit(strain, pressure, weighting):
    positive = pressure > 0
    slope, intercept = np.polyfit(strain[positive], np.log(pressure[positive]), 1)
    p0 = [math.exp(intercept), slope]
    sigma = None
    if weighting == "relative":
        sigma = np.maximum(pressure, 0.01 * pressure.max())
    popt, pcov = curve_fit(
        pfeiffer, strain, pressure, p0=p0, sigma=sigma, absolute_sigma=False,
        method="lm", maxfev=20000, xtol=1e-15, ftol=1e-15, gtol=1e-15,
    )
    residual = pfeiffer(strain, *popt) - pressure
    w = np.ones_like(pressure) if sigma is None else 1.0 / sigma
    w2 = w**2
    mean = float(np.sum(w2 * pressure) / np.sum(w2))
    sst = float(np.sum(w2 * (pressure - mean) ** 2))
    e = w * residual
    k1, k2 = popt
    jac = np.column_stack([w * np.expm1(k2 * strain), w * k1 * strain * np.exp(k2 * strain)])
    leverage = np.einsum("ij,jk,ik->i", jac, np.linalg.inv(jac.T @ jac), jac)
    n = len(strain)
    s2 = (np.sum(e**2) - e**2 / (1.0 - leverage)) / (n - 3)
    t = e / (np.sqrt(s2) * np.sqrt(1.0 - leverage))
    worst = int(np.argmax(np.abs(t)))
    return {
        "k1": float(popt[0]),
        "k2": float(popt[1]),
        "k1_standard_error": float(math.sqrt(pcov[0, 0])),
        "k2_standard_error": float(math.sqrt(pcov[1, 1])),
        "r_squared": 1.0 - float(np.sum(w2 * residual**2)) / sst,
        "points": int(len(strain)),
        "largest_studentized_residual": {"row": worst, "value": float(t[worst])},
    }


def compute():
    cases = []
    for name in FILES:
        strain, pressure = read(DATA / name)
        for weighting in ("absolute", "relative"):
            cases.append({"file": f"cases/calibration/{name}", "weighting": weighting, **fit(strain, pressure, weighting)})
    for path, weightings in EXTRA:
        strain, pressure = read(HERE.parent.parent / path)
        for weighting in weightings:
            cases.append({"file": path, "weighting": weighting, **fit(strain, pressure, weighting)})
    return {
        "source": "scipy.optimize.curve_fit (method='lm'), scipy " + __import__("scipy").__version__,
        "model": "P = K1*(exp(K2*eps) - 1), K1 in Pa",
        "cases": cases,
    }


def main():
    result = compute()
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        bad = []
        for new, old in zip(result["cases"], committed["cases"]):
            for key in ("k1", "k2", "k1_standard_error", "k2_standard_error", "r_squared"):
                if not math.isclose(new[key], old[key], rel_tol=1e-6):
                    bad.append(f"{old['file']} {old['weighting']} {key}: {old[key]} -> {new[key]}")
            key = "largest_studentized_residual"
            if new[key]["row"] != old[key]["row"] or not math.isclose(new[key]["value"], old[key]["value"], rel_tol=1e-6):
                bad.append(f"{old['file']} {old['weighting']} {key}: {old[key]} -> {new[key]}")
        if len(result["cases"]) != len(committed["cases"]):
            bad.append("number of cases changed")
        if bad:
            print("curve_fit_pfeiffer: drift\n" + "\n".join(bad))
            sys.exit(1)
        print("curve_fit_pfeiffer: ok")
        return
    OUT.write_text(json.dumps(result, indent=2) + "\n")
    print(f"wrote {OUT}")


if __name__ == "__main__":
    main()
