import { deltaE2000 } from './difference';
import { simulateCvd, type CvdKind } from './cvd';
import { contrastRatio, WCAG_AA_GRAPHICS, WCAG_AA_TEXT } from './contrast';
import { pressCheck, PRESS_DELTA_E_LIMIT, type PressConditionInfo, type PressSwatch, type PressTransform } from './press';
import { phaseWheel, DEFAULT_WHEEL } from './phase-wheel';

const { min } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface SwatchbookColors {
  positive: string;
  negative: string;
  background: string;
  label: string;
  nucleus?: string;
  axes?: string;
  wheel?: { lightness: number; chroma: number };
}

export type WarningLevel = 'warning' | 'error';

export interface SwatchbookWarning {
  code: 'phases_too_similar' | 'label_contrast_low' | 'phase_background_contrast_low' | 'out_of_print_gamut' | 'wheel_clamped';
  level: WarningLevel;
  message: string;
  /** Swatch names involved, e.g. ["positive", "negative"]. */
  colors: string[];
}

export interface SwatchbookFigures {
  phaseDeltaE2000: number;
  phaseDeltaE2000Protan: number;
  phaseDeltaE2000Deutan: number;
  phaseDeltaE2000Tritan: number;
  /** WCAG 2.x contrast of label on background. */
  labelContrast: number;
  positiveBackgroundContrast: number;
  negativeBackgroundContrast: number;
  nucleusBackgroundContrast?: number;
  axesBackgroundContrast?: number;
  /** Swatch names out of gamut on the press condition checked (empty when none was given: see `print`). */
  outOfPrintGamut: string[];
  /** Each swatch through the press condition's ICC profile; null when the caller passed no press transform. */
  print: { condition: PressConditionInfo; swatches: (PressSwatch & { name: string })[] } | null;
  wheel?: { lightness: number; chroma: number; requestedChroma: number; clamped: boolean; neighbourDeltaE2000: number };
}

export interface SwatchbookCheck {
  figures: SwatchbookFigures;
  warnings: SwatchbookWarning[];
}

/**
 * Our thresholds for "the two phases are too similar" (ΔE00 of positive vs negative, for normal vision and
 * each simulated dichromacy). ΔE00 ≈ 2 is about a just-noticeable difference side by side; phase colours must
 * be told apart at a glance, on paper, at lobe size, and under colour-vision deficiency, so we ask for ten
 * times that: below 20 warns, below 10 is an error-level warning. Our own choice, not a standard.
 */
export const PHASE_DELTA_E_WARN = 20;
export const PHASE_DELTA_E_ERROR = 10;

const CVD: [CvdKind, 'phaseDeltaE2000Protan' | 'phaseDeltaE2000Deutan' | 'phaseDeltaE2000Tritan', string][] = [
  ['protanopia', 'phaseDeltaE2000Protan', 'protanopia'],
  ['deuteranopia', 'phaseDeltaE2000Deutan', 'deuteranopia'],
  ['tritanopia', 'phaseDeltaE2000Tritan', 'tritanopia'],
];

const round = (v: number, d = 2) => Math.round(v * 10 ** d) / 10 ** d;

export interface SwatchbookCheckOptions {
  /** The press condition to check the swatches on (the apps build it from assets/icc; see press.ts). */
  press?: PressTransform;
}

