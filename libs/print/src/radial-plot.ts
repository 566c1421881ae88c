// Radial distribution plot P(r) = r² R_nl(r)² as a standalone SVG 1.1 (user unit = 1 mm).

import { BOHR_RADIUS_ANGSTROM, L_LETTERS, innerTurningPoint, radialSeries, validateQuantumNumbers, validateZ } from '@psiform/orbitals';
import { axisTicks, checkPalette, checkSizeMm, f, fontStyle, niceStep, svgOpen, tickLabel, ticks, type FontBytes, type PlotPalette } from './svg-common';
import { plainLabel, svgText, UNIT_TEXT } from './typeset';

const { ceil, floor, max, min } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export const MODEL_NOTE_SHORT = 'one-electron hydrogen-like model';

export interface RadialPlotOptions {
  n: number;
  l: number;
  Z: number;
  palette: PlotPalette;
  widthMm: number;
  heightMm: number;
  fonts?: FontBytes;
  unit: 'bohr' | 'angstrom';
  /** Outer radius of the plot in a0 (default: radialSeries's choice). */
  rMaxBohr?: number;
  /** Samples of the curve (default 801; the curve is a polyline this dense, smooth at print sizes). */
  samples?: number;
  /** Overrides the title text. */
  title?: string;
}

/**
 * SVG of P(r) with: lobes between radial nodes filled by the sign of R_nl (palette positive/negative),
 * the classically forbidden region r > r_tp shaded (E_n = -Z/r + l(l+1)/(2r²) at the outer turning point;
 * for l > 0 also r < inner turning point), radial nodes marked, axes with ticks.
 * Elements tests can find: g.plot (data-x0/x1/y0/y1 mm and data-rmax-bohr), rect.forbidden
 * (data-r-bohr), circle.node (data-r-bohr), path.curve.
 */
