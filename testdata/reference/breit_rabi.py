#!/usr/bin/python3
"""Rubidium-87 ground-state Zeeman energies for atom/zeeman_test.go.

Writes breit_rabi.json beside this script: the eight levels |F, m> of the
5S_1/2 ground state at a few fields, from a direct numpy diagonalisation of
the 8x8 Hamiltonian in the uncoupled basis |m_J, m_I>

    H/h = A I.J + mu_B B (g_J J_z + g_I I_z),   A = dE_hfs / (I + 1/2),

(Steck, "Rubidium 87 D Line Data", eqs. (16) and (23)), with no use of the
Breit-Rabi formula. Each eigenvector is labelled by its m_F = <F_z> and,
within an m_F, the higher level is F = 2. Also written: the linear and
quadratic coefficients of five spin pairs at the bias fields, from central
finite differences of the diagonalised energies (step 0.1 G; the truncation
errors are below 1e-3 Hz/G and 1e-6 Hz/G^2, rounding of the eigenvalues
(about 1e-5 Hz) adds up to about 1e-3 Hz/G^2).

Constants (the same as atom/rb87.go; Steck revision 2.1.5, from memory):
dE_hfs = 6834682610.904290 Hz, g_J = 2.00233113, g_I = -0.0009951414,
mu_B/h = 1.39962449361e6 Hz/G (CODATA 2018).

Run with Debian's numpy:  /usr/bin/python3 testdata/reference/breit_rabi.py
"""
import json
import os
import platform

import numpy as np

DE = 6834682610.904290
GJ = 2.00233113
GI = -0.0009951414
MUB = 1.39962449361e6
I = 1.5
J = 0.5


def spin(j):
    m = np.arange(j, -j - 1, -1)
    jp = np.zeros((len(m), len(m)))
    for k in range(1, len(m)):
        jp[k - 1, k] = np.sqrt(j * (j + 1) - m[k] * (m[k] + 1))
    jx = (jp + jp.T) / 2
    jy = (jp - jp.T) / 2j
    jz = np.diag(m)
    return jx, jy, jz


jx, jy, jz = spin(J)
ix, iy, iz = spin(I)
eJ, eI = np.eye(2), np.eye(4)
Jx, Jy, Jz = (np.kron(a, eI) for a in (jx, jy, jz))
Ix, Iy, Iz = (np.kron(eJ, a) for a in (ix, iy, iz))
A = DE / (I + 0.5)
H0 = A * (Jx @ Ix + Jy @ Iy + Jz @ Iz)
HB = MUB * (GJ * Jz + GI * Iz)
Fz = Jz + Iz


def levels(b):
    w, v = np.linalg.eigh(H0 + b * HB)
    out = {}
    mf = np.real(np.einsum("ij,ik,kj->j", v.conj(), Fz, v))
    for m in (-2, -1, 0, 1, 2):
        idx = sorted([k for k in range(8) if abs(mf[k] - m) < 1e-6], key=lambda k: w[k])
        if abs(m) == 2:
            out[(2, m)] = w[idx[0]].real
        else:
            out[(1, m)] = w[idx[0]].real
            out[(2, m)] = w[idx[1]].real
    return out


FIELDS = [0.0, 0.1, 1.0, 3.23, 10.0, 100.0, 1000.0, 5000.0]
energies = []
for b in FIELDS:
    lv = levels(b)
    for (f, m), e in sorted(lv.items()):
        energies.append({"field_g": b, "f": f, "m": m, "energy_hz": e})

PAIRS = [((1, 0), (2, 0)), ((1, -1), (2, -2)), ((1, -1), (2, 1)), ((1, 1), (2, -1)), ((1, -1), (2, -1))]
BIAS = [0.0, 1.0, 3.23, 10.0]
H = 0.1
coeffs = []
for lo, up in PAIRS:
    for b in BIAS:
        d = [levels(b + k * H)[up] - levels(b + k * H)[lo] for k in (-1, 0, 1)]
        coeffs.append({
            "lower": list(lo), "upper": list(up), "bias_g": b,
            "linear_hz_per_g": (d[2] - d[0]) / (2 * H),
            "quadratic_hz_per_g2": (d[2] - 2 * d[1] + d[0]) / (2 * H * H),
        })

out = {
    "generator": "testdata/reference/breit_rabi.py",
    "numpy": np.__version__,
    "python": platform.python_version(),
    "energies": energies,
    "coefficients": coeffs,
}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "breit_rabi.json"), "w") as fh:
    json.dump(out, fh, indent=1)
