// The phase key beside a figure whose colours are arg ψ: the same ring, marks and colours as the key drawn into the
// figure's 2D layer (libs/print phase-key.ts), here as inline SVG in screen pixels.
import { useMemo } from 'react';
import { phaseKeySvg, type PhaseColourAt } from '@psiform/print';

export function PhaseKeyLegend({ colourAt, size = 76, ink = 'currentColor' }: { colourAt: PhaseColourAt; size?: number; ink?: string }) {
  // The string is ours (path data, #rrggbb colours and the fixed marks), never user text.
  const svg = useMemo(() => phaseKeySvg({ cx: size / 2, cy: size / 2 + 4, r: size * 0.3, colourAt, ink, fontSize: 10 }), [colourAt, size, ink]);
  return (
    <span className="pf-phase-key" data-testid="phase-key" aria-label="Phase key: colour is arg ψ, marked 0, π/2, π, 3π/2">
      <svg width={size} height={size + 8} viewBox={`0 0 ${size} ${size + 8}`} role="img" aria-hidden dangerouslySetInnerHTML={{ __html: svg }} />
      <span>arg ψ</span>
    </span>
  );
}
