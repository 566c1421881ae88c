// Downloads of a figure's files: one button per file, naming its kind, physical size and dpi. A plain link
// cannot carry the Bearer token, so each click asks for a short-lived presigned link (/api/assets/:id/link);
// the storage answers it as an attachment named from the figure, and a hidden <a download> saves it: the
// app's page stays where it is (nothing navigates the tab).
import { useState } from 'react';
import { Button, Callout } from '@blueprintjs/core';
import type { AssetDto } from '@psiform/contracts';
import { formatBytes } from '@psiform/orbitals';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';

/** Starts a download without leaving the page (swappable in tests). */
export const browser = {
  download(url: string, fileName: string): void {
    const a = document.createElement('a');
    a.href = url;
    a.download = fileName;
    a.rel = 'noopener';
    a.style.display = 'none';
    document.body.appendChild(a);
    a.click();
    a.remove();
  },
};

const KIND_WORDS: Record<string, string> = {
  glb: 'GLB mesh',
  stl: 'STL mesh',
  ply: 'PLY mesh',
  obj: 'OBJ mesh',
  nrrd: 'NRRD cube',
  png: 'PNG',
  tiff: 'TIFF',
  pdf: 'PDF',
  svg: 'SVG',
  bundle: 'Bundle (zip)',
};

function num(stats: AssetDto['stats'], k: string): number | undefined {
  const v = (stats as Record<string, unknown> | null)?.[k];
  return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
}

function mm(x: number): string {
  return String(Number(x.toFixed(1)));
}

/** "PNG · 180 × 120 mm · 600 dpi", "SVG section (xz) · 89 × 60 mm", "GLB mesh": what the file is, from its stats. */
export function assetCaption(a: AssetDto): string {
  const s = (a.stats ?? {}) as Record<string, unknown>;
  const parts: string[] = [];
  const plot = a.kind === 'svg' ? s.svg : a.kind === 'pdf' ? s.pdf : undefined;
  if (a.kind === 'svg' || a.kind === 'pdf') {
    const k = a.kind.toUpperCase();
    parts.push(plot === 'section' ? `${k} section${typeof s.plane === 'string' ? ` (${s.plane})` : ''}` : plot === 'radial' ? `${k} radial plot` : k);
  }
  else if (a.kind === 'png' && s.thumbnail === true) parts.push('PNG thumbnail');
  else parts.push(KIND_WORDS[a.kind] ?? a.kind.toUpperCase());
  const w = num(a.stats, 'widthMm');
  const h = num(a.stats, 'heightMm');
  const dpi = num(a.stats, 'dpi');
  const wp = num(a.stats, 'widthPx');
  const hp = num(a.stats, 'heightPx');
  if (s.thumbnail === true && wp && hp) parts.push(`${wp} × ${hp} px`);
  else {
    if (w !== undefined && h !== undefined) parts.push(`${mm(w)} × ${mm(h)} mm`);
    if (dpi !== undefined && a.kind !== 'svg') parts.push(`${dpi} dpi`);
  }
  // Print files say their colour: CMYK with the press condition, or RGB.
  if ((a.kind === 'tiff' || a.kind === 'pdf') && (s.colour === 'cmyk' || s.colour === 'rgb')) parts.push(s.colour === 'cmyk' ? `CMYK${typeof s.pressCondition === 'string' ? ` ${s.pressCondition.toUpperCase()}` : ''}` : 'RGB');
  return parts.join(' · ');
}

/**
 * One button per file. `testid` names each button (default download-<kind>); every button also carries
 * data-asset-id and data-kind.
 */
export function AssetDownloads({ assets, testid, containerTestid = 'asset-downloads', primary }: { assets: AssetDto[]; testid?: (a: AssetDto) => string; containerTestid?: string; primary?: boolean }) {
  const api = useApi();
  const [busy, setBusy] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);

  async function download(a: AssetDto) {
    setBusy(a.id);
    setError(null);
    try {
      const link = await api.assetLink(a.id);
      browser.download(link.url, link.fileName);
      setSaved(link.fileName);
    } catch (err) {
      setError(`The ${assetCaption(a)} file could not be fetched: ${describeError(err)}`);
    } finally {
      setBusy(null);
    }
  }

  if (assets.length === 0) return null;
  return (
    <div className="pf-downloads" data-testid={containerTestid}>
      {assets.map((a) => (
        <Button
          key={a.id}
          icon="download"
          intent={primary ? 'primary' : 'none'}
          text={`Download ${assetCaption(a)} · ${formatBytes(a.bytes)}`}
          loading={busy === a.id}
          onClick={() => void download(a)}
          data-testid={testid ? testid(a) : `download-${a.kind}`}
          data-asset-id={a.id}
          data-kind={a.kind}
        />
      ))}
      {saved && (
        <p className="pf-muted pf-small" data-testid="download-saved" aria-live="polite">
          Saving as {saved}
        </p>
      )}
      {error && (
        <Callout intent="danger" data-testid="download-error">
          {error}
        </Callout>
      )}
    </div>
  );
}
