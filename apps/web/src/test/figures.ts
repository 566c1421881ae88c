import type { FigureVersionSummaryDto, ProofImageDto } from '@psiform/contracts';
import type { AssetDto, FigureDto, FigureSummaryDto, JobDto, Page } from '@psiform/contracts';
import { parseRecipe, type Recipe } from '@psiform/contracts';

/** A valid recipe (defaults filled in by the real schema) for a 2p_z figure. */
export function recipe2pz(overrides: Partial<{ n: number; fraction: number }> = {}): Recipe {
  const r = parseRecipe({
    version: 1,
    label: '2p_z',
    content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }] },
    grid: { n: overrides.n ?? 48, extent: 'auto' },
    surface: { rule: 'enclosed', fraction: overrides.fraction ?? 0.9 },
  });
  if (!r.ok) throw new Error(`test recipe invalid: ${JSON.stringify(r.issues)}`);
  return r.recipe;
}

export function summary(i: number, overrides: Partial<FigureSummaryDto> = {}): FigureSummaryDto {
  return {
    id: `f${i}`,
    publicationId: 'p1',
    title: `Plate ${i}`,
    ownerId: 'u-illustrator',
    ownerName: 'Test illustrator',
    status: 'draft',
    versionNumber: 1,
    label: '2p_z',
    updatedAt: '2025-02-01T10:00:00.000Z',
    ...overrides,
  };
}

export function page<T>(items: T[], total: number, pageNo = 1, pageSize = 25): Page<T> {
  return { items, total, page: pageNo, pageSize };
}

export const GLB_ASSET: AssetDto = {
  id: 'a-glb',
  kind: 'glb',
  bytes: 123_456,
  sha256: 'ab'.repeat(32),
  stats: {
    isovalue: 0.0123,
    enclosed: 0.9002,
    surfaces: [
      { phase: '+', vertices: 1200, triangles: 2396, area: 31.4159, volume: 12.5, components: 1, euler: 2, watertight: true },
      { phase: '-', vertices: 1198, triangles: 2392, area: 31.41, volume: 12.49, components: 1, euler: 2, watertight: true },
    ],
  },
  createdAt: '2025-02-01T10:05:00.000Z',
};

export const STL_ASSET: AssetDto = { id: 'a-stl', kind: 'stl', bytes: 2_000_000, sha256: 'cd'.repeat(32), stats: null, createdAt: '2025-02-01T10:05:00.000Z' };

export function figure(overrides: Partial<FigureDto> = {}): FigureDto {
  return {
    id: 'f1',
    publicationId: 'p1',
    title: 'Plate 1: the 2p_z orbital',
    ownerId: 'u-illustrator',
    ownerName: 'Test illustrator',
    status: 'draft',
    currentVersion: {
      id: 'v1',
      figureId: 'f1',
      number: 1,
      recipe: recipe2pz(),
      engineVersion: '0.1.0',
      authorId: 'u-illustrator',
      locked: false,
      createdAt: '2025-02-01T10:00:00.000Z',
    },
    assets: [],
    createdAt: '2025-02-01T10:00:00.000Z',
    updatedAt: '2025-02-01T10:00:00.000Z',
    ...overrides,
  };
}

export function job(overrides: Partial<JobDto> = {}): JobDto {
  return {
    id: 'j1',
    type: 'mesh',
    state: 'active',
    progress: 0,
    stage: 'queued',
    error: null,
    figureId: 'f1',
    assets: [],
    createdAt: '2025-02-01T10:01:00.000Z',
    updatedAt: '2025-02-01T10:01:00.000Z',
    ...overrides,
  };
}

/**
 * A text/event-stream response whose events the test pushes one at a time (send), then ends (close).
 * Chunks are split mid-event on purpose so the parser's buffering is exercised.
 */
export function sseStream() {
  let ctrl!: ReadableStreamDefaultController<Uint8Array>;
  const enc = new TextEncoder();
  const body = new ReadableStream<Uint8Array>({
    start(c) {
      ctrl = c;
    },
  });
  return {
    response: new Response(body, { status: 200, headers: { 'Content-Type': 'text/event-stream' } }),
    send(data: unknown) {
      const text = `data: ${JSON.stringify(data)}\n\n`;
      const cut = Math.floor(text.length / 2);
      ctrl.enqueue(enc.encode(text.slice(0, cut)));
      ctrl.enqueue(enc.encode(text.slice(cut)));
    },
    comment() {
      ctrl.enqueue(enc.encode(': keep-alive\n\n'));
    },
    close() {
      ctrl.close();
    },
  };
}

/** A version as GET /api/figures/:id/versions lists it. */
export function versionSummary(n: number, o: Partial<FigureVersionSummaryDto> = {}): FigureVersionSummaryDto {
  return { id: `v${n}`, number: n, current: false, locked: true, label: '2pz', recipeHash: `h${n}`, authorName: 'Ilse Marwick', createdAt: `2025-02-0${n}T10:00:00.000Z`, image: null, ...o };
}

export const PROOF_IMAGE: ProofImageDto = { assetId: 'a-png', kind: 'png', widthPx: 1051, heightPx: 709, dpi: 300, widthMm: 89, heightMm: 60, colourMode: 'RGB, sRGB (IEC 61966-2-1)', createdAt: '2025-02-02T10:00:00.000Z' };
