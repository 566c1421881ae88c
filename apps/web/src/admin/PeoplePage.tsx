import { useEffect, useState, type FormEvent } from 'react';
import { Button, Callout, FormGroup, HTMLSelect, HTMLTable, InputGroup, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { ROLES, ROLE_LABELS, USER_STATES, USER_STATE_LABELS, type Role, type UserAdminDto, type UserSortKey, type UserState } from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { Pager, SortHeader, nextSort, useDebounced, SEARCH_DEBOUNCE_MS, type SortState } from '../components/TableParts';
import { formatDate } from '../figures/model';
import { SubjectAudit } from './SubjectAudit';
import { inviteUser, listUsers, messagesByField, resendInvitation, sendPasswordReset, updateUser } from './adminApi';
import { QueryStatus } from '../components/QueryStatus';
import { fieldMessages, FormMessages } from './FormMessages';

export const PEOPLE_PAGE_SIZE = 25;

const stateIntent = (s: UserState) => (s === 'active' ? ('success' as const) : s === 'invited' ? ('primary' as const) : ('none' as const));

/** A plain check that catches typing slips before the server's own check (which is the one that counts). */
export const looksLikeEmail = (s: string) => /^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(s.trim());

const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

/** Create an account by e-mail: the person gets a one-time link to choose their password. */
export function InviteForm({ onDone }: { onDone(user: UserAdminDto): void }) {
  const api = useApi();
  const [email, setEmail] = useState('');
  const [displayName, setDisplayName] = useState('');
  const [role, setRole] = useState<Role>('illustrator');
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const invite = useMutation({
    mutationFn: () => inviteUser(api, { email: email.trim(), displayName: displayName.trim(), role }),
    onSuccess: (u) => {
      setEmail('');
      setDisplayName('');
      setErrors({});
      onDone(u);
    },
    onError: (err) => {
      const body = err instanceof ApiError ? err.body : null;
      const messages = body ? (Array.isArray(body.message) ? body.message : [body.message]) : [describeError(err)];
      setErrors(messagesByField(messages, ['email', 'displayName', 'role']));
    },
  });

  function submit(e: FormEvent) {
    e.preventDefault();
    const local: Record<string, string[]> = {};
    if (!email.trim()) local.email = ['Enter an e-mail address.'];
    else if (!looksLikeEmail(email)) local.email = ['This does not look like an e-mail address.'];
    if (!displayName.trim()) local.displayName = ['Enter the name to show for this person.'];
    setErrors(local);
    if (Object.keys(local).length === 0) invite.mutate();
  }

  const fieldError = (f: string, id: string) => fieldMessages(errors[f], id);

  return (
    <form className="pf-admin-form" onSubmit={submit} noValidate data-testid="invite-form" aria-label="Invite someone">
      <FormGroup label="E-mail" labelFor="invite-email" helperText={fieldError('email', 'invite-email-error')} intent={errors.email ? 'danger' : 'none'}>
        <InputGroup id="invite-email" type="email" value={email} onValueChange={setEmail} intent={errors.email ? 'danger' : 'none'} data-testid="invite-email" />
      </FormGroup>
      <FormGroup label="Name" labelFor="invite-name" helperText={fieldError('displayName', 'invite-name-error')} intent={errors.displayName ? 'danger' : 'none'}>
        <InputGroup id="invite-name" value={displayName} onValueChange={setDisplayName} intent={errors.displayName ? 'danger' : 'none'} data-testid="invite-name" />
      </FormGroup>
      <FormGroup label="Role" labelFor="invite-role" helperText={fieldError('role', 'invite-role-error')}>
        <HTMLSelect id="invite-role" value={role} onChange={(e) => setRole(e.currentTarget.value as Role)} options={roleOptions} data-testid="invite-role" />
      </FormGroup>
      <FormMessages messages={errors['']} testId="invite-error" />
      <Button type="submit" intent="primary" icon="envelope" text="Send invitation" loading={invite.isPending} data-testid="invite-submit" />
    </form>
  );
}

type RowNote = { intent: 'success' | 'danger'; text: string } | null;

function PersonRow({ u, self, onChanged }: { u: UserAdminDto; self: boolean; onChanged(): void }) {
  const api = useApi();
  const [note, setNote] = useState<RowNote>(null);
  const [confirming, setConfirming] = useState(false);
  const [history, setHistory] = useState(false);
  const act = useMutation({
    mutationFn: (a: { kind: 'role'; role: Role } | { kind: 'active'; active: boolean } | { kind: 'resend' } | { kind: 'reset' }) => {
      if (a.kind === 'role') return updateUser(api, u.id, { role: a.role });
      if (a.kind === 'active') return updateUser(api, u.id, { active: a.active });
      if (a.kind === 'resend') return resendInvitation(api, u.id);
      return sendPasswordReset(api, u.id);
    },
    onSuccess: (_res, a) => {
      setConfirming(false);
      const words =
        a.kind === 'role'
          ? `Role changed to ${ROLE_LABELS[a.role].toLowerCase()}.`
          : a.kind === 'active'
            ? a.active
              ? 'Reactivated: they can sign in again.'
              : 'Deactivated: their sessions have ended.'
            : a.kind === 'resend'
              ? `A new invitation is on its way to ${u.email}.`
              : `A password-reset link is on its way to ${u.email}.`;
      setNote({ intent: 'success', text: words });
      onChanged();
    },
    onError: (err) => setNote({ intent: 'danger', text: describeError(err) }),
  });

  return (
    <>
      <tr data-testid="person-row" data-user-id={u.id} data-email={u.email}>
        <td data-testid="person-name">
          {u.displayName}
          {self && <span className="pf-muted pf-small"> (you)</span>}
        </td>
        <td data-testid="person-email">{u.email}</td>
        <td>
          <HTMLSelect
            value={u.role}
            disabled={self || act.isPending}
            onChange={(e) => act.mutate({ kind: 'role', role: e.currentTarget.value as Role })}
            options={roleOptions}
            aria-label={`Role of ${u.displayName}`}
            data-testid="person-role"
          />
        </td>
        <td>
          <Tag minimal intent={stateIntent(u.state)} data-testid="person-state">
            {USER_STATE_LABELS[u.state]}
          </Tag>
        </td>
        <td data-testid="person-publications" className="pf-small">
          {u.memberships.length === 0
            ? '—'
            : u.memberships.map((m, i) => (
                <span key={m.publicationId}>
                  {i > 0 && ', '}
                  <Link to={`/manage/publications/${encodeURIComponent(m.publicationId)}`}>{m.publicationTitle}</Link> ({ROLE_LABELS[m.role].toLowerCase()})
                </span>
              ))}
        </td>
        <td className="pf-small">{formatDate(u.createdAt)}</td>
        <td className="pf-cell-actions">
          {u.state === 'invited' && <Button size="small" variant="minimal" icon="envelope" text="Send again" onClick={() => act.mutate({ kind: 'resend' })} data-testid="person-resend" />}
          {u.state === 'active' && <Button size="small" variant="minimal" icon="key" text="Reset password" onClick={() => act.mutate({ kind: 'reset' })} data-testid="person-reset" />}
          {u.state !== 'deactivated' && !self && <Button size="small" variant="minimal" icon="disable" text="Deactivate" onClick={() => setConfirming(true)} data-testid="person-deactivate" />}
          {u.state === 'deactivated' && <Button size="small" variant="minimal" icon="unlock" text="Reactivate" onClick={() => act.mutate({ kind: 'active', active: true })} data-testid="person-reactivate" />}
          <Button size="small" variant="minimal" icon="history" text="History" active={history} onClick={() => setHistory((h) => !h)} data-testid="person-history" />
        </td>
      </tr>
      {(confirming || note || history) && (
        <tr className="pf-row-detail">
          <td colSpan={7}>
            {confirming && (
              <Callout intent="warning" compact data-testid="person-confirm">
                Deactivate {u.displayName}? They are signed out everywhere at once and cannot sign in until reactivated.{' '}
                <Button size="small" intent="danger" text="Deactivate" loading={act.isPending} onClick={() => act.mutate({ kind: 'active', active: false })} data-testid="person-confirm-deactivate" />{' '}
                <Button size="small" variant="minimal" text="Cancel" onClick={() => setConfirming(false)} />
              </Callout>
            )}
            {note && (
              <Callout intent={note.intent} compact data-testid={note.intent === 'success' ? 'person-message' : 'person-error'}>
                {note.text}
              </Callout>
            )}
            {history && <SubjectAudit kind="user" id={u.id} />}
          </td>
        </tr>
      )}
    </>
  );
}

/** The People page: every account, with invitations, roles, deactivation and password resets. Admins only. */
export function PeoplePage() {
  const api = useApi();
  const { user: me } = useAuth();
  const qc = useQueryClient();
  const [page, setPage] = useState(1);
  const [search, setSearch] = useState('');
  const [role, setRole] = useState<Role | ''>('');
  const [state, setState] = useState<UserState | ''>('');
  const [sort, setSort] = useState<SortState<UserSortKey>>({ sort: 'displayName', order: 'asc' });
  const [inviting, setInviting] = useState(false);
  const [invited, setInvited] = useState<UserAdminDto | null>(null);
  const q = useDebounced(search, SEARCH_DEBOUNCE_MS);
  useEffect(() => setPage(1), [q, role, state]);

  const params = { page, pageSize: PEOPLE_PAGE_SIZE, q, role, state, ...sort };
  const people = useQuery({ queryKey: ['people', params], queryFn: ({ signal }) => listUsers(api, params, signal), placeholderData: keepPreviousData });
  const refresh = () => void qc.invalidateQueries({ queryKey: ['people'] });
  const onSort = (k: UserSortKey) => {
    setSort(nextSort(sort, k, ['createdAt']));
    setPage(1);
  };
  const items = people.data?.items ?? [];

  return (
    <div className="pf-page pf-page-wide" data-testid="people-page">
      <header className="pf-page-head">
        <h1>People</h1>
        <p className="pf-muted">Accounts, roles and where each person works. Every change here is recorded in the person's history.</p>
      </header>

      <section className="pf-section">
        <div className="pf-toolbar">
          <InputGroup type="search" leftIcon="search" placeholder="Search names and e-mail" value={search} onValueChange={setSearch} aria-label="Search people" data-testid="people-search" className="pf-search" />
          <HTMLSelect value={role} onChange={(e) => setRole(e.currentTarget.value as Role | '')} aria-label="Filter by role" data-testid="people-role" options={[{ value: '', label: 'Any role' }, ...roleOptions]} />
          <HTMLSelect
            value={state}
            onChange={(e) => setState(e.currentTarget.value as UserState | '')}
            aria-label="Filter by state"
            data-testid="people-state"
            options={[{ value: '', label: 'Any state' }, ...USER_STATES.map((s) => ({ value: s, label: USER_STATE_LABELS[s] }))]}
          />
          {people.isFetching && !people.isPending && <Spinner size={16} aria-label="Refreshing" />}
          <span className="pf-toolbar-end">
            <Button icon="new-person" intent="primary" text="Invite someone" active={inviting} onClick={() => setInviting((v) => !v)} data-testid="invite-open" />
          </span>
        </div>
        {inviting && (
          <InviteForm
            onDone={(u) => {
              setInvited(u);
              setInviting(false);
              refresh();
            }}
          />
        )}
        {invited && (
          <Callout intent="success" compact className="pf-gap" data-testid="invite-done">
            Invitation sent to {invited.email}. The link in it works once and expires; you can send a new one from the table.
          </Callout>
        )}
      </section>

      <QueryStatus query={people} what="people" testId="people" />
      {people.isSuccess && items.length === 0 && <NonIdealState icon="people" title="Nobody matches" description="No account matches the search and filters." />}
      {people.isSuccess && items.length > 0 && (
        <>
          <HTMLTable className="pf-table" striped data-testid="people-table">
            <thead>
              <tr>
                <SortHeader label="Name" sortKey="displayName" state={sort} onSort={onSort} />
                <SortHeader label="E-mail" sortKey="email" state={sort} onSort={onSort} />
                <SortHeader label="Role" sortKey="role" state={sort} onSort={onSort} />
                <SortHeader label="State" sortKey="state" state={sort} onSort={onSort} />
                <th scope="col">Publications</th>
                <SortHeader label="Added" sortKey="createdAt" state={sort} onSort={onSort} />
                <th scope="col">
                  <span className="pf-visually-hidden">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {items.map((u) => (
                <PersonRow key={u.id} u={u} self={u.id === me?.id} onChanged={refresh} />
              ))}
            </tbody>
          </HTMLTable>
          <Pager page={page} pageSize={PEOPLE_PAGE_SIZE} total={people.data.total} onPage={setPage} testIdPrefix="people" />
        </>
      )}
    </div>
  );
}