export function checkSwatchbook(colors: SwatchbookColors, options: SwatchbookCheckOptions = {}): SwatchbookCheck {
  const warnings: SwatchbookWarning[] = [];
  const { positive, negative, background, label } = colors;

  const phase = (de: number, who: string) => {
    if (de >= PHASE_DELTA_E_WARN) return;
    const level: WarningLevel = de < PHASE_DELTA_E_ERROR ? 'error' : 'warning';
    warnings.push({
      code: 'phases_too_similar',
      level,
      colors: ['positive', 'negative'],
      message:
        `positive and negative phases differ by ΔE00 ${de.toFixed(1)} ${who}; Psiform asks for at least ${PHASE_DELTA_E_WARN} ` +
        `(below ${PHASE_DELTA_E_ERROR} is an error): ΔE00 ≈ 2 is only just noticeable, and phases must be told apart at a glance in print and under colour-vision deficiency`,
    });
  };

  const phaseDeltaE2000 = deltaE2000(positive, negative);
  phase(phaseDeltaE2000, 'for normal colour vision');
  const cvd = {} as Record<(typeof CVD)[number][1], number>;
  for (const [kind, key, name] of CVD) {
    const de = deltaE2000(simulateCvd(positive, kind), simulateCvd(negative, kind));
    cvd[key] = round(de);
    phase(de, `under simulated ${name} (Machado et al. 2009)`);
  }

  const labelContrast = contrastRatio(label, background);
  if (labelContrast < WCAG_AA_TEXT) {
    warnings.push({
      code: 'label_contrast_low',
      level: labelContrast < WCAG_AA_GRAPHICS ? 'error' : 'warning',
      colors: ['label', 'background'],
      message: `label on background has contrast ${labelContrast.toFixed(2)}:1; WCAG 2.1 (1.4.3, AA) asks for at least ${WCAG_AA_TEXT}:1 for text`,
    });
  }

  const onBackground = (name: string, hex: string): number => {
    const c = contrastRatio(hex, background);
    if (c < WCAG_AA_GRAPHICS) {
      warnings.push({
        code: 'phase_background_contrast_low',
        level: 'warning',
        colors: [name, 'background'],
        message: `${name} on background has contrast ${c.toFixed(2)}:1; WCAG 2.1 (1.4.11) asks for at least ${WCAG_AA_GRAPHICS}:1 for graphical objects`,
      });
    }
    return round(c);
  };

  const named: [string, string | undefined][] = [
    ['positive', positive],
    ['negative', negative],
    ['background', background],
    ['label', label],
    ['nucleus', colors.nucleus],
    ['axes', colors.axes],
  ];
  const outOfPrintGamut: string[] = [];
  let print: SwatchbookFigures['print'] = null;
  const press = options.press;
  if (press) {
    const swatches: (PressSwatch & { name: string })[] = [];
    for (const [name, hex] of named) {
      if (!hex) continue;
      const r = { name, ...pressCheck(hex, press) };
      swatches.push(r);
      if (!r.inGamut) {
        outOfPrintGamut.push(name);
        warnings.push({
          code: 'out_of_print_gamut',
          level: 'warning',
          colors: [name],
          message: `${name} ${hex} is out of gamut on ${press.condition.name}: it separates to C ${r.cmyk[0]} M ${r.cmyk[1]} Y ${r.cmyk[2]} K ${r.cmyk[3]} and prints ΔE00 ${r.deltaE00.toFixed(1)} away (over ${PRESS_DELTA_E_LIMIT})`,
        });
      }
    }
    print = { condition: press.condition, swatches };
  }

  const figures: SwatchbookFigures = {
    phaseDeltaE2000: round(phaseDeltaE2000),
    ...cvd,
    labelContrast: round(labelContrast),
    positiveBackgroundContrast: onBackground('positive', positive),
    negativeBackgroundContrast: onBackground('negative', negative),
    outOfPrintGamut,
    print,
  };
  if (colors.nucleus) figures.nucleusBackgroundContrast = onBackground('nucleus', colors.nucleus);
  if (colors.axes) figures.axesBackgroundContrast = onBackground('axes', colors.axes);

  if (colors.wheel) {
    const w = phaseWheel({ ...DEFAULT_WHEEL, ...colors.wheel, steps: 12 });
    figures.wheel = {
      lightness: w.lightness,
      chroma: round(w.chroma, 4),
      requestedChroma: w.requestedChroma,
      clamped: w.clamped,
      neighbourDeltaE2000: round(min(...w.steps.map((c, i) => deltaE2000(c, w.steps[(i + 1) % w.steps.length])))),
    };
    if (w.clamped) {
      warnings.push({
        code: 'wheel_clamped',
        level: 'warning',
        colors: ['wheel'],
        message: `wheel chroma ${w.requestedChroma} does not fit sRGB at every hue at lightness ${w.lightness}; lowered to ${w.chroma.toFixed(4)}`,
      });
    }
  }
  return { figures, warnings };
}
