import { describe, expect, it } from 'vitest';
import { drawPhaseKey, markPosition, PHASE_KEY_MARKS, phaseKeySectors, phaseKeySvg, sectorPath, type KeyCanvas } from '../src/phase-key';

describe('phase key geometry (angles counterclockwise from the right, y down on paper and screen)', () => {
  it('72 sectors tile the full turn without gaps, each coloured at its mid angle', () => {
    const s = phaseKeySectors();
    expect(s).toHaveLength(72);
    for (let i = 1; i < s.length; i++) expect(s[i].from).toBeCloseTo(s[i - 1].to, 12);
    expect(s[s.length - 1].to - s[0].from).toBeCloseTo(2 * Math.PI, 12);
    expect(s[18].angle).toBeCloseTo(Math.PI / 2, 12); // 18 × 5° = 90°
  });

  it('a quarter sector around 0 runs from (r cos 45°, +r sin 45°) to (r cos 45°, −r sin 45°): up on paper is −y', () => {
    const [first] = phaseKeySectors(4);
    // r = 10: 10 / √2 = 7.071; inner radius 5: 3.536.
    expect(sectorPath(0, 0, 10, first)).toBe('M7.071 7.071A10 10 0 0 0 7.071 -7.071L3.536 -3.536A5 5 0 0 1 3.536 3.536Z');
  });

  it('marks: 0 right of the ring, π/2 above, π left, 3π/2 below', () => {
    expect(PHASE_KEY_MARKS.map((m) => m.text)).toEqual(['0', 'π/2', 'π', '3π/2']);
    const at = PHASE_KEY_MARKS.map((m) => markPosition(50, 50, 10, m.angle, 1));
    expect(at.map((p) => [Math.round(p.x), Math.round(p.y), p.anchor])).toEqual([
      [61, 50, 'start'],
      [50, 39, 'middle'],
      [39, 50, 'end'],
      [50, 61, 'middle'],
    ]);
  });

  it('the SVG group: one path per sector filled by the colour rule at its angle, the four marks as text', () => {
    const seen: number[] = [];
    const svg = phaseKeySvg({ cx: 10, cy: 10, r: 4, ink: '#111111', fontSize: 2, title: 'arg ψ', colourAt: (a) => (seen.push(a), a < Math.PI ? '#aa0000' : '#0000aa') });
    expect(seen).toHaveLength(72);
    expect(svg.match(/<path /g)).toHaveLength(72);
    expect(svg.match(/fill="#aa0000"/g)).toHaveLength(36);
    expect([...svg.matchAll(/class="phase-key-mark"[^>]*>([^<]*)</g)].map((m) => m[1])).toEqual(['0', 'π/2', 'π', '3π/2']);
    expect(svg).toContain('>arg ψ</text>');
  });

  it('Canvas 2D: each sector drawn as an outer arc counterclockwise on screen (angle −a) and filled in its colour', () => {
    const calls: string[] = [];
    const fills: unknown[] = [];
    const ctx: KeyCanvas = {
      fillStyle: '',
      font: '',
      textAlign: '',
      textBaseline: '',
      beginPath: () => calls.push('begin'),
      arc: (x, y, r, a0, a1, ccw) => calls.push(`arc ${r} ${a0.toFixed(4)} ${a1.toFixed(4)} ${ccw ? 'ccw' : 'cw'}`),
      closePath: () => undefined,
      fill() {
        fills.push(this.fillStyle);
      },
      fillText: (t) => calls.push(`text ${t}`),
      save: () => undefined,
      restore: () => undefined,
    };
    drawPhaseKey(ctx, { cx: 0, cy: 0, r: 10, colourAt: (a) => `c${Math.round((a * 180) / Math.PI)}`, ink: '#000', fontPx: 3, fontFamily: 'Lato' });
    expect(fills).toHaveLength(72);
    expect(fills[18]).toBe('c90');
    // Sector 0 spans −2.5°..2.5°: canvas angles +0.0436 .. −0.0436, counterclockwise.
    expect(calls[1]).toBe('arc 10 0.0436 -0.0436 ccw');
    expect(calls.filter((c) => c.startsWith('text'))).toEqual(['text 0', 'text π/2', 'text π', 'text 3π/2']);
  });
});
