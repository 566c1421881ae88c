// The faces the figure's 2D layer is set in (preview, PNG, TIFF, thumbnails, set panels): Lato, the house face, and
// DejaVu Sans for what Lato's files lack (Greek ψ and π, sub- and superscript digits, Σ, ≈) — the order the vector
// companions use (apps/worker export/fonts.ts) and the Studio's CSS (--pf-font), so every file shows the same glyphs.
// Both come from the registry (@fontsource), bundled into dist/assets: no font request leaves our origin.
import '@fontsource/lato/400.css';
import '@fontsource/lato/700.css';
import '@fontsource/dejavu-sans/400.css';
import '@fontsource/dejavu-sans/700.css';

/** CSS font family list of the 2D layer: Canvas 2D falls back per character, so ψ in a Lato run is set in DejaVu Sans. */
export const OVERLAY_FAMILY = 'Lato, "DejaVu Sans", "Helvetica Neue", Arial, sans-serif';

/**
 * Waits until every face the 2D layer draws with is loaded: a canvas draws with whatever face is ready, so the render
 * page must not draw before (a PNG would carry a system font's ψ, or none).
 */
export async function loadOverlayFonts(): Promise<void> {
  await Promise.all(['700 32px Lato', '400 32px Lato', '700 32px "DejaVu Sans"', '400 32px "DejaVu Sans"'].map((f) => document.fonts.load(f, 'ψπΣ₀²')));
}
