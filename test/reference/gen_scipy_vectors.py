#!/usr/bin/python3
"""Reference vectors for @psiform/orbitals, computed with SciPy (Debian python3-scipy).

Run with Debian's interpreter (the pyenv python3 first on PATH has no SciPy):
    /usr/bin/python3 test/reference/gen_scipy_vectors.py
Writes test/reference/scipy-vectors.json next to this script.

Conventions: scipy.special.sph_harm(m, l, azimuth, polar) -- azimuth first! -- includes the
Condon-Shortley phase; lpmv(m, l, x) includes it too; eval_genlaguerre(k, alpha, x) is the modern
L_k^alpha with L_k^alpha(0) = C(k+alpha, k).
"""
import json
import os

import numpy as np
import scipy
from scipy import special

# (polar theta, azimuth phi) pairs, radians; chosen off the symmetry planes
ANGLES = [(0.37, 0.21), (1.1, 2.45), (1.9, -0.8), (2.83, 4.1)]

harmonics = []
for l in range(0, 7):
    for m in range(-l, l + 1):
        for theta, phi in ANGLES:
            y = complex(special.sph_harm(m, l, phi, theta))
            harmonics.append({"l": l, "m": m, "theta": theta, "phi": phi, "re": y.real, "im": y.imag})

legendre = []
for l in range(0, 7):
    for m in range(0, l + 1):
        for x in (-0.63, 0.41):
            legendre.append({"l": l, "m": m, "x": x, "value": float(special.lpmv(m, l, x))})

laguerre = []
for k in range(0, 12):
    for alpha in (1, 3, 5, 9):
        for x in (0.25, 3.1, 11.7):
            laguerre.append({"k": k, "alpha": alpha, "x": x, "value": float(special.eval_genlaguerre(k, alpha, x))})

nodes, weights = special.roots_laguerre(20)

out = {
    "generator": "test/reference/gen_scipy_vectors.py",
    "scipy": scipy.__version__,
    "numpy": np.__version__,
    "sph_harm": harmonics,
    "lpmv": legendre,
    "eval_genlaguerre": laguerre,
    "roots_laguerre_20": {"nodes": [float(v) for v in nodes], "weights": [float(v) for v in weights]},
}
path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "scipy-vectors.json")
with open(path, "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print(f"wrote {path}: {len(harmonics)} sph_harm, {len(legendre)} lpmv, {len(laguerre)} eval_genlaguerre vectors")
