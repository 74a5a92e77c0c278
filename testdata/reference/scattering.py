#!/usr/bin/python3
"""Photon scattering in a far-detuned lattice for atom/scattering_test.go.

Writes scattering.json beside this script. Independent of the Go code's
far-detuned expansion: each D line is a classical oscillator with
radiation damping Gamma_w = (omega/omega_0)^2 Gamma (Grimm, Weidemueller &
Ovchinnikov, Adv. At. Mol. Opt. Phys. 42, 95 (2000), eqs. (5) and (6)),

    alpha_i = w_i 6 pi eps0 c^3 (Gamma_i/omega_i^2) / (omega_i^2 - omega^2 - i (omega^3/omega_i^2) Gamma_i),

summed over D1 (w = 1/3) and D2 (w = 2/3) for linear polarisation (their
eq. (19)); U = -Re(alpha) I / (2 eps0 c) and Gamma_sc = Im(alpha) I /
(hbar eps0 c) (their eqs. (2) and (3)), in complex arithmetic. Its far-
detuned limit is their eqs. (10) and (11), with the counter-rotating
terms; the two agree to order Gamma/Delta (below 1e-5 here).

Atomic data (Steck, "Rubidium 87 D Line Data", revision 2.1.5, from
memory): D1 377.107463380 THz, tau 27.679 ns; D2 384.2304844685 THz,
tau 26.2348 ns; mass 86.909180520 u. CODATA 2018 constants.

Run with Debian's numpy:  /usr/bin/python3 testdata/reference/scattering.py
"""
import json
import os
import platform

import numpy as np

C = 299792458.0
H = 6.62607015e-34
HBAR = H / (2 * np.pi)
EPS0 = 8.8541878128e-12
M = 86.909180520 * 1.66053906660e-27
LINES = [(377.107463380e12, 1 / 27.679e-9, 1 / 3), (384.2304844685e12, 1 / 26.2348e-9, 2 / 3)]


def alpha(lam, shares=None):
    w = 2 * np.pi * C / lam
    a = 0j
    for i, (nu, gam, share) in enumerate(LINES):
        if shares is not None:
            share = shares[i]
        w0 = 2 * np.pi * nu
        a += share * 6 * np.pi * EPS0 * C**3 * (gam / w0**2) / (w0**2 - w**2 - 1j * (w**3 / w0**2) * gam)
    return a


rows = []
for nm in [532.0, 770.0, 775.0, 785.0, 787.0, 789.0, 790.0, 791.0, 793.0, 800.0, 810.0, 830.0, 852.0, 1064.0, 1550.0]:
    lam = nm * 1e-9
    a = alpha(lam)
    u = -a.real / (2 * EPS0 * C)  # J per W/m^2
    g = a.imag / (HBAR * EPS0 * C)  # 1/s per W/m^2
    er = H / (2 * M * lam**2)  # Hz
    rows.append({
        "wavelength_nm": nm,
        "potential_j_per_w_m2": u,
        "scattering_per_w_m2": g,
        "scattering_per_depth_hz": g / abs(u / H),
        "rate_at_20_recoils_per_s": g / abs(u / H) * 20 * er,
    })

# A spin-dependent lattice: light of circular polarisation P on a state
# with g_F m_F = gm has the line shares (1 - P gm)/3 (D1) and (2 + P gm)/3
# (D2) (Grimm et al. 2000, eq. (20)); g_F = +1/2 for F = 2, -1/2 for F = 1.
polarised = []
for nm in [785.0, 787.0, 789.0, 791.0, 800.0, 1064.0]:
    for p in [1.0, -1.0, 0.5]:
        for f, m in [(1, -1), (1, 1), (1, 0), (2, -2), (2, 2), (2, 1)]:
            gm = (0.5 if f == 2 else -0.5) * m
            lam = nm * 1e-9
            a = alpha(lam, [(1 - p * gm) / 3, (2 + p * gm) / 3])
            u = -a.real / (2 * EPS0 * C)
            g = a.imag / (HBAR * EPS0 * C)
            polarised.append({
                "wavelength_nm": nm, "polarisation": p, "f": f, "m": m,
                "potential_j_per_w_m2": u,
                "scattering_per_depth_hz": g / abs(u / H),
            })

out = {
    "generator": "testdata/reference/scattering.py",
    "numpy": np.__version__,
    "python": platform.python_version(),
    "rows": rows,
    "polarised": polarised,
}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "scattering.json"), "w") as fh:
    json.dump(out, fh, indent=1)
