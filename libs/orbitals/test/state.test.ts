import { describe, expect, it } from 'vitest';
import {
  F_CUBIC_SET,
  F_GENERAL_SET,
  HYBRID_SETS,
  OrbitalState,
  compileState,
  hybridDirection,
  isRealState,
  normaliseState,
  parseOrbitalLabel,
  prettyLabel,
  stateFromNlm,
  stateNormSquared,
  toComplexBasis,
  toRealBasis,
  validateQuantumNumbers,
  validateState,
} from '../src';

describe('validateQuantumNumbers', () => {
  it('accepts valid (n, l, m) and names the broken rule otherwise', () => {
    expect(validateQuantumNumbers(1, 0, 0)).toBeNull();
    expect(validateQuantumNumbers(12, 11, -11)).toBeNull();
    expect(validateQuantumNumbers(0, 0, 0)).toMatch(/n must be between 1 and 12/);
    expect(validateQuantumNumbers(13, 0, 0)).toMatch(/n must be between 1 and 12/);
    expect(validateQuantumNumbers(2.5, 0, 0)).toMatch(/n must be an integer/);
    expect(validateQuantumNumbers(3, 3, 0)).toBe('l must be less than n (got n=3, l=3)');
    expect(validateQuantumNumbers(3, -1, 0)).toBe('l must be at least 0 (got l=-1)');
    expect(validateQuantumNumbers(3, 1, 2)).toBe('|m| must not exceed l (got l=1, m=2)');
    expect(validateQuantumNumbers(3, 1, 0.5)).toMatch(/m must be an integer/);
  });
});

