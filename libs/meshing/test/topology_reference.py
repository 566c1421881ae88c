#!/usr/bin/python3
"""Expected topology of hydrogen-like isosurfaces, from SciPy, independent of Psiform's engine and mesher.

Reads a JSON list of cases {kind: "real"|"complex", n, l, m, Z, t} on stdin (t = the |psi|^2 level, a0^-3) and
prints, per case, the number of connected surfaces and their total Euler characteristic per extracted phase:
{"+": [components, euler], "-": [...]} for real states, {"complex": [...]} for complex ones.

Why this is the true topology (one (n, l) block, psi = R(r) Y(theta, phi)):
- |R| has one maximum M_k in each radial lobe k (between consecutive roots of L_{n-l-1}^{2l+1}, found here with
  scipy.special.roots_genlaguerre), so inside lobe k the set |psi| > c is {|Y| > c / M_k} x (one r-interval);
  its surface has Euler characteristic 2 chi(D) for each angular component D (a disc gives a sphere, 2; a band
  around an axis gives a torus, 0); the whole sphere gives a shell (two spheres) or, for the first lobe of an s
  state, a ball.
- Y_l0 and |Y_lm| depend on theta only: their superlevel sets are bands between consecutive zeros of P_l^m
  (scipy.special.lpmv), one interval per band since |P_l^m| has one extremum between zeros; a band containing a
  pole (only possible for m = 0) is a disc, any other band an annulus.
- The real forms with m != 0 are sqrt2 K P_l^m(cos theta) cos(m phi) (or sin): each band of P_l^m times each of
  the 2m wedges between zeros of cos(m phi) is a disc; signs alternate wedge by wedge.
Real psi is extracted by sign ('+': psi > c, '-': psi < -c); a complex state's |psi| = c is one surface.
"""
import json
import math
import sys

import numpy as np
from scipy import optimize, special


def radial(n, l, Z):
    k = n - l - 1
    a = 2 * l + 1
    N = math.sqrt((2 * Z / n) ** 3 * math.factorial(k) / (2 * n * math.factorial(n + l)))

    def R(r):
        rho = 2 * Z * r / n
        return N * rho ** l * math.exp(-rho / 2) * special.eval_genlaguerre(k, a, rho)

    nodes = []
    if k > 0:
        x, _ = special.roots_genlaguerre(k, a)
        nodes = sorted(float(v) * n / (2 * Z) for v in x)
    bounds = [0.0] + nodes + [None]
    lobes = []
    for i in range(len(bounds) - 1):
        lo = bounds[i]
        hi = bounds[i + 1] if bounds[i + 1] is not None else (lo + 10 * n * n / Z)
        grid = np.linspace(lo, hi, 4001)
        vals = np.array([abs(R(r)) for r in grid])
        j = int(np.argmax(vals))
        a0 = grid[max(j - 1, 0)]
        b0 = grid[min(j + 1, len(grid) - 1)]
        res = optimize.minimize_scalar(lambda r: -abs(R(r)), bounds=(a0, b0), method='bounded', options={'xatol': 1e-13})
        peak = max(abs(R(res.x)), vals[j], abs(R(lo)))
        lobes.append({'peak': peak, 'sign': 1 if i % 2 == 0 else -1, 'ball': l == 0 and i == 0})
    return lobes


def bands(l, m):
    """Zeros of P_l^m(mu) in (-1, 1) and the bands between them: (lo, hi, sign, max |P|)."""
    P = lambda mu: special.lpmv(m, l, mu)
    xs = np.linspace(-1, 1, 20001)
    vs = np.array([P(x) for x in xs])
    zeros = []
    for i in range(len(xs) - 1):
        if vs[i] == 0 and 0 < i:
            zeros.append(xs[i])
        elif vs[i] * vs[i + 1] < 0:
            zeros.append(optimize.brentq(P, xs[i], xs[i + 1], xtol=1e-15))
    edges = [-1.0] + zeros + [1.0]
    out = []
    for i in range(len(edges) - 1):
        lo, hi = edges[i], edges[i + 1]
        sel = (xs > lo) & (xs < hi)
        if not sel.any():
            continue
        seg = vs[sel]
        k = int(np.argmax(np.abs(seg)))
        xk = xs[sel][k]
        res = optimize.minimize_scalar(lambda mu: -abs(P(mu)), bounds=(max(lo, xk - 2e-4), min(hi, xk + 2e-4)), method='bounded', options={'xatol': 1e-14})
        mx = max(abs(P(res.x)), abs(seg[k]), abs(P(lo)), abs(P(hi)))
        out.append((lo, hi, 1 if seg[k] > 0 else -1, mx))
    return out


def expected(case):
    kind, n, l, m, Z, t = case['kind'], case['n'], case['l'], abs(case['m']), case['Z'], case['t']
    c = math.sqrt(t)
    K = math.sqrt((2 * l + 1) / (4 * math.pi) * math.factorial(l - m) / math.factorial(l + m))
    count = {'+': [0, 0], '-': [0, 0]}
    for lobe in radial(n, l, Z):
        s = c / lobe['peak']
        if l == 0:
            if K > s:
                p = '+' if lobe['sign'] > 0 else '-'
                count[p][0] += 1 if lobe['ball'] else 2
                count[p][1] += 2 if lobe['ball'] else 4
            continue
        for lo, hi, sgn, mx in bands(l, m):
            if kind == 'real' and m != 0:
                if math.sqrt(2) * K * mx > s:
                    # 2m wedges, alternating in sign: m of each phase, each a sphere.
                    count['+'][0] += m
                    count['+'][1] += 2 * m
                    count['-'][0] += m
                    count['-'][1] += 2 * m
                continue
            if K * mx <= s:
                continue
            p = '+' if lobe['sign'] * sgn > 0 else '-'
            at_pole = (lo == -1.0 and K * abs(special.lpmv(m, l, -1.0)) > s) or (hi == 1.0 and K * abs(special.lpmv(m, l, 1.0)) > s)
            count[p][0] += 1
            count[p][1] += 2 if at_pole else 0
    if kind == 'complex':
        return {'complex': [count['+'][0] + count['-'][0], count['+'][1] + count['-'][1]]}
    return count


if __name__ == '__main__':
    print(json.dumps([expected(c) for c in json.load(sys.stdin)]))
