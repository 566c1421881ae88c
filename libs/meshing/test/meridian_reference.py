#!/usr/bin/python3
"""Expected topology of an axially symmetric hydrogen-like isosurface (the textbook hybrids), from SciPy.

Reads a JSON list of cases {n, Z, t, terms: [[l, a_l], ...]} on stdin: psi = sum_l a_l R_nl(r) Y_l0(theta) about
the hybrid's own axis (every textbook hybrid is symmetric about its lobe direction; t = the |psi|^2 level, a0^-3).
Prints per case {"+": [components, euler], "-": [components, euler]} of the surfaces psi = +c and psi = -c.

Method (independent of Psiform's engine and mesher): a solid of revolution is fixed by its meridian section Q in
the half-plane {(s, z): s >= 0}. Each connected piece of Q meeting the axis in j segments bounds j surfaces that
meet the axis (spheres, Euler 2 each); each hole of Q away from the axis bounds a torus (Euler 0); a piece not
meeting the axis bounds a torus for its outer edge too. The section is sampled on a polar grid (r = R u^2, fine
near the nucleus, and theta in [0, pi]) and labelled with scipy.ndimage (4-connected set, 8-connected complement).
"""
import json
import math
import sys

import numpy as np
from scipy import ndimage, special


def R_nl(n, l, Z, r):
    k = n - l - 1
    N = math.sqrt((2 * Z / n) ** 3 * math.factorial(k) / (2 * n * math.factorial(n + l)))
    rho = 2 * Z * r / n
    return N * rho ** l * np.exp(-rho / 2) * special.eval_genlaguerre(k, 2 * l + 1, rho)


def psi(case, r, mu):
    out = np.zeros_like(r)
    for l, a in case['terms']:
        out += a * R_nl(case['n'], l, case['Z'], r) * math.sqrt((2 * l + 1) / (4 * math.pi)) * special.eval_legendre(l, mu)
    return out


def count(mask):
    """Surfaces bounding the solid of revolution of the meridian set `mask` (axis along theta = 0 and pi)."""
    nu, nt = mask.shape
    lab, k = ndimage.label(mask)  # 4-connected
    # Pixels at u = 0 are all the nucleus: join the labels found there.
    first = [x for x in np.unique(lab[0]) if x > 0]
    for x in first[1:]:
        lab[lab == x] = first[0]
    comps, euler = 0, 0
    comp_lab, ck = ndimage.label(~mask, structure=np.ones((3, 3)))  # complement, 8-connected
    for x in np.unique(lab):
        if x == 0:
            continue
        Q = lab == x
        # Axis segments: walk the axis from z = -R (theta = pi, u max) through the nucleus to z = +R.
        axis = np.concatenate([Q[::-1, -1], Q[:, 0]])
        j = int(np.sum(axis[1:] & ~axis[:-1]) + (1 if axis[0] else 0))
        # Holes of Q: complement pieces enclosed by Q that touch neither the axis nor the outer edge u = max.
        holes = 0
        dil = ndimage.binary_dilation(Q, structure=np.ones((3, 3)))
        for y in np.unique(comp_lab[dil & ~Q]):
            if y == 0:
                continue
            C = comp_lab == y
            if C[:, 0].any() or C[:, -1].any() or C[-1, :].any() or C[0, :].any():
                continue
            # enclosed by this piece only: every neighbour of C lies in Q
            ring = ndimage.binary_dilation(C, structure=np.ones((3, 3))) & ~C
            if np.all(Q[ring]):
                holes += 1
        comps += (j if j > 0 else 1) + holes
        euler += 2 * j
    return [comps, euler]


def expected(case):
    c = math.sqrt(case['t'])
    Rm = case['rmax']
    nu, nt = case.get('nu', 1600), case.get('nt', 1440)
    u = (np.arange(nu) + 0.5) / nu
    r = Rm * u * u
    th = (np.arange(nt) + 0.5) * math.pi / nt
    rr, tt = np.meshgrid(r, th, indexing='ij')
    f = psi(case, rr, np.cos(tt))
    return {'+': count(f > c), '-': count(f < -c)}


if __name__ == '__main__':
    print(json.dumps([expected(c) for c in json.load(sys.stdin)]))
