import { useMemo } from 'react';
import { CVD_KINDS, phaseWheel, simulateCvd, type CvdKind } from '@psiform/colour';
import type { SwatchbookColorsDto } from '@psiform/contracts';

const KIND_LABELS: Record<'normal' | CvdKind, string> = {
  normal: 'Normal vision',
  protanopia: 'Protanopia',
  deuteranopia: 'Deuteranopia',
  tritanopia: 'Tritanopia',
};

export type Colours = Required<Pick<SwatchbookColorsDto, 'positive' | 'negative' | 'background' | 'label'>> & Pick<SwatchbookColorsDto, 'nucleus' | 'axes'>;

export function mapColours(c: Colours, f: (hex: string) => string): Colours {
  return {
    positive: f(c.positive),
    negative: f(c.negative),
    background: f(c.background),
    label: f(c.label),
    nucleus: c.nucleus ? f(c.nucleus) : undefined,
    axes: c.axes ? f(c.axes) : undefined,
  };
}

/** A small sample figure: a p-type pair of lobes (positive above, negative below), nucleus, axis, label. */
export function SampleFigure({ colours, kind, caption, testId }: { colours: Colours; kind: 'normal' | CvdKind; caption?: string; testId?: string }) {
  return (
    <figure className="pf-cvd" data-testid={testId ?? `cvd-preview-${kind}`}>
      <svg viewBox="0 0 120 140" width="120" height="140" role="img" aria-label={caption ? `Sample figure: ${caption}` : `Sample figure as seen with ${KIND_LABELS[kind].toLowerCase()}`}>
        <rect x="0" y="0" width="120" height="140" fill={colours.background} data-part="background" />
        {colours.axes && <line x1="60" y1="8" x2="60" y2="122" stroke={colours.axes} strokeWidth="1" data-part="axes" />}
        <ellipse cx="60" cy="40" rx="24" ry="30" fill={colours.positive} data-part="positive" />
        <ellipse cx="60" cy="100" rx="24" ry="30" fill={colours.negative} data-part="negative" />
        {colours.nucleus && <circle cx="60" cy="70" r="3" fill={colours.nucleus} data-part="nucleus" />}
        <text x="8" y="134" fontSize="11" fill={colours.label} fontFamily="Lato, sans-serif" data-part="label">
          2p_z
        </text>
      </svg>
      <figcaption>{caption ?? KIND_LABELS[kind]}</figcaption>
    </figure>
  );
}

/** The sample figure four times: as drawn, and as simulated for the three dichromacies (simulateCvd). */
export function CvdPreviews({ colours }: { colours: Colours }) {
  const views = useMemo(
    () => [
      { kind: 'normal' as const, colours },
      ...CVD_KINDS.map((kind) => ({ kind, colours: mapColours(colours, (hex) => simulateCvd(hex, kind)) })),
    ],
    [colours],
  );
  return (
    <div className="pf-cvd-row" data-testid="cvd-previews">
      {views.map((v) => (
        <SampleFigure key={v.kind} kind={v.kind} colours={v.colours} />
      ))}
    </div>
  );
}

/** The complex-phase wheel (OKLCH, constant lightness and chroma) as a strip from phase 0 to 2π. */
export function PhaseWheelStrip({ lightness, chroma }: { lightness: number; chroma: number }) {
  const wheel = useMemo(() => {
    try {
      return phaseWheel({ lightness, chroma, steps: 36 });
    } catch {
      return null;
    }
  }, [lightness, chroma]);
  if (!wheel) return <p className="pf-muted" data-testid="wheel-invalid">Lightness must be between 0 and 1 and chroma from 0 to 0.4.</p>;
  const w = 360 / wheel.steps.length;
  return (
    <div data-testid="phase-wheel">
      <svg viewBox="0 0 360 24" width="100%" height="24" preserveAspectRatio="none" role="img" aria-label="Phase wheel from 0 to 2π">
        {wheel.steps.map((c, i) => (
          <rect key={i} x={i * w} y="0" width={w + 0.5} height="24" fill={c} />
        ))}
      </svg>
      <div className="pf-wheel-scale pf-muted pf-small">
        <span>phase 0</span>
        <span>π</span>
        <span>2π</span>
      </div>
      {wheel.clamped && (
        <p className="pf-small" data-testid="wheel-clamped">
          Chroma {wheel.requestedChroma} does not fit sRGB at every hue at this lightness; the wheel uses {wheel.chroma.toFixed(3)}.
        </p>
      )}
    </div>
  );
}
