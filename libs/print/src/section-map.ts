// Cross-section contour map of psi on a coordinate plane as a standalone SVG 1.1 (user unit = 1 mm).

import { BOHR_RADIUS_ANGSTROM, compileState, prettyLabel, toRealBasis, validateState, type CompiledState, type OrbitalState } from '@psiform/orbitals';
import { regionContours, sectionContours, sectionPlane, type ContourPolygons, type SectionPlaneName } from '@psiform/meshing';
import { phaseColoursInto, phaseHex, resolvePhaseMode, type PhaseMode, type PhasePalette } from '@psiform/colour';
import { axisTicks, checkPalette, checkSizeMm, f, fontStyle, niceStep, svgOpen, tickLabel, type FontBytes, type PlotPalette } from './svg-common';
import { plainLabel, PSI_UNIT_TEXT, svgText, UNIT_TEXT } from './typeset';
import { MODEL_NOTE_SHORT } from './radial-plot';
import { phaseKeySvg, PHASE_KEY_MARKS } from './phase-key';

const { PI, abs, cos, max, min, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface SectionMapOptions {
  /** The state, or an already compiled one (compileState). */
  state: OrbitalState | CompiledState;
  plane: SectionPlaneName;
  /** Position of the plane along its normal, a0. */
  offset: number;
  /** Half-width of the square, a0. */
  extent: number;
  /** Samples per side (odd n puts a sample on the axes). */
  n: number;
  /** Contour levels per sign, evenly spaced: c_k = k/(levels+1) · max|ψ| in this plane, k = 1..levels. Default 4. */
  levels?: number;
  /** Explicit positive levels c (a0^-3/2), used instead of `levels`; drawn at +c and -c. */
  thresholds?: number[];
  palette: PlotPalette;
  widthMm: number;
  heightMm: number;
  fonts?: FontBytes;
  /** The figure's one length unit: axis ticks, the plane's position, the scale bar (default 'bohr'). */
  unit?: 'bohr' | 'angstrom';
  /** Overrides the title text. */
  title?: string;
  /**
   * How the map is coloured, as the figure's surfaces are (@psiform/colour, the one phase rule): 'sign' fills ψ > 0
   * and ψ < 0 in palette.positive/negative; 'argument' colours by arg ψ on the swatchbook's phase wheel and carries
   * the phase key; 'auto' (default) = sign for real states, argument for complex ones.
   */
  colouring?: { mode?: PhaseMode; wheel?: PhasePalette['wheel'] };
}

/**
 * Bands of the wheel a map coloured by arg ψ is filled in: 36 (10° each), fine enough that neighbouring bands differ
 * by about one just-noticeable step on the default wheel, coarse enough to keep an A4 map's file small.
 */
export const PHASE_MAP_BANDS = 36;

const AXES: Record<SectionPlaneName, [string, string, string]> = { xy: ['x', 'y', 'z'], xz: ['x', 'z', 'y'], yz: ['y', 'z', 'x'] };

function isCompiled(s: OrbitalState | CompiledState): s is CompiledState {
  return typeof (s as CompiledState).evaluate === 'function';
}

/**
 * Contour map: filled regions psi >= c_k in the positive colour and psi <= -c_k in the negative colour
 * (each level one <path>, nested levels stack their opacity so the fill deepens towards the lobe centre),
 * the nodal line psi = 0 dashed in ink, axes with ticks in a0 or Å, a scale bar and a legend.
 * Elements: path.contour-pos / path.contour-neg (data-level k / -k, data-value c), one path.nodal
 * (data-level 0). A plane that lies inside a nodal surface (psi = 0 throughout, e.g. xy for 2p_z) gets no
 * filled contour and one hatched path.nodal.nodal-plane covering the square.
 * Coloured by arg ψ (complex states by default, see `colouring`): the region |ψ| ≥ c_1 is filled in PHASE_MAP_BANDS
 * bands of the swatchbook's phase wheel (path.phase-band, data-angle = the band's arg ψ, its colour from
 * phaseColoursInto), |ψ| = c_k are ink lines (path.contour-abs, data-level k), and the phase key (g.phase-key, marked
 * 0, π/2, π, 3π/2) sits right of the map; only a real state has nodal lines there.
 * A complex state coloured by sign is drawn as |ψ| with the sign of Re ψ, its dashed line being Re ψ = 0.
 */
export function sectionMapSvg(opts: SectionMapOptions): string {
  const { plane, offset, extent, n, widthMm: W, heightMm: H } = opts;
  checkSizeMm(W, H);
  const pal = checkPalette(opts.palette);
  const unit = opts.unit ?? 'bohr';
  if (unit !== 'bohr' && unit !== 'angstrom') throw new RangeError(`unit must be 'bohr' or 'angstrom' (got ${String(unit)})`);
  if (!opts.state || typeof opts.state !== 'object') throw new RangeError('state must be an OrbitalState or a compiled state');
  let compiled: CompiledState;
  let label: string;
  if (isCompiled(opts.state)) {
    compiled = opts.state;
    // compiled.state is in the complex basis; real states read better as their real forms (2p_z, not 2p(m=0)).
    label = prettyLabel(compiled.isReal ? toRealBasis(compiled.state) : compiled.state);
  } else {
    const e = validateState(opts.state);
    if (e) throw new RangeError(`state: ${e}`);
    compiled = compileState(opts.state);
    label = prettyLabel(opts.state);
  }
  const section = sectionPlane(compiled, { plane, offset, extent, n });
  const mode = resolvePhaseMode(opts.colouring?.mode ?? 'auto', compiled.isReal);
  const wheelPalette: PhasePalette = { positive: pal.positive, negative: pal.negative, wheel: opts.colouring?.wheel ?? null };
  const levels = opts.levels ?? 4;
  if (opts.thresholds === undefined && (!Number.isInteger(levels) || levels < 1 || levels > 20)) throw new RangeError(`levels must be an integer in 1..20 (got ${String(levels)})`);

  let maxAbs = 0;
  for (let i = 0; i < section.values.length; i++) maxAbs = max(maxAbs, abs(section.values[i]));
  // Reference scale for "this plane is nodal": the largest |psi| on the three coordinate planes through
  // the nucleus and on this plane, at a coarse 33 x 33. Round-off in an exactly nodal plane is ~1e-17 of it.
  let ref = maxAbs;
  for (const p of ['xy', 'xz', 'yz'] as const) {
    const v = sectionPlane(compiled, { plane: p, offset: 0, extent, n: 33 }).values;
    for (let i = 0; i < v.length; i++) ref = max(ref, abs(v[i]));
  }
  const wholePlaneNodal = !(maxAbs > 1e-10 * ref);

  const thresholds = opts.thresholds ?? Array.from({ length: levels }, (_, i) => ((i + 1) / (levels + 1)) * maxAbs);
  if (opts.thresholds) for (const t of opts.thresholds) if (!(t > 0) || !Number.isFinite(t)) throw new RangeError(`thresholds must be positive numbers (got ${t})`);
  const cs = wholePlaneNodal ? null : sectionContours(section.values, n, thresholds, extent);

  // Layout: square plot centred, room for title above, ticks left and below, legend under the plot.
  const fs = min(3.2, max(2.1, min(W, H) * 0.034));
  const left = 4.4 * fs;
  // A map coloured by arg ψ keeps a column right of the plot for its phase key: ring of radius keyR, marks beside it.
  const keyR = 1.8 * fs;
  const keyMarkFs = fs * 0.85;
  const keyColumn = mode === 'argument' ? 2 * keyR + 2 * (0.5 * keyMarkFs + 2.4 * keyMarkFs) + fs : 0;
  const right = 1.2 * fs + keyColumn;
  const top = 2.8 * fs;
  const bottom = 8.6 * fs;
  const side = max(5, min(W - left - right, H - top - bottom));
  const px0 = left + (W - left - right - side) / 2;
  const py0 = top;
  const mmPerBohr = side / (2 * extent);
  const U = (u: number) => px0 + (u + extent) * mmPerBohr;
  const V = (v: number) => py0 + (extent - v) * mmPerBohr; // v up

  const [ua, va, na] = AXES[plane];
  const k = unit === 'angstrom' ? BOHR_RADIUS_ANGSTROM : 1;
  const unitText = UNIT_TEXT[unit];
  const offsetText = `${na} = ${tickLabel(offset * k, 0.001).replace(/\.?0+$/, '') || '0'} ${unitText}`;
  const titleText = opts.title ?? `${label}: ${plane} plane, ${offsetText}`;
  const title = plainLabel(titleText);
  const titleSvg = svgText(titleText, fs * 1.15);
  const unitLabel = svgText(unitText, fs * 0.75);
  const unitAxis = svgText(unitText, fs);
  // ψ has the dimension length^(−3/2): in an Å figure its values are stated per Å^(3/2) too (one length unit).
  const psiUnit = unit === 'angstrom' ? 'Å^−3/2' : PSI_UNIT_TEXT;
  const psiScale = unit === 'angstrom' ? k ** -1.5 : 1;
  const lvl = thresholds.map((t) => (maxAbs > 0 ? t / maxAbs : 0));

  const parts: string[] = [];
  const howColoured =
    mode === 'argument'
      ? `Colour shows the phase arg ψ on the phase wheel (key marked ${PHASE_KEY_MARKS.map((m) => m.text).join(', ')}) where |ψ| reaches the lowest level; lines are levels of |ψ|${compiled.isReal ? '; nodal lines dashed' : ''}.`
      : compiled.isReal
        ? 'Positive regions in the positive colour, negative in the negative colour, nodal lines dashed.'
        : 'Regions where Re ψ > 0 in the positive colour, Re ψ < 0 in the negative colour, the line Re ψ = 0 dashed.';
  parts.push(svgOpen(W, H, title, `Cross-section of ψ for ${plainLabel(label)} (Z = ${compiled.state.Z}) in the ${plane} plane at ${plainLabel(offsetText)}, lengths in ${plainLabel(unitText)}, ${MODEL_NOTE_SHORT}. ${howColoured}`));
  parts.push(
    fontStyle(
      opts.fonts,
      `.tick{font-size:${f(fs * 0.85)}px;fill:${pal.label};}\n.axis-title{font-size:${f(fs)}px;fill:${pal.label};}\n.title{font-size:${f(fs * 1.15)}px;font-weight:700;fill:${pal.label};}\n.note{font-size:${f(fs * 0.75)}px;fill:${pal.label};}\n`,
    ),
  );
  parts.push(
    `<defs><clipPath id="psf-section-clip"><rect x="${f(px0)}" y="${f(py0)}" width="${f(side)}" height="${f(side)}"/></clipPath>` +
      `<pattern id="psf-nodal-hatch" patternUnits="userSpaceOnUse" width="1.5" height="1.5" patternTransform="rotate(45)"><line x1="0" y1="0" x2="0" y2="1.5" stroke="${pal.label}" stroke-width="0.15" stroke-opacity="0.5"/></pattern></defs>`,
  );
  parts.push(`<rect class="background" x="0" y="0" width="${f(W)}" height="${f(H)}" fill="${pal.background}"/>`);
  parts.push(
    `<g class="section" clip-path="url(#psf-section-clip)" data-plane="${plane}" data-offset="${offset}" data-extent="${extent}" data-x0="${f(px0)}" data-y0="${f(py0)}" data-side="${f(side)}" data-max-abs="${maxAbs}">`,
  );
  const ringPath = (g: ContourPolygons) =>
    g.coordinates.map((poly) => poly.map((ring) => ring.map(([u, v], i) => `${i ? 'L' : 'M'}${f(U(u))} ${f(V(v))}`).join('') + 'Z').join('')).join('');
  const opacity = min(0.3, 0.85 / max(1, thresholds.length));
  if (cs && mode === 'argument') {
    parts.push(...phaseBandPaths(section.values, section.arg, n, extent, thresholds[0], maxAbs, wheelPalette, ringPath));
    thresholds.forEach((c, i) => {
      const g = regionContours(absValues(section.values), n, c, extent);
      if (g.coordinates.length) parts.push(`<path class="contour-abs" data-level="${i + 1}" data-value="${c}" d="${ringPath(g)}" fill="none" stroke="${pal.label}" stroke-width="0.2"/>`);
    });
    // Nodal lines are lines only where ψ is real; a complex ψ vanishes on lines where Re ψ and Im ψ both do.
    const d = compiled.isReal ? nodalLines(cs.nodal, extent, (2 * extent) / (n - 1), U, V) : '';
    if (d) parts.push(`<path class="nodal" data-level="0" data-value="0" d="${d}" fill="none" stroke="${pal.label}" stroke-width="0.3" stroke-dasharray="1 0.7"/>`);
  } else if (cs) {
    cs.plus.forEach((g, i) => {
      if (g.coordinates.length === 0) return;
      parts.push(`<path class="contour-pos" data-level="${i + 1}" data-value="${g.value}" d="${ringPath(g)}" fill="${pal.positive}" fill-opacity="${f(opacity)}" fill-rule="evenodd" stroke="${pal.positive}" stroke-width="0.2"/>`);
    });
    cs.minus.forEach((g, i) => {
      if (g.coordinates.length === 0) return;
      parts.push(`<path class="contour-neg" data-level="${-(i + 1)}" data-value="${g.value}" d="${ringPath(g)}" fill="${pal.negative}" fill-opacity="${f(opacity)}" fill-rule="evenodd" stroke="${pal.negative}" stroke-width="0.2"/>`);
    });
    const d = nodalLines(cs.nodal, extent, (2 * extent) / (n - 1), U, V);
    if (d) parts.push(`<path class="nodal" data-level="0" data-value="0" d="${d}" fill="none" stroke="${pal.label}" stroke-width="0.3" stroke-dasharray="1 0.7"/>`);
  } else {
    parts.push(
      `<path class="nodal nodal-plane" data-level="0" data-value="0" d="M${f(px0)} ${f(py0)}h${f(side)}v${f(side)}h${f(-side)}Z" fill="url(#psf-nodal-hatch)" stroke="${pal.label}" stroke-width="0.3" stroke-dasharray="1 0.7"/>`,
    );
  }
  parts.push('</g>');
  parts.push(`<rect class="frame" x="${f(px0)}" y="${f(py0)}" width="${f(side)}" height="${f(side)}" fill="none" stroke="${pal.axes}" stroke-width="0.25"/>`);
  if (!cs) parts.push(`<text class="note" x="${f(px0 + side / 2)}" y="${f(py0 + side / 2)}" text-anchor="middle">ψ = 0 throughout this plane (nodal plane)</text>`);

  // Nucleus marker when the plane passes through it.
  if (offset === 0) parts.push(`<circle class="nucleus" cx="${f(U(0))}" cy="${f(V(0))}" r="0.45" fill="${pal.label}"/>`);

  // Ticks in the display unit.
  const spanDisp = extent * k;
  // At least five ticks (0 and two each side), about 4 font sizes apart at the least.
  const axis = axisTicks(-spanDisp, spanDisp, side, 4 * fs, 5);
  const step = axis.step;
  for (const t of axis.values) {
    const u = t / k;
    parts.push(`<line class="xtick" x1="${f(U(u))}" y1="${f(py0 + side)}" x2="${f(U(u))}" y2="${f(py0 + side + fs * 0.35)}" stroke="${pal.axes}" stroke-width="0.2"/>`);
    parts.push(`<text class="tick" x="${f(U(u))}" y="${f(py0 + side + fs * 1.3)}" text-anchor="middle">${tickLabel(t, step)}</text>`);
    parts.push(`<line class="ytick" x1="${f(px0 - fs * 0.35)}" y1="${f(V(u))}" x2="${f(px0)}" y2="${f(V(u))}" stroke="${pal.axes}" stroke-width="0.2"/>`);
    parts.push(`<text class="tick" x="${f(px0 - fs * 0.55)}" y="${f(V(u) + fs * 0.3)}" text-anchor="end">${tickLabel(t, step)}</text>`);
  }
  parts.push(`<text class="axis-title" x="${f(px0 + side / 2)}" y="${f(py0 + side + fs * 2.5)}" text-anchor="middle">${ua} / ${unitAxis}</text>`);
  parts.push(`<text class="axis-title" transform="translate(${f(px0 - fs * 3.2)} ${f(py0 + side / 2)}) rotate(-90)" text-anchor="middle">${va} / ${unitAxis}</text>`);

  // Scale bar: a round length of at most half the width, below the axis title on the left.
  const barY = py0 + side + fs * 3.6;
  const barStep = niceStep(spanDisp / 2, 1) <= spanDisp ? niceStep(spanDisp / 2, 1) : step;
  const barLen = (barStep / k) * mmPerBohr;
  parts.push(`<path class="scale-bar" data-length="${barStep}" data-unit="${unit}" d="M${f(px0)} ${f(barY)}h${f(barLen)}" stroke="${pal.label}" stroke-width="0.5"/>`);
  parts.push(`<text class="note" x="${f(px0 + barLen + fs * 0.5)}" y="${f(barY + fs * 0.3)}">${tickLabel(barStep, barStep)} ${unitLabel}</text>`);

  // Legend and notes.
  const ly = barY + fs * 1.5;
  const sw = fs * 0.9;
  let lx = px0;
  const legend = (cls: string, fill: string, text: string, line: false | 'dashed' | 'solid' = false) => {
    parts.push(
      line
        ? `<path class="legend-${cls}" d="M${f(lx)} ${f(ly - sw / 2)}h${f(sw * 1.6)}" stroke="${pal.label}" stroke-width="${line === 'solid' ? 0.2 : 0.3}"${line === 'dashed' ? ' stroke-dasharray="1 0.7"' : ''}/>`
        : `<rect class="legend-${cls}" x="${f(lx)}" y="${f(ly - sw)}" width="${f(sw * 1.6)}" height="${f(sw)}" fill="${fill}" fill-opacity="0.6"/>`,
    );
    parts.push(`<text class="note" x="${f(lx + sw * 2)}" y="${f(ly - sw * 0.15)}">${text}</text>`);
    lx += sw * 2 + fs * 0.5 * text.length + fs;
  };
  const signed = section.mode === 'signed-modulus';
  if (mode === 'argument') {
    legend('abs', 'none', '|ψ| levels', 'solid');
    if (compiled.isReal) legend('nodal', 'none', 'ψ = 0 (node)', 'dashed');
    // The key: right of the map, its title "arg ψ" level with the top of the plot.
    const keyCx = px0 + side + fs + 2.9 * keyMarkFs + keyR;
    const keyCy = py0 + keyR + 1.9 * keyMarkFs + fs * 0.6;
    parts.push(phaseKeySvg({ cx: keyCx, cy: keyCy, r: keyR, colourAt: (a) => phaseHex(wheelPalette, 'argument', 'complex', a), ink: pal.label, fontSize: keyMarkFs, title: 'arg ψ' }));
  } else {
    legend('pos', pal.positive, signed ? '|ψ|, Re ψ &gt; 0' : 'ψ &gt; 0');
    legend('neg', pal.negative, signed ? '|ψ|, Re ψ &lt; 0' : 'ψ &lt; 0');
    legend('nodal', 'none', signed ? 'Re ψ = 0' : 'ψ = 0 (node)', 'dashed');
  }
  const notes: string[] = [
    cs
      ? opts.thresholds
        ? `levels ${mode === 'argument' ? '|ψ| = ' : '±'}${thresholds.map((t) => (t * psiScale).toPrecision(3)).join(', ')} ${psiUnit} (max |ψ| here ${(maxAbs * psiScale).toPrecision(3)})`
        : `levels ${mode === 'argument' ? '|ψ| = ' : '±'}${lvl.map((x) => x.toFixed(2)).join(', ')} × max |ψ| here (${(maxAbs * psiScale).toPrecision(3)} ${psiUnit})`
      : 'no contours: the plane lies in a nodal surface',
  ];
  if (mode === 'argument') notes.push('colour: arg ψ on the phase wheel (key); blank where |ψ| is below the lowest level');
  else if (section.mode === 'signed-modulus') notes.push('complex ψ drawn as |ψ| with the sign of Re ψ');
  notes.push(`${MODEL_NOTE_SHORT}; many-electron orbitals differ`);
  notes.forEach((t, i) => parts.push(`<text class="note${i === notes.length - 1 ? ' model-note' : i === 0 ? ' levels' : ''}" x="${f(px0)}" y="${f(ly + fs * (1.1 + 0.95 * i))}">${svgText(t, fs * 0.75)}</text>`));
  parts.push(`<text class="title" x="${f(px0)}" y="${f(fs * 1.5)}">${titleSvg}</text>`);
  parts.push('</svg>\n');
  return parts.join('\n');
}

function absValues(v: Float64Array): Float64Array {
  const out = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) out[i] = abs(v[i]);
  return out;
}