describe('parseOrbitalLabel', () => {
  it('parses real labels into real-basis terms', () => {
    const cases: Array<[string, string, number, number, number]> = [
      ['1s', '1s', 1, 0, 0],
      ['2pz', '2pz', 2, 1, 0],
      ['2p_x', '2px', 2, 1, 1],
      ['2py', '2py', 2, 1, -1],
      ['3dxy', '3dxy', 3, 2, -2],
      ['3d_{yz}', '3dyz', 3, 2, -1],
      ['3dz2', '3dz2', 3, 2, 0],
      ['3d_z²', '3dz2', 3, 2, 0],
      ['3dxz', '3dxz', 3, 2, 1],
      ['3dx2-y2', '3dx2-y2', 3, 2, 2],
      ['3d_x²−y²', '3dx2-y2', 3, 2, 2],
      ['4fxyz', '4fxyz', 4, 3, -2],
      ['5fz(x2-y2)', '5fz(x2-y2)', 5, 3, 2],
    ];
    for (const [lab, canon, n, l, m] of cases) {
      const p = parseOrbitalLabel(lab);
      expect(p.label).toBe(canon);
      expect(p.isReal).toBe(true);
      expect(p.state).toEqual({ Z: 1, terms: [{ n, l, m, basis: 'real', re: 1, im: 0 }] });
    }
    expect(parseOrbitalLabel('4fx3').state.terms.map((t) => t.m)).toEqual([1, 3]);
    expect(parseOrbitalLabel('2pz', { Z: 3 }).state.Z).toBe(3);
  });

  it('parses complex labels 2p+1, 3d-2, 4f0', () => {
    const p = parseOrbitalLabel('2p+1');
    expect(p.state.terms).toEqual([{ n: 2, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }]);
    expect(p.isReal).toBe(false);
    expect(parseOrbitalLabel('3d-2').state.terms[0].m).toBe(-2);
    expect(parseOrbitalLabel('4f0').isReal).toBe(true);
  });

  it('rejects bad labels with readable messages', () => {
    expect(() => parseOrbitalLabel('')).toThrow(/non-empty/);
    expect(() => parseOrbitalLabel('1p')).toThrow(/l must be less than n \(got n=1, l=1\)/);
    expect(() => parseOrbitalLabel('13s')).toThrow(/between 1 and 12/);
    expect(() => parseOrbitalLabel('3dq')).toThrow(/not recognised.*dxy/);
    expect(() => parseOrbitalLabel('2p+2')).toThrow(/\|m\| must not exceed l/);
    expect(() => parseOrbitalLabel('2p1')).toThrow(/sign of m/);
    expect(() => parseOrbitalLabel('sp3#5')).toThrow(/#1\.\.#4/);
    expect(() => parseOrbitalLabel('banana')).toThrow(/not recognised/);
    expect(() => parseOrbitalLabel('1s', { Z: -1 })).toThrow(/Z must be/);
  });

  it('lists the seven general-set and seven cubic-set f labels, all parseable and real', () => {
    expect(F_GENERAL_SET).toHaveLength(7);
    expect(F_CUBIC_SET).toHaveLength(7);
    for (const f of [...F_GENERAL_SET, ...F_CUBIC_SET]) {
      const p = parseOrbitalLabel(`4${f}`);
      expect(p.label).toBe(`4${f}`);
      expect(p.isReal).toBe(true);
      expect(stateNormSquared(p.state)).toBeCloseTo(1, 14);
    }
  });

  it('prettyLabel renders trade notation', () => {
    expect(prettyLabel('3dxy')).toBe('3d_xy');
    expect(prettyLabel('3dz2')).toBe('3d_z²');
    expect(prettyLabel('3dx2-y2')).toBe('3d_x²−y²');
    expect(prettyLabel('1s')).toBe('1s');
    expect(prettyLabel('4fx3')).toBe('4f_x³');
    expect(prettyLabel('sp3#2')).toBe('sp³ #2');
    expect(prettyLabel('2p+1')).toBe('2p(m=+1)');
    expect(prettyLabel(stateFromNlm(5, 4, -3))).toBe('5g(s3)');
  });

  it('every named form prints its own name, from the label or from its terms (cubic f are stored as two terms)', () => {
    for (const name of [...F_GENERAL_SET, ...F_CUBIC_SET]) {
      const p = parseOrbitalLabel(`4${name}`);
      const byLabel = prettyLabel(`4${name}`);
      expect(byLabel).not.toMatch(/[+·]/);
      expect(prettyLabel(p.state)).toBe(byLabel);
    }
    expect(prettyLabel('4fx(y2-z2)')).toBe('4f_x(y²−z²)');
    expect(prettyLabel('4fy(z2-x2)')).toBe('4f_y(z²−x²)');
    // Any positive common factor names the same form (the engine normalises); a negative one is written as −.
    const t = parseOrbitalLabel('5fx(y2-z2)').state.terms.map((x) => ({ ...x, re: -3 * x.re }));
    expect(prettyLabel({ Z: 1, terms: t })).toBe('−5f_x(y²−z²)');
    // Hybrids from their terms; other sums with their signed coefficients.
    expect(prettyLabel(parseOrbitalLabel('sp3#2').state)).toBe('sp³ #2');
    expect(prettyLabel(parseOrbitalLabel('4sp2#3').state)).toBe('4sp² #3');
    expect(prettyLabel({ Z: 1, terms: [{ n: 2, l: 0, m: 0, basis: 'real', re: 0.6, im: 0 }, { n: 3, l: 2, m: 0, basis: 'real', re: -0.8, im: 0 }] })).toBe('0.6·2s − 0.8·3d_z²');
  });
});

describe('basis changes and normalisation', () => {
  it('toComplexBasis: p_x = (Y_1,-1 − Y_11)/√2 and p_y = i(Y_1,-1 + Y_11)/√2 (Condon–Shortley; common practice)', () => {
    const px = toComplexBasis(parseOrbitalLabel('2px').state).terms;
    const round = (v: number) => Math.round(v * 1e14) / 1e14 + 0;
    expect(px.map((t) => [t.m, round(t.re), round(t.im)])).toEqual([
      [-1, round(Math.SQRT1_2), 0],
      [1, round(-Math.SQRT1_2), 0],
    ]);
    const py = toComplexBasis(parseOrbitalLabel('2py').state).terms;
    expect(py.map((t) => [t.m, round(t.re), round(t.im)])).toEqual([
      [-1, 0, round(Math.SQRT1_2)],
      [1, 0, round(Math.SQRT1_2)],
    ]);
  });

  it('merges terms: (p_x + i p_y)/√2 = −Y_11 (so it is complex); p_x − i p_y ∝ Y_1,-1', () => {
    const s: OrbitalState = {
      Z: 1,
      terms: [
        { n: 2, l: 1, m: 1, basis: 'real', re: Math.SQRT1_2, im: 0 },
        { n: 2, l: 1, m: -1, basis: 'real', re: 0, im: Math.SQRT1_2 },
      ],
    };
    const cx = toComplexBasis(s);
    expect(cx.terms).toHaveLength(1);
    expect(cx.terms[0].m).toBe(1);
    expect(cx.terms[0].re).toBeCloseTo(-1, 15);
    expect(isRealState(s)).toBe(false);
  });

  it('toRealBasis inverts toComplexBasis', () => {
    const s: OrbitalState = {
      Z: 2,
      terms: [
        { n: 3, l: 2, m: 1, basis: 'complex', re: 0.3, im: -0.2 },
        { n: 3, l: 2, m: -2, basis: 'complex', re: 0.1, im: 0.5 },
        { n: 2, l: 0, m: 0, basis: 'real', re: 0.4, im: 0 },
      ],
    };
    const back = toComplexBasis(toRealBasis(s));
    const fwd = toComplexBasis(s);
    expect(back.terms).toHaveLength(fwd.terms.length);
    for (let i = 0; i < fwd.terms.length; i++) {
      expect(back.terms[i].m).toBe(fwd.terms[i].m);
      expect(back.terms[i].re).toBeCloseTo(fwd.terms[i].re, 14);
      expect(back.terms[i].im).toBeCloseTo(fwd.terms[i].im, 14);
    }
  });

  it('normaliseState uses the orthonormal complex basis (p_x and Y_11 of the same n, l overlap)', () => {
    const s: OrbitalState = {
      Z: 1,
      terms: [
        { n: 2, l: 1, m: 1, basis: 'real', re: 1, im: 0 },
        { n: 2, l: 1, m: 1, basis: 'complex', re: 1, im: 0 },
      ],
    };
    // p_x + Y_11 = (1/√2) Y_-1 + (1 − 1/√2) Y_1  ->  |c|² = 1/2 + (1 − 1/√2)² = 2 − √2
    expect(stateNormSquared(s)).toBeCloseTo(2 - Math.SQRT2, 14);
    const n = normaliseState(s);
    expect(stateNormSquared(n)).toBeCloseTo(1, 14);
    expect(n.terms[0].basis).toBe('real');
    expect(() => normaliseState({ Z: 1, terms: [{ n: 1, l: 0, m: 0, basis: 'real', re: 0, im: 0 }] })).toThrow(/zero norm/);
  });

  it('isRealState: c_{-m} = (-1)^m conj(c_m)', () => {
    expect(isRealState(parseOrbitalLabel('3dxy').state)).toBe(true);
    expect(isRealState(stateFromNlm(3, 2, 2, { complex: true }))).toBe(false);
    // Y_22 + Y_2,-2 is real (∝ x²−y²); Y_21 + Y_2,-1 is imaginary (∝ i yz)
    const mk = (m: number, s: number): OrbitalState => ({
      Z: 1,
      terms: [
        { n: 3, l: 2, m, basis: 'complex', re: 1, im: 0 },
        { n: 3, l: 2, m: -m, basis: 'complex', re: s, im: 0 },
      ],
    });
    expect(isRealState(mk(2, 1))).toBe(true);
    expect(isRealState(mk(1, 1))).toBe(false);
    expect(isRealState(mk(1, -1))).toBe(true);
    // a real state times i is no longer real-valued
    expect(isRealState({ Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'real', re: 0, im: 1 }] })).toBe(false);
  });

  it('validateState names the bad field', () => {
    expect(validateState({ Z: 1, terms: [] })).toMatch(/non-empty/);
    expect(validateState({ Z: 0, terms: [] })).toMatch(/Z must be/);
    expect(validateState({ Z: 1, terms: [{ n: 2, l: 2, m: 0, basis: 'real', re: 1, im: 0 }] })).toMatch(/terms\[0\]: l must be less than n \(got n=2, l=2\)/);
    expect(validateState({ Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: NaN, im: 0 }] })).toMatch(/terms\[0\].*finite/);
    expect(() => stateFromNlm(2, 1, 3)).toThrow(/\|m\| must not exceed l/);
  });
});

