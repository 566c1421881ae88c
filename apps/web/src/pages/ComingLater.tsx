import { NonIdealState, Tag } from '@blueprintjs/core';
import type { NavItem } from '../nav/navigation';

/** Honest placeholder for places that are planned but not built: no sample data, no fake controls. */
export function ComingLater({ item }: { item: NavItem }) {
  return (
    <div className="pf-page" data-testid="coming-later">
      <header className="pf-page-head">
        <h1>{item.label}</h1>
      </header>
      <NonIdealState
        icon={item.icon}
        title="Coming in a later release"
        description={
          <>
            <p>{item.purpose}</p>
            <p className="pf-muted">
              This part of Psiform is not built yet. Nothing here is stored or shown until it is.
            </p>
          </>
        }
        action={<Tag minimal>planned</Tag>}
      />
    </div>
  );
}
