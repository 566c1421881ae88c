import { Button, Tag } from '@blueprintjs/core';
import { NavLink, Outlet } from 'react-router-dom';
import { ROLE_LABELS } from '@psiform/contracts';
import { useAuth } from '../auth/AuthProvider';
import { navItemsFor } from '../nav/navigation';
import { Wordmark } from './Wordmark';

/** Masthead, role-aware navigation and the page; shown only to a signed-in user. */
export function AppShell() {
  const { user, signOut } = useAuth();
  if (!user) return null; // RequireAuth above redirects before this renders
  const items = navItemsFor(user.role);

  return (
    <div className="pf-shell">
      <header className="pf-masthead" data-testid="masthead">
        <NavLink to="/publications" className="pf-home" aria-label="Psiform, go to Publications">
          <Wordmark />
        </NavLink>
        <div className="pf-who">
          <span className="pf-user-name" data-testid="user-name">
            {user.displayName}
          </span>
          <Tag minimal round className="pf-role" data-testid="user-role">
            {ROLE_LABELS[user.role]}
          </Tag>
          <Button variant="minimal" icon="log-out" text="Sign out" onClick={() => signOut('user')} data-testid="sign-out" />
        </div>
      </header>
      <div className="pf-body">
        <nav className="pf-nav" aria-label="Main" data-testid="main-nav">
          <ul>
            {items.map((item) => (
              <li key={item.path}>
                <NavLink
                  to={item.path}
                  className={({ isActive }) => (isActive ? 'pf-nav-link pf-nav-active' : 'pf-nav-link')}
                  data-testid={`nav-${item.path.slice(1)}`}
                >
                  <span>{item.label}</span>
                  {!item.ready && <span className="pf-later">later</span>}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
        <main className="pf-main">
          <Outlet />
        </main>
      </div>
    </div>
  );
}
