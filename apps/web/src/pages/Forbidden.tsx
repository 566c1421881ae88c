import { NonIdealState } from '@blueprintjs/core';
import { Link } from 'react-router-dom';
import { ROLE_LABELS, type Role } from '@psiform/contracts';

function list(roles: readonly Role[]): string {
  return roles.map((r) => ROLE_LABELS[r].toLowerCase()).join(', ');
}

/** 403-style page: the route exists, but not for this role. */
export function Forbidden({ what, allowed, role }: { what: string; allowed: readonly Role[]; role: Role }) {
  return (
    <div className="pf-page" data-testid="forbidden">
      <NonIdealState
        icon="lock"
        title={`${what} is not open to your role`}
        description={
          <>
            <p>
              {what} is for the {list(allowed)} role. You are signed in as {ROLE_LABELS[role].toLowerCase()}.
            </p>
            <p className="pf-muted">Error 403: not permitted. An administrator can change your role.</p>
          </>
        }
        action={<Link to="/publications">Back to Publications</Link>}
      />
    </div>
  );
}
