#!/usr/bin/env python3
"""Speed ratio of the Rust accretion solver against a NumPy/SciPy implementation of the same
scheme (per-layer Hakiel increments, explicit Er, one LAPACK banded solve per layer through
scipy.linalg.solve_banded) on the same 8,000-layer film roll, measured in one run.

Usage (from the repository root, after `cargo build --release --example solve_roll`):
    python3 benches/scipy_speed.py [layers]
Not part of the test suite (lives in benches/, not tests/reference/).
"""
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
from scipy.linalg import solve_banded

ROOT = Path(__file__).resolve().parent.parent


def scipy_explicit(layers, rc=0.0762, h=23e-6, et=4.5e9, k1=1e4, k2=300.0, wit=175.0, nu=0.01):
    c_core = nu - 1.0  # rigid core
    r = rc + h * np.arange(layers)
    pressure = np.zeros(layers)
    for top in range(1, layers):
        m = top + 1
        rr = r[:m]
        g = et / (k2 * (pressure[:m] + k1))
        ab = np.zeros((3, m))
        ab[1, :] = -2.0 * rr * rr + (1.0 - g) * h * h
        ab[0, 1:] = (rr * rr + 1.5 * rr * h)[:-1]
        ab[2, :-1] = (rr * rr - 1.5 * rr * h)[1:]
        r0 = rr[0]
        ab[1, 0] = -2.0 * r0 * r0 - 2.0 * r0 * c_core * h + (3.0 * c_core + 1.0 - g[0]) * h * h
        ab[0, 1] = 2.0 * r0 * r0
        ab[1, m - 1] = 1.0
        ab[2, m - 2] = 0.0
        rhs = np.zeros(m)
        rhs[m - 1] = -wit / r[top]
        pressure[:m] -= solve_banded((1, 1), ab, rhs)
    pressure[0] += wit / r[0]  # the first wrap sits directly on the core
    return pressure[0]


def main():
    layers = int(sys.argv[1]) if len(sys.argv) > 1 else 8000
    start = time.perf_counter()
    p_scipy = scipy_explicit(layers)
    t_scipy = time.perf_counter() - start
    binary = ROOT / "target" / "release" / "examples" / "solve_roll"
    runs = []
    for _ in range(3):
        start = time.perf_counter()
        out = subprocess.run([str(binary), "film", "per_layer", "explicit"], check=True,
                             capture_output=True, text=True).stdout
        runs.append(time.perf_counter() - start)
    t_rust = min(runs)
    p_rust = float(out.split("core pressure ")[1].split(" ")[0])
    print(f"layers {layers}: SciPy {t_scipy:.3f} s (core pressure {p_scipy:.6e} Pa), "
          f"Rust {t_rust:.3f} s incl. process start (core pressure {p_rust:.6e} Pa), "
          f"ratio {t_scipy / t_rust:.1f}x, relative difference {abs(p_rust - p_scipy) / p_scipy:.2e}")


if __name__ == "__main__":
    main()
