import type { ReactNode } from 'react';
import { Tag } from '@blueprintjs/core';
import type { FigureDto } from '@psiform/contracts';
import { statusIntent } from './FiguresTable';
import { statusLabel } from './model';

/**
 * Under a figure's title, on its page and on its proof alike: its status, current version and owner; `children`
 * adds what that page says besides. Test ids: `<testId>-status`, `<testId>-version`.
 */
export function FigureMeta({ figure: f, testId, children }: { figure: FigureDto; testId: string; children?: ReactNode }) {
  return (
    <div className="pf-meta">
      <Tag minimal intent={statusIntent(f.status)} data-testid={`${testId}-status`}>
        {statusLabel(f.status)}
      </Tag>
      <span data-testid={`${testId}-version`}>Version {f.currentVersion.number}</span>
      {f.ownerName && <span>by {f.ownerName}</span>}
      {children}
    </div>
  );
}