/**
 * The region |ψ| ≥ floor cut into PHASE_MAP_BANDS bands of arg ψ, one filled path per band in the wheel's colour at
 * the band's centre. Band b (centre θ_b) is where cos(arg ψ − θ_b) ≥ cos(π/K) — continuous across arg = ±π, so no
 * band is split by the branch cut — and |ψ| ≥ floor: the zero contour of the smaller of the two (scaled) fields. Each
 * path is stroked in its own colour (0.1 mm) so neighbouring bands leave no hairline of paper between them.
 * `arg` is absent for a real state: arg ψ is then 0 or π by the sign of ψ.
 */
function phaseBandPaths(values: Float64Array, arg: Float64Array | undefined, n: number, extent: number, floor: number, maxAbs: number, palette: PhasePalette, ringPath: (g: ContourPolygons) => string): string[] {
  const K = PHASE_MAP_BANDS;
  const centres = Float32Array.from({ length: K }, (_, b) => (2 * PI * b) / K);
  const rgb = phaseColoursInto(palette, 'argument', 'complex', centres, new Float32Array(3 * K));
  const hex = (b: number) => '#' + [0, 1, 2].map((k) => round(min(1, max(0, rgb[3 * b + k])) * 255).toString(16).padStart(2, '0')).join('');
  const cosHalf = cos(PI / K);
  const field = new Float64Array(values.length);
  const out: string[] = [];
  for (let b = 0; b < K; b++) {
    const th = centres[b];
    let any = false;
    for (let i = 0; i < values.length; i++) {
      const a = arg ? arg[i] : values[i] < 0 ? PI : 0;
      const inBand = cos(a - th) - cosHalf;
      const above = (abs(values[i]) - floor) / maxAbs;
      field[i] = min(inBand, above);
      if (field[i] >= 0) any = true;
    }
    if (!any) continue;
    const g = regionContours(field, n, 0, extent);
    if (!g.coordinates.length) continue;
    const c = hex(b);
    out.push(`<path class="phase-band" data-angle="${f(th)}" d="${ringPath(g)}" fill="${c}" fill-rule="evenodd" stroke="${c}" stroke-width="0.1" stroke-linejoin="round"/>`);
  }
  return out;
}

