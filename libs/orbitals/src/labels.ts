import { L_LETTERS, assertZ, validateQuantumNumbers } from './quantum';
import { OrbitalState, Term, isRealState, toComplexBasis } from './state';

const { SQRT1_2, abs, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** A real angular function written as a combination of real forms (l, m) of the same l. */
interface RealCombo {
  l: number;
  parts: ReadonlyArray<readonly [m: number, coef: number]>;
  /** Display subscript, e.g. 'xy', 'z²'. */
  pretty: string;
  /** Canonical ASCII name, e.g. 'dxy', 'dx2-y2'. */
  name: string;
}

const R6 = sqrt(6) / 4;
const R10 = sqrt(10) / 4;

/**
 * Chemists' real orbital names -> real forms (m > 0 cos type, m < 0 sin type; see realY).
 * Keys are normalised (lower case, no spaces, underscores, braces, parentheses, '^' or '-').
 * General-set f: z(5z²−3r²) m=0, x(5z²−r²) m=+1, y(5z²−r²) m=−1, z(x²−y²) m=+2, xyz m=−2,
 * x(x²−3y²) m=+3, y(3x²−y²) m=−3.
 * Cubic-set f: derived here by matching polynomial coefficients (no table consulted; checked in the tests
 * against x(5x²−3r²), y(5y²−3r²), x(y²−z²), y(z²−x²)):
 *   f_x³        = −√6/4 f_{+1} + √10/4 f_{+3}
 *   f_y³        = −√6/4 f_{−1} − √10/4 f_{−3}
 *   f_x(y²−z²)  = −√10/4 f_{+1} − √6/4 f_{+3}
 *   f_y(z²−x²)  =  √10/4 f_{−1} − √6/4 f_{−3}
 * f_z³, f_z(x²−y²) and f_xyz are shared by both sets.
 */
const REAL_LABELS: Record<string, RealCombo> = {
  s: { l: 0, parts: [[0, 1]], pretty: '', name: 's' },
  px: { l: 1, parts: [[1, 1]], pretty: 'x', name: 'px' },
  py: { l: 1, parts: [[-1, 1]], pretty: 'y', name: 'py' },
  pz: { l: 1, parts: [[0, 1]], pretty: 'z', name: 'pz' },
  dxy: { l: 2, parts: [[-2, 1]], pretty: 'xy', name: 'dxy' },
  dyz: { l: 2, parts: [[-1, 1]], pretty: 'yz', name: 'dyz' },
  dz2: { l: 2, parts: [[0, 1]], pretty: 'z²', name: 'dz2' },
  dxz: { l: 2, parts: [[1, 1]], pretty: 'xz', name: 'dxz' },
  dx2y2: { l: 2, parts: [[2, 1]], pretty: 'x²−y²', name: 'dx2-y2' },
  fz3: { l: 3, parts: [[0, 1]], pretty: 'z³', name: 'fz3' },
  fxz2: { l: 3, parts: [[1, 1]], pretty: 'xz²', name: 'fxz2' },
  fyz2: { l: 3, parts: [[-1, 1]], pretty: 'yz²', name: 'fyz2' },
  fxyz: { l: 3, parts: [[-2, 1]], pretty: 'xyz', name: 'fxyz' },
  fzx2y2: { l: 3, parts: [[2, 1]], pretty: 'z(x²−y²)', name: 'fz(x2-y2)' },
  fxx23y2: { l: 3, parts: [[3, 1]], pretty: 'x(x²−3y²)', name: 'fx(x2-3y2)' },
  fy3x2y2: { l: 3, parts: [[-3, 1]], pretty: 'y(3x²−y²)', name: 'fy(3x2-y2)' },
  fx3: { l: 3, parts: [[1, -R6], [3, R10]], pretty: 'x³', name: 'fx3' },
  fy3: { l: 3, parts: [[-1, -R6], [-3, -R10]], pretty: 'y³', name: 'fy3' },
  fxy2z2: { l: 3, parts: [[1, -R10], [3, -R6]], pretty: 'x(y²−z²)', name: 'fx(y2-z2)' },
  fyz2x2: { l: 3, parts: [[-1, R10], [-3, -R6]], pretty: 'y(z²−x²)', name: 'fy(z2-x2)' },
};
const ALIASES: Record<string, string> = { dzx: 'dxz', dx2minusy2: 'dx2y2', fzxy: 'fxyz', fxzy: 'fxyz' };

/** The seven general-set and seven cubic-set f labels, canonical ASCII names. */
export const F_GENERAL_SET = ['fz3', 'fxz2', 'fyz2', 'fxyz', 'fz(x2-y2)', 'fx(x2-3y2)', 'fy(3x2-y2)'] as const;
export const F_CUBIC_SET = ['fx3', 'fy3', 'fz3', 'fx(y2-z2)', 'fy(z2-x2)', 'fz(x2-y2)', 'fxyz'] as const;
export const REAL_LABEL_NAMES: readonly string[] = Object.values(REAL_LABELS).map((c) => c.name);

interface HybridMember {
  parts: ReadonlyArray<readonly [label: string, coef: number]>;
  /** Unit vector of the main lobe. */
  direction: readonly [number, number, number];
}

const S2 = SQRT1_2;
const S3 = 1 / sqrt(3);
const S6 = 1 / sqrt(6);
const S23 = sqrt(2 / 3);

/**
 * Textbook hybrid sets (the usual forms, e.g. in inorganic chemistry texts such as Miessler & Tarr;
 * coefficients written from memory, orthonormality and lobe directions verified in the tests).
 * sp and sp3d axial lobes along z; sp2 and sp3d equatorial lobes in the xy plane starting at +x;
 * sp3 along (1,1,1), (1,−1,−1), (−1,1,−1), (−1,−1,1); sp3d2 along +z, −z, +x, −x, +y, −y.
 * Each coefficient is multiplied by the sign of its radial function beyond the last node, (−1)^(n−l−1),
 * so that the large outer lobe is positive and points along `direction` (e.g. 2sp³#1 = ½(−2s + 2p_x + 2p_y + 2p_z)
 * in the R_nl > 0-at-the-nucleus convention).
 */
const HYBRIDS: Record<string, { n: number; pretty: string; members: HybridMember[] }> = {
  sp: {
    n: 2,
    pretty: 'sp',
    members: [
      { parts: [['s', S2], ['pz', S2]], direction: [0, 0, 1] },
      { parts: [['s', S2], ['pz', -S2]], direction: [0, 0, -1] },
    ],
  },
  sp2: {
    n: 2,
    pretty: 'sp²',
    members: [
      { parts: [['s', S3], ['px', S23]], direction: [1, 0, 0] },
      { parts: [['s', S3], ['px', -S6], ['py', S2]], direction: [-0.5, sqrt(3) / 2, 0] },
      { parts: [['s', S3], ['px', -S6], ['py', -S2]], direction: [-0.5, -sqrt(3) / 2, 0] },
    ],
  },
  sp3: {
    n: 2,
    pretty: 'sp³',
    members: [
      { parts: [['s', 0.5], ['px', 0.5], ['py', 0.5], ['pz', 0.5]], direction: [S3, S3, S3] },
      { parts: [['s', 0.5], ['px', 0.5], ['py', -0.5], ['pz', -0.5]], direction: [S3, -S3, -S3] },
      { parts: [['s', 0.5], ['px', -0.5], ['py', 0.5], ['pz', -0.5]], direction: [-S3, S3, -S3] },
      { parts: [['s', 0.5], ['px', -0.5], ['py', -0.5], ['pz', 0.5]], direction: [-S3, -S3, S3] },
    ],
  },
  sp3d: {
    n: 3,
    pretty: 'sp³d',
    members: [
      { parts: [['s', S3], ['px', S23]], direction: [1, 0, 0] },
      { parts: [['s', S3], ['px', -S6], ['py', S2]], direction: [-0.5, sqrt(3) / 2, 0] },
      { parts: [['s', S3], ['px', -S6], ['py', -S2]], direction: [-0.5, -sqrt(3) / 2, 0] },
      { parts: [['pz', S2], ['dz2', S2]], direction: [0, 0, 1] },
      { parts: [['pz', -S2], ['dz2', S2]], direction: [0, 0, -1] },
    ],
  },
  sp3d2: {
    n: 3,
    pretty: 'sp³d²',
    members: [
      { parts: [['s', S6], ['pz', S2], ['dz2', S3]], direction: [0, 0, 1] },
      { parts: [['s', S6], ['pz', -S2], ['dz2', S3]], direction: [0, 0, -1] },
      { parts: [['s', S6], ['px', S2], ['dz2', -S3 / 2], ['dx2y2', 0.5]], direction: [1, 0, 0] },
      { parts: [['s', S6], ['px', -S2], ['dz2', -S3 / 2], ['dx2y2', 0.5]], direction: [-1, 0, 0] },
      { parts: [['s', S6], ['py', S2], ['dz2', -S3 / 2], ['dx2y2', -0.5]], direction: [0, 1, 0] },
      { parts: [['s', S6], ['py', -S2], ['dz2', -S3 / 2], ['dx2y2', -0.5]], direction: [0, -1, 0] },
    ],
  },
};

export const HYBRID_SETS = Object.keys(HYBRIDS);

export interface ParsedLabel {
  /** Canonical label, e.g. '3dxy', '3dx2-y2', '2p+1', 'sp3#2'. */
  label: string;
  state: OrbitalState;
  isReal: boolean;
}

function normaliseKey(s: string): string {
  return s
    .toLowerCase()
    .replace(/²/g, '2')
    .replace(/³/g, '3')
    .replace(/[−–]/g, '-')
    .replace(/[\s_{}()^]/g, '');
}

function realTerms(n: number, combo: RealCombo, scale = 1): Term[] {
  return combo.parts.map(([m, c]) => ({ n, l: combo.l, m, basis: 'real' as const, re: c * scale, im: 0 }));
}

export class LabelError extends RangeError {
  constructor(message: string) {
    super(message);
    this.name = 'LabelError';
  }
}

/** Direction of the main lobe for hybrid labels (unit vector), or null for other labels. */
export function hybridDirection(label: string): [number, number, number] | null {
  const m = /^(\d*)(sp3d2|sp3d|sp3|sp2|sp)(?:#(\d+))?$/.exec(normaliseKey(label));
  if (!m) return null;
  const set = HYBRIDS[m[2]];
  const idx = m[3] ? Number(m[3]) - 1 : 0;
  const mem = set.members[idx];
  return mem ? [mem.direction[0], mem.direction[1], mem.direction[2]] : null;
}

/**
 * Parses an orbital label into a state (Z defaults to 1). Accepted forms (case, spaces, '_', braces,
 * parentheses and '^' ignored; ² and ³ allowed):
 *   1s, 2pz, 3dxy, 3dz2, 3dx2-y2, 4fxyz, 4fz(x2-y2), 4fx3 (cubic set), ...  real forms, l <= 3;
 *   2p+1, 3d-2, 4f0, 5g+3 ...  complex Y_lm (any l);
 *   sp, sp2, sp3, sp3d, sp3d2, optionally '#k' for the k-th member (default 1) and an n prefix
 *   (default n = 2 for sp/sp2/sp3, n = 3 for sp3d/sp3d2).
 * Throws LabelError with a readable message on anything else.
 */
export function parseOrbitalLabel(label: string, opts: { Z?: number } = {}): ParsedLabel {
  if (typeof label !== 'string' || label.trim() === '') throw new LabelError('orbital label must be a non-empty string');
  const Z = opts.Z ?? 1;
  assertZ(Z);
  const key = normaliseKey(label);

  const hy = /^(\d*)(sp3d2|sp3d|sp3|sp2|sp)(?:#(\d+))?$/.exec(key);
  if (hy) {
    const set = HYBRIDS[hy[2]];
    const n = hy[1] ? Number(hy[1]) : set.n;
    const idx = hy[3] ? Number(hy[3]) : 1;
    if (idx < 1 || idx > set.members.length) {
      throw new LabelError(`orbital label "${label}": ${hy[2]} has members #1..#${set.members.length}, got #${idx}`);
    }
    const maxL = hy[2].includes('d') ? 2 : 1;
    const qe = validateQuantumNumbers(n, maxL, 0);
    if (qe) throw new LabelError(`orbital label "${label}": ${hy[2]} needs n > ${maxL} (${qe})`);
    const terms: Term[] = [];
    for (const [lab, c] of set.members[idx - 1].parts) {
      const combo = REAL_LABELS[lab];
      // Textbook coefficients picture every radial part positive in the valence (outer) region; R_nl here is
      // positive near the nucleus, so its sign beyond the last radial node is (-1)^(n-l-1): fold that in.
      const outerSign = (n - combo.l - 1) % 2 === 0 ? 1 : -1;
      terms.push(...realTerms(n, combo, c * outerSign));
    }
    const canon = `${hy[1] ? n : ''}${hy[2]}#${idx}`;
    return { label: canon, state: { Z, terms }, isReal: true };
  }

  const m = /^(\d*)([spdfghiklmno])(.*)$/.exec(key);
  if (!m) throw new LabelError(`orbital label "${label}" is not recognised (examples: 1s, 2pz, 3dxy, 3dz2, 4fx3, 2p+1, sp3#2)`);
  const letter = m[2];
  const l = (L_LETTERS as readonly string[]).indexOf(letter);
  const n = m[1] ? Number(m[1]) : l + 1;
  const rest = m[3];
  const qe = validateQuantumNumbers(n, l, 0);
  if (qe) throw new LabelError(`orbital label "${label}": ${qe}`);

  // complex Y_lm: 2p+1, 3d-2, 4f0
  const cm = /^([+-]?)(\d+)$/.exec(rest);
  if (cm) {
    const mm = (cm[1] === '-' ? -1 : 1) * Number(cm[2]);
    if (cm[1] === '' && mm !== 0) {
      throw new LabelError(`orbital label "${label}": write the sign of m for complex orbitals, e.g. ${n}${letter}+${mm} or ${n}${letter}-${mm}`);
    }
    const e = validateQuantumNumbers(n, l, mm);
    if (e) throw new LabelError(`orbital label "${label}": ${e}`);
    const state: OrbitalState = { Z, terms: [{ n, l, m: mm, basis: 'complex', re: 1, im: 0 }] };
    const canon = `${n}${letter}${mm > 0 ? '+' : mm < 0 ? '-' : ''}${abs(mm)}`;
    return { label: canon, state, isReal: isRealState(state) };
  }

  let nameKey = letter + rest.replace(/-/g, '');
  if (ALIASES[nameKey]) nameKey = ALIASES[nameKey];
  const combo = REAL_LABELS[nameKey];
  if (!combo || combo.l !== l) {
    const known = REAL_LABEL_NAMES.filter((x) => x.startsWith(letter)).join(', ');
    throw new LabelError(
      `orbital label "${label}" is not recognised` + (known ? ` (real ${letter} labels: ${known})` : ` (use ${n}${letter}+m / ${n}${letter}-m for complex forms)`),
    );
  }
  return { label: `${n}${combo.name}`, state: { Z, terms: realTerms(n, combo) }, isReal: true };
}

function fmt(x: number): string {
  const s = abs(x) < 1e-12 ? '0' : x.toFixed(3).replace(/\.?0+$/, '');
  return s === '-0' ? '0' : s;
}

function termPretty(t: Term): string {
  const letter = L_LETTERS[t.l];
  if (t.basis === 'real' || t.l === 0) {
    if (t.l <= 3) {
      const hit = Object.values(REAL_LABELS).find((c) => c.l === t.l && c.parts.length === 1 && c.parts[0][0] === t.m);
      if (hit) return hit.pretty ? `${t.n}${letter}_${hit.pretty}` : `${t.n}${letter}`;
    }
    return `${t.n}${letter}(${t.m > 0 ? 'c' : t.m < 0 ? 's' : ''}${abs(t.m)})`;
  }
  return `${t.n}${letter}(m=${t.m > 0 ? '+' : ''}${t.m})`;
}

/**
 * Display label: '3d_xy', '3d_z²', '4f_x³', 'sp³ #2', '2p(m=+1)'. Accepts a label string or a state;
 * a superposition is shown as a sum with its coefficients.
 */
export function prettyLabel(input: string | OrbitalState | Term): string {
  if (typeof input === 'string') {
    const key = normaliseKey(input);
    const hy = /^(\d*)(sp3d2|sp3d|sp3|sp2|sp)(?:#(\d+))?$/.exec(key);
    if (hy) {
      parseOrbitalLabel(input);
      return `${hy[1]}${HYBRIDS[hy[2]].pretty} #${hy[3] ?? 1}`;
    }
    const parsed = parseOrbitalLabel(input);
    const mm = /^(\d+)([a-z])(.*)$/.exec(parsed.label);
    if (mm) {
      // The canonical name may hold parentheses and '-' (4fx(y2-z2)): look it up by its normalised key.
      const key = normaliseKey(mm[2] + mm[3]).replace(/-/g, '');
      const combo = REAL_LABELS[ALIASES[key] ?? key];
      if (combo) return combo.pretty ? `${mm[1]}${mm[2]}_${combo.pretty}` : `${mm[1]}${mm[2]}`;
    }
    return prettyLabel(parsed.state);
  }
  if ('terms' in input) {
    const ts = input.terms;
    if (ts.length === 1 && ts[0].re === 1 && ts[0].im === 0) return termPretty(ts[0]);
    const named = namedRealForm(ts);
    if (named) return named;
    const hybrid = namedHybrid(ts);
    if (hybrid) return hybrid;
    // A sum with its coefficients: "0.5·2s − 0.5·2p_x + 0.707·3d_z²" (real); complex ones in parentheses.
    return ts
      .map((t, i) => {
        if (t.im === 0) {
          const sign = t.re < 0 ? '−' : '+';
          const c = `${fmt(abs(t.re))}·${termPretty(t)}`;
          return i === 0 ? (t.re < 0 ? `−${c}` : c) : ` ${sign} ${c}`;
        }
        const c = `(${fmt(t.re)}${t.im < 0 ? '−' : '+'}${fmt(abs(t.im))}i)·${termPretty(t)}`;
        return i === 0 ? c : ` + ${c}`;
      })
      .join('');
  }
  return termPretty(input);
}

/**
 * The name of a real form written as several terms of one (n, l) (the cubic f set is stored as two terms each):
 * '4f_x(y²−z²)' for (-√10/4, -√6/4) on m = +1, +3. Coefficients may carry any positive common factor (they are
 * normalised by the engine); a negative factor is written as a leading '−'.
 */
function namedRealForm(ts: readonly Term[]): string | null {
  if (ts.length === 0 || ts.some((t) => t.basis !== 'real' || t.im !== 0 || t.n !== ts[0].n || t.l !== ts[0].l)) return null;
  const byM = new Map<number, number>();
  for (const t of ts) byM.set(t.m, (byM.get(t.m) ?? 0) + t.re);
  let norm = 0;
  for (const v of byM.values()) norm += v * v;
  if (!(norm > 0)) return null;
  norm = sqrt(norm);
  for (const combo of Object.values(REAL_LABELS)) {
    if (combo.l !== ts[0].l) continue;
    let cn = 0;
    for (const [, c] of combo.parts) cn += c * c;
    cn = sqrt(cn);
    for (const sign of [1, -1]) {
      const ms = new Set([...byM.keys(), ...combo.parts.map(([m]) => m)]);
      let ok = true;
      for (const m of ms) {
        const want = (combo.parts.find(([pm]) => pm === m)?.[1] ?? 0) / cn;
        const have = (sign * (byM.get(m) ?? 0)) / norm;
        if (abs(want - have) > 1e-9) ok = false;
      }
      if (ok) {
        const letter = L_LETTERS[combo.l];
        const base = combo.pretty ? `${ts[0].n}${letter}_${combo.pretty}` : `${ts[0].n}${letter}`;
        return sign === 1 ? base : `−${base}`;
      }
    }
  }
  return null;
}

/**
 * The hybrid a state is, when its terms are one member of a textbook set up to a positive common factor:
 * '2sp³ #2' style names, the n written when it is not the set's default.
 */
function namedHybrid(ts: readonly Term[]): string | null {
  if (ts.length < 2 || ts.some((t) => t.basis !== 'real' || t.im !== 0 || t.n !== ts[0].n)) return null;
  const n = ts[0].n;
  for (const [key, set] of Object.entries(HYBRIDS)) {
    for (let k = 0; k < set.members.length; k++) {
      let state: OrbitalState;
      try {
        state = parseOrbitalLabel(`${n}${key}#${k + 1}`).state;
      } catch {
        continue;
      }
      if (sameUpToScale(state.terms, ts)) return `${n === set.n ? '' : n}${set.pretty} #${k + 1}`;
    }
  }
  return null;
}

function sameUpToScale(a: readonly Term[], b: readonly Term[]): boolean {
  const key = (t: Term) => `${t.l}/${t.m}`;
  const ma = new Map<string, number>();
  const mb = new Map<string, number>();
  for (const t of a) ma.set(key(t), (ma.get(key(t)) ?? 0) + t.re);
  for (const t of b) mb.set(key(t), (mb.get(key(t)) ?? 0) + t.re);
  let na = 0;
  let nb = 0;
  for (const v of ma.values()) na += v * v;
  for (const v of mb.values()) nb += v * v;
  if (!(na > 0 && nb > 0)) return false;
  na = sqrt(na);
  nb = sqrt(nb);
  for (const k of new Set([...ma.keys(), ...mb.keys()])) if (abs((ma.get(k) ?? 0) / na - (mb.get(k) ?? 0) / nb) > 1e-9) return false;
  return true;
}

/** Complex-basis view of a parsed label (convenience for UIs showing coefficients). */
export function labelToComplexBasis(label: string): OrbitalState {
  return toComplexBasis(parseOrbitalLabel(label).state);
}
