#!/usr/bin/env python3
"""Speed ratio of the Rust accretion solver against a NumPy/SciPy implementation of the same
scheme (per-layer Hakiel increments, explicit Er, one LAPACK banded solve per layer through
scipy.linalg.solve_banded) on the same 8,000-layer film roll, measured in one run.

Usage (from the repository root, after `cargo build --release --example solve_roll`):
    python3 benches/scipy_speed.py [layers]
Not part of the test suite (lives in benches/, not tests/reference/).

Each side runs REPEATS times (default 3) and the best run counts; the medians are printed too.
Prints two ratios: wall clock (what an idle machine shows) and processor time (user + system,
this process for SciPy, the child process for Rust), which stays meaningful on a shared machine
where wall clock mostly measures the wait for a core. SOLVE_ROLL=PATH runs another build of the
example binary (e.g. a copy built from an older commit) for a before/after comparison.
"""
import os
import resource
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
    repeats = int(os.environ.get("REPEATS", "3"))
    # Best of several runs on both sides: one run of either is easily slowed by whatever else
    # the machine does, and the slower side's noise would then decide the ratio.
    scipy_runs, scipy_cpu = [], []
    for _ in range(repeats):
        start, cpu_start = time.perf_counter(), time.process_time()
        p_scipy = scipy_explicit(layers)
        scipy_runs.append(time.perf_counter() - start)
        scipy_cpu.append(time.process_time() - cpu_start)
    t_scipy, c_scipy = min(scipy_runs), min(scipy_cpu)
    binary = os.environ.get("SOLVE_ROLL") or ROOT / "target" / "release" / "examples" / "solve_roll"
    runs, cpu_runs = [], []
    for _ in range(repeats):
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        start = time.perf_counter()
        out = subprocess.run([str(binary), "film", "per_layer", "explicit"], check=True,
                             capture_output=True, text=True).stdout
        runs.append(time.perf_counter() - start)
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        cpu_runs.append(after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime)
    t_rust, c_rust = min(runs), min(cpu_runs)
    med = lambda xs: sorted(xs)[len(xs) // 2]
    p_rust = float(out.split("core pressure ")[1].split(" ")[0])
    print(f"layers {layers}: SciPy {t_scipy:.3f} s (core pressure {p_scipy:.6e} Pa), "
          f"Rust {t_rust:.3f} s incl. process start (core pressure {p_rust:.6e} Pa), "
          f"ratio {t_scipy / t_rust:.1f}x, relative difference {abs(p_rust - p_scipy) / p_scipy:.2e}")
    print(f"processor time: SciPy {c_scipy:.3f} s, Rust {c_rust:.3f} s incl. process start, "
          f"ratio {c_scipy / c_rust:.1f}x")
    print(f"best of {repeats} each side; medians: SciPy {med(scipy_runs):.3f} s, "
          f"Rust {med(runs):.3f} s, ratio {med(scipy_runs) / med(runs):.1f}x")


if __name__ == "__main__":
    main()
