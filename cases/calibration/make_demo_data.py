"""Generate the invented Harbour Point mill stack-compression demo files (seeded, reproducible).

The materials, parameters and noise levels are invented for the demo; they are not measurements
of any real product. Run once; the CSVs are committed.
"""
import numpy as np

PSI = 4.4482216152605 / 0.0254**2  # Pa, exact definition (NIST SP 811)


def strain_at(p, k1, k2):
    return np.log1p(p / k1) / k2


def loading_levels(n, p_low, p_high):
    return np.geomspace(p_low, p_high, n)


rng = np.random.default_rng(20261202)

# 1. Newsprint 45 g/m2: strain vs kPa, loading then unloading (hysteresis: unloading strain stays higher).
k1, k2 = 4.5e3, 21.0
p = loading_levels(18, 3e3, 1.6e6)
e = strain_at(p, k1, k2) * (1 + rng.normal(0, 0.01, p.size))
e = np.maximum.accumulate(e + np.arange(p.size) * 1e-7)
p_meas = p * (1 + rng.normal(0, 0.005, p.size))
p_un = p[::-2][1:8]
e_un = e[-1] - 0.35 * (e[-1] - strain_at(p_un, k1, k2))  # recovers only part of the strain
with open("harbour_news_45.csv", "w") as f:
    f.write("# Harbour Point mill, 45 g/m2 newsprint, stack test (invented demo data)\n")
    f.write("# sample: PM2 reel 4471, 24 sheets 100 mm x 100 mm\n")
    f.write("strain,pressure [kPa]\n")
    f.write("0.00000,0.000\n")
    for a, b in zip(e, p_meas):
        f.write(f"{a:.5f},{b/1e3:.3f}\n")
    for a, b in zip(e_un, p_un):
        f.write(f"{a:.5f},{b/1e3:.3f}\n")

# 2. LWC 60 g/m2: stack height in mm vs psi, initial height and layer count in comments.
k1, k2 = 9.0e3, 28.0
h0 = 12.00e-3
p = loading_levels(16, 0.5 * PSI, 250 * PSI)
e = strain_at(p, k1, k2) * (1 + rng.normal(0, 0.008, p.size))
e = np.maximum.accumulate(e + np.arange(p.size) * 1e-7)
h = h0 * (1 - e)
with open("harbour_lwc_60_height.csv", "w") as f:
    f.write("# Harbour Point mill, 60 g/m2 coated LWC, stack test (invented demo data)\n")
    f.write("# initial_height: 12.00 mm\n")
    f.write("# layers: 200\n")
    f.write("height [mm],pressure [psi]\n")
    for a, b in zip(h, p * (1 + rng.normal(0, 0.004, p.size))):
        f.write(f"{a*1e3:.4f},{b/PSI:.3f}\n")

# 3. BOPP film 25 um: strain in percent vs kPa (a stiff stack: small strains).
k1, k2 = 18e3, 85.0
p = loading_levels(14, 5e3, 2.0e6)
e = strain_at(p, k1, k2) * (1 + rng.normal(0, 0.01, p.size))
e = np.maximum.accumulate(e + np.arange(p.size) * 1e-7)
with open("harbour_bopp_25.csv", "w") as f:
    f.write("# Harbour Point film plant, 25 um oriented polypropylene, stack test (invented demo data)\n")
    f.write("# layers: 400\n")
    f.write("strain [%],pressure [kPa]\n")
    for a, b in zip(e, p * (1 + rng.normal(0, 0.005, p.size))):
        f.write(f"{a*100:.4f},{b/1e3:.3f}\n")
