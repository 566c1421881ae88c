import { useState } from 'react';
import { Button, Callout } from '@blueprintjs/core';
import type { AssetDto } from '@psiform/contracts';
import { formatBytes } from '@psiform/orbitals';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';

const KIND_WORDS: Record<string, string> = {
  glb: 'GLB',
  stl: 'STL',
  ply: 'PLY',
  obj: 'OBJ',
  nrrd: 'NRRD',
  png: 'PNG',
  svg: 'SVG',
  bundle: 'Bundle',
};

/** Navigates the window (swappable in tests). */
export const browser = { go: (url: string) => window.location.assign(url) };

/**
 * One button per file. A plain link cannot carry the Bearer token, so each click asks for a short-lived
 * presigned URL (/api/assets/:id/link) and then goes there.
 */
export function AssetDownloads({ assets }: { assets: AssetDto[] }) {
  const api = useApi();
  const [busy, setBusy] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function download(a: AssetDto) {
    setBusy(a.id);
    setError(null);
    try {
      const link = await api.assetLink(a.id);
      browser.go(link.url);
    } catch (err) {
      setError(`The ${KIND_WORDS[a.kind] ?? a.kind} file could not be fetched: ${describeError(err)}`);
    } finally {
      setBusy(null);
    }
  }

  if (assets.length === 0) return null;
  return (
    <div className="pf-downloads" data-testid="asset-downloads">
      {assets.map((a) => (
        <Button
          key={a.id}
          icon="download"
          text={`${KIND_WORDS[a.kind] ?? a.kind.toUpperCase()} · ${formatBytes(a.bytes)}`}
          loading={busy === a.id}
          onClick={() => void download(a)}
          data-testid={`download-${a.kind}`}
        />
      ))}
      {error && (
        <Callout intent="danger" data-testid="download-error">
          {error}
        </Callout>
      )}
    </div>
  );
}
