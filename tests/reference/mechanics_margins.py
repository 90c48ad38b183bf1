#!/usr/bin/env python3
"""Demand against capacity at every interface of a simple roll (src/mechanics), computed
independently with SciPy quadrature over the wraps instead of the closed forms the crate uses.

The roll: core radius rc, outer radius R, a prescribed interlayer pressure falling linearly from
P0 at the core to 0 at the outside, web density rho, static friction mu, on a uniform grid of N
nodes (node 0 = the core/web interface, node N-1 = the outside, not an interface).

* Telescoping (roll lifted by its core, shock factor k): the wraps outside r weigh
  int_r^R rho*g*2*pi*s ds per unit width and hang on the interface area 2*pi*r, so
  tau(r) = k/(2*pi*r) * int_r^R rho*g*2*pi*s ds; capacity mu*P(r).
* Torque (centre drive, speed v, outer tension T): J(a..b) = int_a^b rho*2*pi*s^3 ds per unit
  width, alpha = v/(R*t); start-up T*R + J(r..R)*alpha, normal stop |T*R - J(r..R)*alpha|,
  emergency stop J(r..R)*alpha, unwind T*R; capacity mu*P(r)*2*pi*r^2.
* Surface drive: J(rc..r)*alpha for the three speed changes.

Writes mechanics_margins.json; `--check` recomputes and compares with the committed file.
"""
import json
import math
import sys
from pathlib import Path

import numpy as np
from scipy.integrate import quad

HERE = Path(__file__).resolve().parent
OUT = HERE / "mechanics_margins.json"

G = 9.80665  # standard gravity, CGPM 1901
ROLL = {
    "core_radius": 0.05,
    "outer_radius": 0.30,
    "core_pressure": 200e3,
    "density": 700.0,
    "friction": 0.4,
    "shock_factor": 2.0,
    "speed": 10.0,
    "outer_tension": 300.0,
    "start_ramp_time": 20.0,
    "normal_stop_time": 20.0,
    "emergency_stop_time": 4.0,
    "nodes": 2001,
}
CAP = 1.0e3


def pressure(r):
    rc, big_r, p0 = ROLL["core_radius"], ROLL["outer_radius"], ROLL["core_pressure"]
    return p0 * (big_r - r) / (big_r - rc)


def inertia(a, b):
    rho = ROLL["density"]
    value, _ = quad(lambda s: rho * 2.0 * math.pi * s**3, a, b, epsabs=0.0, epsrel=1e-13)
    return value


def telescoping_demand(r):
    rho, k, big_r = ROLL["density"], ROLL["shock_factor"], ROLL["outer_radius"]
    weight, _ = quad(lambda s: rho * G * 2.0 * math.pi * s, r, big_r, epsabs=0.0, epsrel=1e-13)
    return k * weight / (2.0 * math.pi * r)


def torque_demands(r, centre):
    rc, big_r = ROLL["core_radius"], ROLL["outer_radius"]
    v, t_out = ROLL["speed"], ROLL["outer_tension"]
    alpha = lambda t: v / (big_r * t)
    tension_torque = t_out * big_r
    if centre:
        j = inertia(r, big_r)
        return {
            "start_up": tension_torque + j * alpha(ROLL["start_ramp_time"]),
            "normal_stop": abs(tension_torque - j * alpha(ROLL["normal_stop_time"])),
            "emergency_stop": j * alpha(ROLL["emergency_stop_time"]),
            "unwind": tension_torque,
        }
    j = inertia(rc, r)
    return {
        "start_up": j * alpha(ROLL["start_ramp_time"]),
        "normal_stop": j * alpha(ROLL["normal_stop_time"]),
        "emergency_stop": j * alpha(ROLL["emergency_stop_time"]),
        "unwind": tension_torque,
    }


def margin(capacity, demand):
    return min(capacity / demand, CAP) if demand > 0.0 else CAP


def compute():
    rc, big_r, mu = ROLL["core_radius"], ROLL["outer_radius"], ROLL["friction"]
    radius = np.linspace(rc, big_r, ROLL["nodes"])
    interfaces = radius[:-1]
    out = {"roll": ROLL, "telescoping": {}, "centre": {}, "surface": {}}

    tele = [margin(mu * pressure(r), telescoping_demand(r)) for r in interfaces]
    i = int(np.argmin(tele))
    out["telescoping"] = {
        "min_margin": tele[i],
        "min_radius": float(interfaces[i]),
        "samples": [
            {"radius": float(r), "demand": telescoping_demand(r), "capacity": mu * pressure(r)}
            for r in (rc, 0.1, 0.2, 0.29)
        ],
    }
    for drive, centre in (("centre", True), ("surface", False)):
        events = {}
        for event in ("start_up", "normal_stop", "emergency_stop", "unwind"):
            m = []
            for r in interfaces:
                cap = mu * pressure(r) * 2.0 * math.pi * r * r
                m.append(margin(cap, torque_demands(r, centre)[event]))
            j = int(np.argmin(m))
            events[event] = {
                "min_margin": m[j],
                "min_radius": float(interfaces[j]),
                "core_margin": m[0],
            }
        out[drive] = {
            "events": events,
            "samples": [
                {"radius": float(r), **torque_demands(r, centre)} for r in (rc, 0.1, 0.2, 0.29)
            ],
        }
    return out


def close(a, b, path=""):
    if isinstance(a, dict):
        return a.keys() == b.keys() and all(close(a[k], b[k], f"{path}.{k}") for k in a)
    if isinstance(a, list):
        return len(a) == len(b) and all(close(x, y, path) for x, y in zip(a, b))
    if isinstance(a, float) or isinstance(b, float):
        ok = math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-12)
        if not ok:
            print(f"drift at {path}: {a} vs {b}")
        return ok
    return a == b


if __name__ == "__main__":
    result = compute()
    if "--check" in sys.argv:
        committed = json.loads(OUT.read_text())
        sys.exit(0 if close(result, committed) else 1)
    OUT.write_text(json.dumps(result, indent=2) + "\n")
    print(f"wrote {OUT}")