export function radialPlotSvg(opts: RadialPlotOptions): string {
  const { n, l, Z, widthMm: W, heightMm: H, unit } = opts;
  const qe = validateQuantumNumbers(n, l, 0) ?? validateZ(Z);
  if (qe) throw new RangeError(qe);
  if (unit !== 'bohr' && unit !== 'angstrom') throw new RangeError(`unit must be 'bohr' or 'angstrom' (got ${String(unit)})`);
  checkSizeMm(W, H);
  const pal = checkPalette(opts.palette);
  const samples = opts.samples ?? 801;
  const s = radialSeries(n, l, Z, { rMax: opts.rMaxBohr, samples });
  const rMax = s.rMax as number;
  const k = unit === 'angstrom' ? BOHR_RADIUS_ANGSTROM : 1; // length unit in a0 -> display unit
  let pMax = 0;
  for (let i = 0; i < s.P.length; i++) pMax = max(pMax, s.P[i]);
  const pMaxDisp = pMax / k; // density per display length unit

  // Layout (mm). Font size scales with the figure, within 2.1..3.2 mm (about 6..9 pt).
  const fs = min(3.2, max(2.1, min(W, H) * 0.034));
  const x0 = 4.6 * fs;
  const x1 = W - 1.6 * fs;
  const y0 = H - 4.4 * fs; // axis baseline (P = 0)
  const y1 = 2.8 * fs; // top of the plot area
  const xAxis = axisTicks(0, rMax * k, x1 - x0, 4 * fs, 4);
  const xStep = xAxis.step;
  const yStep = niceStep(pMaxDisp * 1.05, max(2, floor((y0 - y1) / (3.5 * fs))));
  const yTop = ceil((pMaxDisp * 1.05) / yStep) * yStep;
  const X = (rBohr: number) => x0 + ((rBohr * k) / (rMax * k)) * (x1 - x0);
  const Y = (pBohr: number) => y0 - (pBohr / k / yTop) * (y0 - y1);

  const unitText = UNIT_TEXT[unit];
  const unitLabel = svgText(unitText, fs * 0.75);
  const unitAxis = svgText(unitText, fs);
  const letter = L_LETTERS[l];
  const name = `${n}${letter}`;
  const title = opts.title ?? `Radial distribution of ${name}, Z = ${Z}`;
  const tp = s.turningPoint as number;
  const inner = l > 0 ? (innerTurningPoint(n, l, Z) as number) : 0;
  const axes = pal.axes;

  const parts: string[] = [];
  parts.push(svgOpen(W, H, plainLabel(title), `P(r) = r²R(r)² of the ${name} radial function for nuclear charge Z = ${Z}, r in ${plainLabel(unitText)}; ${MODEL_NOTE_SHORT}. Classically forbidden region shaded, radial nodes marked.`));
  parts.push(
    fontStyle(
      opts.fonts,
      `.tick{font-size:${f(fs * 0.85)}px;fill:${pal.label};}\n.axis-title{font-size:${f(fs)}px;fill:${pal.label};}\n.title{font-size:${f(fs * 1.15)}px;font-weight:700;fill:${pal.label};}\n.note{font-size:${f(fs * 0.75)}px;fill:${pal.label};font-style:italic;}\n`,
    ),
  );
  parts.push(
    `<defs><pattern id="psf-hatch" patternUnits="userSpaceOnUse" width="1.2" height="1.2" patternTransform="rotate(45)"><line x1="0" y1="0" x2="0" y2="1.2" stroke="${axes}" stroke-width="0.18" stroke-opacity="0.45"/></pattern></defs>`,
  );
  parts.push(`<rect class="background" x="0" y="0" width="${f(W)}" height="${f(H)}" fill="${pal.background}"/>`);
  parts.push(`<g class="plot" data-x0="${f(x0)}" data-x1="${f(x1)}" data-y0="${f(y0)}" data-y1="${f(y1)}" data-rmax-bohr="${rMax}" data-unit="${unit}">`);

  // Forbidden regions first (under the curve).
  if (tp < rMax) {
    parts.push(`<rect class="forbidden forbidden-outer" data-r-bohr="${tp}" x="${f(X(tp))}" y="${f(y1)}" width="${f(x1 - X(tp))}" height="${f(y0 - y1)}" fill="url(#psf-hatch)"/>`);
    parts.push(`<text class="note" x="${f(x1 - 0.6)}" y="${f(y1 + fs)}" text-anchor="end">classically forbidden (r &gt; ${f(tp * k)} ${unitLabel})</text>`);
  }
  if (inner > 0 && inner < rMax) {
    parts.push(`<rect class="forbidden forbidden-inner" data-r-bohr="${inner}" x="${f(x0)}" y="${f(y1)}" width="${f(X(inner) - x0)}" height="${f(y0 - y1)}" fill="url(#psf-hatch)"/>`);
  }
  parts.push(`<line class="turning-point" x1="${f(X(tp))}" y1="${f(y0)}" x2="${f(X(tp))}" y2="${f(y1)}" stroke="${axes}" stroke-width="0.2" stroke-dasharray="0.8 0.6"/>`);

  // Lobes between nodes, filled by the sign of R.
  const bounds = [0, ...s.nodes.map(Number).filter((r) => r < rMax), rMax];
  for (let b = 0; b + 1 < bounds.length; b++) {
    const a = bounds[b];
    const c = bounds[b + 1];
    const pts: string[] = [`M${f(X(a))} ${f(y0)}`];
    let signSum = 0;
    for (let i = 0; i < s.r.length; i++) {
      const r = s.r[i];
      if (r <= a || r >= c) continue;
      pts.push(`L${f(X(r))} ${f(Y(s.P[i]))}`);
      signSum += s.R[i];
    }
    pts.push(`L${f(X(c))} ${f(y0)}Z`);
    const pos = signSum >= 0;
    parts.push(`<path class="${pos ? 'lobe-pos' : 'lobe-neg'}" d="${pts.join('')}" fill="${pos ? pal.positive : pal.negative}" fill-opacity="0.35" stroke="none"/>`);
  }
  const curve = Array.from(s.r, (r, i) => `${i ? 'L' : 'M'}${f(X(r))} ${f(Y(s.P[i]))}`).join('');
  parts.push(`<path class="curve" d="${curve}" fill="none" stroke="${pal.label}" stroke-width="0.35" stroke-linejoin="round"/>`);

  for (const node of s.nodes.map(Number)) {
    if (node >= rMax) continue;
    parts.push(`<circle class="node" data-r-bohr="${node}" cx="${f(X(node))}" cy="${f(y0)}" r="${f(fs * 0.28)}" fill="${pal.background}" stroke="${pal.label}" stroke-width="0.25"/>`);
    parts.push(`<text class="note" x="${f(X(node))}" y="${f(y0 - fs * 0.55)}" text-anchor="middle">node</text>`);
  }

  // Axes and ticks.
  parts.push(`<path class="axes" d="M${f(x0)} ${f(y1)}L${f(x0)} ${f(y0)}L${f(x1)} ${f(y0)}" fill="none" stroke="${axes}" stroke-width="0.25"/>`);
  for (const t of xAxis.values) {
    const x = x0 + (t / (rMax * k)) * (x1 - x0);
    parts.push(`<line class="xtick" x1="${f(x)}" y1="${f(y0)}" x2="${f(x)}" y2="${f(y0 + fs * 0.35)}" stroke="${axes}" stroke-width="0.2"/>`);
    parts.push(`<text class="tick" x="${f(x)}" y="${f(y0 + fs * 1.3)}" text-anchor="middle">${tickLabel(t, xStep)}</text>`);
  }
  for (const t of ticks(0, yTop, yStep)) {
    const y = y0 - (t / yTop) * (y0 - y1);
    parts.push(`<line class="ytick" x1="${f(x0 - fs * 0.35)}" y1="${f(y)}" x2="${f(x0)}" y2="${f(y)}" stroke="${axes}" stroke-width="0.2"/>`);
    parts.push(`<text class="tick" x="${f(x0 - fs * 0.55)}" y="${f(y + fs * 0.3)}" text-anchor="end">${tickLabel(t, yStep)}</text>`);
  }
  parts.push(`<text class="axis-title" x="${f((x0 + x1) / 2)}" y="${f(y0 + fs * 2.6)}" text-anchor="middle">r / ${unitAxis}</text>`);
  parts.push(
    `<text class="axis-title" transform="translate(${f(fs * 1.1)} ${f((y0 + y1) / 2)}) rotate(-90)" text-anchor="middle">${svgText(`P(r) = r²R² / ${unitText}^−1`, fs)}</text>`,
  );
  parts.push('</g>');
  parts.push(`<text class="title" x="${f(x0)}" y="${f(fs * 1.5)}">${svgText(title, fs * 1.15)}</text>`);
  parts.push(`<text class="note model-note" x="${f(W - fs * 0.5)}" y="${f(H - fs * 0.5)}" text-anchor="end">${MODEL_NOTE_SHORT}; many-electron orbitals differ</text>`);
  parts.push('</svg>\n');
  return parts.join('\n');
}