/**
 * The nodal line: the boundary of the psi >= 0 region minus the pieces that run along the edge of the
 * sampled square (d3-contour closes rings along the grid border, half a cell outside the outer samples,
 * cutting the corners diagonally).
 */
function nodalLines(g: ContourPolygons, extent: number, h: number, U: (u: number) => number, V: (v: number) => number): string {
  const edge = extent + h / 2;
  const tol = h * 1e-6;
  // A segment with both ends on the border runs along it or cuts a corner cell; either way it lies half a
  // cell outside the sampled square and is not part of the nodal line.
  const border = (p: number[]) => abs(abs(p[0]) - edge) < tol || abs(abs(p[1]) - edge) < tol;
  const onEdge = (a: number[], b: number[]) => border(a) && border(b);
  let d = '';
  for (const poly of g.coordinates) {
    for (const ring of poly) {
      // Start the walk at an edge segment so that each interior run is one subpath.
      const m = ring.length - 1; // closed ring: last point repeats the first
      let start = 0;
      for (let i = 0; i < m; i++) if (onEdge(ring[i], ring[i + 1])) { start = i + 1; break; }
      let pen = false;
      for (let s = 0; s < m; s++) {
        const i = (start + s) % m;
        const a = ring[i];
        const b = ring[(i + 1) % m];
        if (onEdge(a, b)) {
          pen = false;
          continue;
        }
        if (!pen) d += `M${f(U(a[0]))} ${f(V(a[1]))}`;
        d += `L${f(U(b[0]))} ${f(V(b[1]))}`;
        pen = true;
      }
    }
  }
  return d;
}
