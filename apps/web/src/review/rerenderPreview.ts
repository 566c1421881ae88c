import type { FigureStatus, FigureSummaryDto } from '@psiform/contracts';
import type { ApiClient } from '../api/client';
import { statusLabel } from '../figures/model';

/** Same rule as the server (apps/api/src/swatchbooks/rerender.service.ts RERENDERABLE). */
export const RERENDERABLE: readonly FigureStatus[] = ['draft', 'changes_requested'];

export interface PreviewItem {
  figureId: string;
  title: string;
  status: FigureStatus;
  reason?: string;
}

export interface RerenderPreview {
  change: PreviewItem[];
  skipped: PreviewItem[];
}

const PAGE = 100;
const DETAIL_CONCURRENCY = 6;

async function allFigures(api: ApiClient, publicationId: string): Promise<FigureSummaryDto[]> {
  const out: FigureSummaryDto[] = [];
  for (let page = 1; ; page++) {
    const p = await api.listFigures({ publicationId, page, pageSize: PAGE, sort: 'title', order: 'asc' });
    out.push(...p.items);
    if (p.items.length === 0 || out.length >= p.total) return out;
  }
}

function skipReason(status: FigureStatus): string {
  if (status === 'approved' || status === 'released') return `${statusLabel(status)}: approved and released figures never change silently`;
  return `${statusLabel(status)}: a proof in review stays as it was submitted`;
}

/**
 * What a re-render would do, worked out before asking the server to do it: figures still being worked on
 * (draft, changes requested) that use the pinned swatchbook get a new version; everything else is listed
 * as skipped with the reason. Reading each candidate's recipe costs one GET per draft figure.
 */
export async function previewRerender(api: ApiClient, publicationId: string, swatchbookId: string): Promise<RerenderPreview> {
  const figures = await allFigures(api, publicationId);
  const change: PreviewItem[] = [];
  const skipped: PreviewItem[] = [];
  const candidates: FigureSummaryDto[] = [];
  for (const f of figures) {
    if (RERENDERABLE.includes(f.status)) candidates.push(f);
    else skipped.push({ figureId: f.id, title: f.title, status: f.status, reason: skipReason(f.status) });
  }
  for (let i = 0; i < candidates.length; i += DETAIL_CONCURRENCY) {
    const chunk = candidates.slice(i, i + DETAIL_CONCURRENCY);
    const details = await Promise.all(chunk.map((f) => api.figure(f.id)));
    details.forEach((d, k) => {
      const f = chunk[k];
      const uses = (d.currentVersion.recipe as { palette?: { swatchbookId?: string | null } }).palette?.swatchbookId === swatchbookId;
      if (uses) change.push({ figureId: f.id, title: f.title, status: f.status });
      else skipped.push({ figureId: f.id, title: f.title, status: f.status, reason: 'does not use the pinned swatchbook' });
    });
  }
  return { change, skipped };
}