describe('hybrid orbitals (textbook forms, coefficients from memory; verified here)', () => {
  it('every set is orthonormal (complex-basis inner products)', () => {
    for (const set of HYBRID_SETS) {
      const members: OrbitalState[] = [];
      for (let i = 1; ; i++) {
        try {
          members.push(parseOrbitalLabel(`${set}#${i}`).state);
        } catch {
          break;
        }
      }
      expect(members.length).toBe({ sp: 2, sp2: 3, sp3: 4, sp3d: 5, sp3d2: 6 }[set]);
      const vec = (s: OrbitalState) => new Map(toComplexBasis(s).terms.map((t) => [`${t.n},${t.l},${t.m}`, t]));
      for (let a = 0; a < members.length; a++) {
        for (let b = 0; b < members.length; b++) {
          const va = vec(members[a]);
          const vb = vec(members[b]);
          let re = 0;
          let im = 0;
          for (const [k, ta] of va) {
            const tb = vb.get(k);
            if (!tb) continue;
            re += ta.re * tb.re + ta.im * tb.im;
            im += ta.re * tb.im - ta.im * tb.re;
          }
          expect(Math.abs(re - (a === b ? 1 : 0))).toBeLessThan(1e-14);
          expect(Math.abs(im)).toBeLessThan(1e-14);
        }
      }
    }
  });

  it('default member is #1; sp/sp2/sp3 use n = 2, sp3d/sp3d2 n = 3', () => {
    expect(parseOrbitalLabel('sp3').label).toBe('sp3#1');
    expect(parseOrbitalLabel('sp3').state.terms.every((t) => t.n === 2)).toBe(true);
    expect(parseOrbitalLabel('sp3d2#4').state.terms.every((t) => t.n === 3)).toBe(true);
    expect(parseOrbitalLabel('sp2').isReal).toBe(true);
    // outer-lobe sign folded in: 2s enters with (-1)^(2-0-1) = -1, 2p with +1
    expect(parseOrbitalLabel('sp3').state.terms.map((t) => t.re)).toEqual([-0.5, 0.5, 0.5, 0.5]);
  });

  // Largest |psi| over a Fibonacci sphere of directions at radius r (outside every radial node of the
  // components); returns that direction and checks the lobe there is positive.
  function lobeDirection(label: string, r: number): [number, number, number] {
    const c = compileState(parseOrbitalLabel(label).state);
    const N = 40000;
    let best: [number, number, number] = [0, 0, 1];
    let bestV = -Infinity;
    const ga = Math.PI * (3 - Math.sqrt(5));
    for (let i = 0; i < N; i++) {
      const z = 1 - (2 * (i + 0.5)) / N;
      const s = Math.sqrt(1 - z * z);
      const x = s * Math.cos(ga * i);
      const y = s * Math.sin(ga * i);
      const v = c.evaluate(r * x, r * y, r * z).re;
      if (Math.abs(v) > bestV) {
        bestV = Math.abs(v);
        best = [x, y, z];
      }
    }
    expect(c.evaluate(r * best[0], r * best[1], r * best[2]).re).toBeGreaterThan(0);
    return best;
  }

  it('sp3 lobes point along the tetrahedral directions (1,1,1), (1,−1,−1), (−1,1,−1), (−1,−1,1)', () => {
    const want = [
      [1, 1, 1],
      [1, -1, -1],
      [-1, 1, -1],
      [-1, -1, 1],
    ];
    for (let i = 0; i < 4; i++) {
      const d = lobeDirection(`sp3#${i + 1}`, 4); // beyond the 2s node at 2 a0
      const w = want[i].map((v) => v / Math.sqrt(3));
      const cos = d[0] * w[0] + d[1] * w[1] + d[2] * w[2];
      expect(cos).toBeGreaterThan(Math.cos((2 * Math.PI) / 180));
      expect(hybridDirection(`sp3#${i + 1}`)?.map((v) => Math.round(v * 1e12) / 1e12)).toEqual(w.map((v) => Math.round(v * 1e12) / 1e12));
    }
    // tetrahedral angle between lobes: cos = −1/3
    const a = lobeDirection('sp3#1', 4);
    const b = lobeDirection('sp3#2', 4);
    expect(a[0] * b[0] + a[1] * b[1] + a[2] * b[2]).toBeCloseTo(-1 / 3, 1);
  });

  it('sp, sp2, sp3d and sp3d2 lobes point along their stated directions', () => {
    for (const set of ['sp', 'sp2', 'sp3d', 'sp3d2']) {
      const count = { sp: 2, sp2: 3, sp3d: 5, sp3d2: 6 }[set] as number;
      const r = set.includes('d') ? 10 : 4; // outside the last radial node of 2s / 3s
      for (let i = 1; i <= count; i++) {
        const d = lobeDirection(`${set}#${i}`, r);
        const w = hybridDirection(`${set}#${i}`)!;
        expect(d[0] * w[0] + d[1] * w[1] + d[2] * w[2]).toBeGreaterThan(Math.cos((2 * Math.PI) / 180));
      }
    }
  });
});
