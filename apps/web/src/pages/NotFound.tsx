import { NonIdealState } from '@blueprintjs/core';
import { Link, useLocation } from 'react-router-dom';

export function NotFound() {
  const { pathname } = useLocation();
  return (
    <div className="pf-page" data-testid="not-found">
      <NonIdealState
        icon="search"
        title="No such page"
        description={`Psiform has no page at ${pathname}.`}
        action={<Link to="/publications">Go to Publications</Link>}
      />
    </div>
  );
}
