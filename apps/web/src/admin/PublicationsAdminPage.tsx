import { useEffect, useState, type FormEvent } from 'react';
import { Button, Callout, FormGroup, HTMLSelect, HTMLTable, InputGroup, NonIdealState, Radio, RadioGroup, Spinner, Tag, TextArea } from '@blueprintjs/core';
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import {
  LENGTH_UNITS,
  LENGTH_UNIT_SYMBOLS,
  PUBLICATION_KINDS,
  ROLES,
  ROLE_LABELS,
  USER_STATE_LABELS,
  type LengthUnit,
  type PublicationAdminDto,
  type PublicationDto,
  type PublicationKind,
  type PublicationSortKey,
  type Role,
} from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { Pager, SortHeader, nextSort, useDebounced, SEARCH_DEBOUNCE_MS, type SortState } from '../components/TableParts';
import { formatDate } from '../figures/model';
import { SubjectAudit } from './SubjectAudit';
import { addMember, createPublication, listMembers, listPublicationsAdmin, listUsers, messagesByField, removeMember, setMemberRole, updatePublication } from './adminApi';
import { QueryStatus } from '../components/QueryStatus';
import { fieldMessages, FormMessages } from './FormMessages';
import { TableHead } from '../components/TableHead';

export const PUBLICATIONS_PAGE_SIZE = 25;
export const KIND_LABELS: Record<PublicationKind, string> = { book: 'Book', journal_volume: 'Journal volume' };
const UNIT_WORDS: Record<LengthUnit, string> = { angstrom: 'ångström (Å)', bohr: 'Bohr radius (a₀)' };
const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

interface PublicationFields {
  title: string;
  publisher: string;
  kind: PublicationKind;
  lengthUnit: LengthUnit;
  description: string;
}

const FIELDS = ['title', 'publisher', 'kind', 'lengthUnit', 'description'] as const;

/** Create or edit a publication: title, publisher, kind, the length unit of its figures, description. */
export function PublicationForm({ initial, submitText, onSubmit, pending }: { initial: PublicationFields; submitText: string; onSubmit(f: PublicationFields): Promise<unknown>; pending: boolean }) {
  const [f, setF] = useState<PublicationFields>(initial);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const set = <K extends keyof PublicationFields>(k: K, v: PublicationFields[K]) => setF((prev) => ({ ...prev, [k]: v }));

  async function submit(e: FormEvent) {
    e.preventDefault();
    const local: Record<string, string[]> = {};
    if (!f.title.trim()) local.title = ['Enter a title.'];
    if (!f.publisher.trim()) local.publisher = ['Enter the publisher.'];
    setErrors(local);
    if (Object.keys(local).length) return;
    try {
      await onSubmit({ ...f, title: f.title.trim(), publisher: f.publisher.trim() });
    } catch (err) {
      const body = err instanceof ApiError ? err.body : null;
      setErrors(messagesByField(body ? (Array.isArray(body.message) ? body.message : [body.message]) : [describeError(err)], FIELDS));
    }
  }
  const err = (k: string) => fieldMessages(errors[k], `pub-${k}-error`);

  return (
    <form className="pf-admin-form" onSubmit={(e) => void submit(e)} noValidate data-testid="publication-form">
      <FormGroup label="Title" labelFor="pub-title" helperText={err('title')} intent={errors.title ? 'danger' : 'none'}>
        <InputGroup id="pub-title" value={f.title} onValueChange={(v) => set('title', v)} intent={errors.title ? 'danger' : 'none'} data-testid="pub-title" />
      </FormGroup>
      <FormGroup label="Publisher" labelFor="pub-publisher" helperText={err('publisher')} intent={errors.publisher ? 'danger' : 'none'}>
        <InputGroup id="pub-publisher" value={f.publisher} onValueChange={(v) => set('publisher', v)} intent={errors.publisher ? 'danger' : 'none'} data-testid="pub-publisher" />
      </FormGroup>
      <FormGroup label="Kind" labelFor="pub-kind" helperText={err('kind')}>
        <HTMLSelect id="pub-kind" value={f.kind} onChange={(e) => set('kind', e.currentTarget.value as PublicationKind)} options={PUBLICATION_KINDS.map((k) => ({ value: k, label: KIND_LABELS[k] }))} data-testid="pub-kind" />
      </FormGroup>
      <RadioGroup label="Lengths in its figures" inline selectedValue={f.lengthUnit} onChange={(e) => set('lengthUnit', e.currentTarget.value as LengthUnit)}>
        {LENGTH_UNITS.map((u) => (
          <Radio key={u} value={u} label={UNIT_WORDS[u]} data-testid={`pub-unit-${u}`} />
        ))}
      </RadioGroup>
      {err('lengthUnit')}
      <FormGroup label="Description" labelFor="pub-description" helperText={err('description')}>
        <TextArea id="pub-description" value={f.description} onChange={(e) => set('description', e.currentTarget.value)} fill rows={2} data-testid="pub-description" />
      </FormGroup>
      <FormMessages messages={errors['']} testId="pub-error" />
      <Button type="submit" intent="primary" text={submitText} loading={pending} data-testid="pub-submit" />
    </form>
  );
}

const EMPTY: PublicationFields = { title: '', publisher: '', kind: 'book', lengthUnit: 'angstrom', description: '' };

/** The Publications admin page: every publication with its member count; create new ones. */
export function PublicationsAdminPage() {
  const api = useApi();
  const qc = useQueryClient();
  const [page, setPage] = useState(1);
  const [search, setSearch] = useState('');
  const [kind, setKind] = useState<PublicationKind | ''>('');
  const [sort, setSort] = useState<SortState<PublicationSortKey>>({ sort: 'title', order: 'asc' });
  const [creating, setCreating] = useState(false);
  const [created, setCreated] = useState<PublicationAdminDto | null>(null);
  const q = useDebounced(search, SEARCH_DEBOUNCE_MS);
  useEffect(() => setPage(1), [q, kind]);
  const params = { page, pageSize: PUBLICATIONS_PAGE_SIZE, q, kind, ...sort };
  const list = useQuery({ queryKey: ['publications-admin', params], queryFn: ({ signal }) => listPublicationsAdmin(api, params, signal), placeholderData: keepPreviousData });
  const create = useMutation({
    mutationFn: (f: PublicationFields) => createPublication(api, f),
    onSuccess: (p) => {
      setCreated(p);
      setCreating(false);
      void qc.invalidateQueries({ queryKey: ['publications-admin'] });
      void qc.invalidateQueries({ queryKey: ['publications'] });
    },
  });
  const onSort = (k: PublicationSortKey) => {
    setSort(nextSort(sort, k, ['members', 'createdAt']));
    setPage(1);
  };
  const items = list.data?.items ?? [];

  return (
    <div className="pf-page pf-page-wide" data-testid="publications-admin">
      <header className="pf-page-head">
        <h1>Manage publications</h1>
        <p className="pf-muted">Books and journal volumes, who works on each and in which role.</p>
      </header>
      <section className="pf-section">
        <div className="pf-toolbar">
          <InputGroup type="search" leftIcon="search" placeholder="Search titles and publishers" value={search} onValueChange={setSearch} aria-label="Search publications" data-testid="pubs-search" className="pf-search" />
          <HTMLSelect value={kind} onChange={(e) => setKind(e.currentTarget.value as PublicationKind | '')} aria-label="Filter by kind" data-testid="pubs-kind" options={[{ value: '', label: 'Any kind' }, ...PUBLICATION_KINDS.map((k) => ({ value: k, label: KIND_LABELS[k] }))]} />
          {list.isFetching && !list.isPending && <Spinner size={16} aria-label="Refreshing" />}
          <span className="pf-toolbar-end">
            <Button icon="add" intent="primary" text="New publication" active={creating} onClick={() => setCreating((v) => !v)} data-testid="pubs-new" />
          </span>
        </div>
        {creating && <PublicationForm initial={EMPTY} submitText="Create publication" pending={create.isPending} onSubmit={(f) => create.mutateAsync(f)} />}
        {created && (
          <Callout intent="success" compact className="pf-gap" data-testid="pubs-created">
            Created <Link to={`/manage/publications/${encodeURIComponent(created.id)}`}>{created.title}</Link>. Add its members there.
          </Callout>
        )}
      </section>
      <QueryStatus query={list} what="publications" testId="pubs" />
      {list.isSuccess && items.length === 0 && <NonIdealState icon="book" title="No publication matches" />}
      {list.isSuccess && items.length > 0 && (
        <>
          <HTMLTable className="pf-table" striped interactive data-testid="pubs-table">
            <thead>
              <tr>
                <SortHeader label="Title" sortKey="title" state={sort} onSort={onSort} />
                <SortHeader label="Publisher" sortKey="publisher" state={sort} onSort={onSort} />
                <SortHeader label="Kind" sortKey="kind" state={sort} onSort={onSort} />
                <th scope="col">Lengths</th>
                <SortHeader label="Members" sortKey="members" state={sort} onSort={onSort} />
                <SortHeader label="Created" sortKey="createdAt" state={sort} onSort={onSort} />
              </tr>
            </thead>
            <tbody>
              {items.map((p) => (
                <tr key={p.id} data-testid="pub-row" data-publication-id={p.id}>
                  <td>
                    <Link to={`/manage/publications/${encodeURIComponent(p.id)}`} data-testid="pub-row-title">
                      {p.title}
                    </Link>
                  </td>
                  <td>{p.publisher}</td>
                  <td>{KIND_LABELS[p.kind]}</td>
                  <td>{LENGTH_UNIT_SYMBOLS[p.lengthUnit]}</td>
                  <td data-testid="pub-row-members">{p.memberCount}</td>
                  <td className="pf-small">{formatDate(p.createdAt)}</td>
                </tr>
              ))}
            </tbody>
          </HTMLTable>
          <Pager page={page} pageSize={PUBLICATIONS_PAGE_SIZE} total={list.data.total} onPage={setPage} testIdPrefix="pubs" />
        </>
      )}
    </div>
  );
}

/** Find a person by name or e-mail and add them with a role in this publication. */
function AddMember({ publicationId, memberIds, onAdded }: { publicationId: string; memberIds: Set<string>; onAdded(): void }) {
  const api = useApi();
  const [search, setSearch] = useState('');
  const [roles, setRoles] = useState<Record<string, Role>>({});
  const q = useDebounced(search, SEARCH_DEBOUNCE_MS);
  const found = useQuery({
    queryKey: ['people', 'member-search', q],
    queryFn: ({ signal }) => listUsers(api, { page: 1, pageSize: 8, q, sort: 'displayName', order: 'asc' }, signal),
    enabled: q.trim().length > 0,
  });
  const add = useMutation({ mutationFn: (v: { userId: string; role: Role }) => addMember(api, publicationId, v.userId, v.role), onSuccess: onAdded });
  return (
    <div className="pf-add-member" data-testid="add-member">
      <InputGroup type="search" leftIcon="search" placeholder="Find a person by name or e-mail" value={search} onValueChange={setSearch} aria-label="Find a person to add" data-testid="add-member-search" />
      {add.isError && (
        <Callout intent="danger" compact data-testid="add-member-error">
          {describeError(add.error)}
        </Callout>
      )}
      {found.isSuccess && found.data.items.length === 0 && <p className="pf-muted pf-small">Nobody matches “{q}”.</p>}
      {found.isSuccess && found.data.items.length > 0 && (
        <ul className="pf-plain-list">
          {found.data.items.map((u) => {
            const role = roles[u.id] ?? u.role;
            return (
              <li key={u.id} data-testid="add-member-candidate" data-email={u.email}>
                <span>
                  {u.displayName} <span className="pf-muted">{u.email}</span>
                </span>{' '}
                {memberIds.has(u.id) ? (
                  <Tag minimal>already a member</Tag>
                ) : (
                  <>
                    <HTMLSelect value={role} onChange={(e) => setRoles((r) => ({ ...r, [u.id]: e.currentTarget.value as Role }))} options={roleOptions} aria-label={`Role of ${u.displayName} here`} data-testid="add-member-role" />{' '}
                    <Button size="small" icon="add" text="Add" loading={add.isPending && add.variables?.userId === u.id} onClick={() => add.mutate({ userId: u.id, role })} data-testid="add-member-submit" />
                  </>
                )}
              </li>
            );
          })}
        </ul>
      )}
    </div>
  );
}

/** One publication as an admin sees it: its settings, members with their roles, and its history. */
export function PublicationAdminPage() {
  const { publicationId = '' } = useParams<{ publicationId: string }>();
  const api = useApi();
  const qc = useQueryClient();
  const [saved, setSaved] = useState(false);
  const pub = useQuery({ queryKey: ['publication', publicationId], queryFn: ({ signal }) => api.request<PublicationDto>(`/api/publications/${encodeURIComponent(publicationId)}`, { signal }) });
  const members = useQuery({ queryKey: ['members', publicationId], queryFn: ({ signal }) => listMembers(api, publicationId, signal) });
  const refresh = () => {
    void qc.invalidateQueries({ queryKey: ['members', publicationId] });
    void qc.invalidateQueries({ queryKey: ['publications-admin'] });
    void qc.invalidateQueries({ queryKey: ['subject-audit', 'publication', publicationId] });
    void qc.invalidateQueries({ queryKey: ['people'] });
  };
  const save = useMutation({
    mutationFn: (f: PublicationFields) => updatePublication(api, publicationId, f),
    onSuccess: (p) => {
      qc.setQueryData(['publication', publicationId], p);
      setSaved(true);
      refresh();
      void qc.invalidateQueries({ queryKey: ['publications'] });
    },
  });
  const change = useMutation({
    mutationFn: (v: { userId: string; role: Role | null }) => (v.role ? setMemberRole(api, publicationId, v.userId, v.role) : removeMember(api, publicationId, v.userId)),
    onSuccess: refresh,
  });

  if (pub.isPending) return <NonIdealState icon={<Spinner size={32} />} title="Loading the publication…" />;
  if (pub.isError)
    return (
      <div className="pf-page">
        <Callout intent="danger" title="The publication could not be loaded" data-testid="pub-admin-error">
          {describeError(pub.error)} <Link to="/manage/publications">Back to publications</Link>
        </Callout>
      </div>
    );
  const p = pub.data;
  const memberIds = new Set((members.data ?? []).map((m) => m.id));

  return (
    <div className="pf-page pf-page-wide" data-testid="publication-admin">
      <header className="pf-page-head">
        <p className="pf-crumbs">
          <Link to="/manage/publications">Manage publications</Link>
        </p>
        <h1 data-testid="pub-admin-title">{p.title}</h1>
        <p className="pf-muted">{p.publisher}</p>
      </header>
      <div className="pf-admin-columns">
        <section className="pf-section">
          <h2>Settings</h2>
          <PublicationForm
            key={p.id}
            initial={{ title: p.title, publisher: p.publisher, kind: p.kind, lengthUnit: p.lengthUnit ?? 'angstrom', description: p.description }}
            submitText="Save changes"
            pending={save.isPending}
            onSubmit={async (f) => {
              setSaved(false);
              await save.mutateAsync(f);
            }}
          />
          {saved && (
            <Callout intent="success" compact className="pf-gap" data-testid="pub-saved">
              Saved.
            </Callout>
          )}
          <h3>Delivery profile</h3>
          <p className="pf-muted pf-small" data-testid="pub-delivery-profile">
            The rules its deliverables must meet (sizes, dpi, colour, formats) are set on the publication's delivery profile by its art directors.{' '}
            <Link to={`/publications/${encodeURIComponent(p.id)}/house-style`}>House style</Link>
          </p>
        </section>
        <section className="pf-section">
          <h2>Members</h2>
          {members.isPending && <Spinner size={20} />}
          {members.isError && <Callout intent="danger">{describeError(members.error)}</Callout>}
          {change.isError && (
            <Callout intent="danger" compact data-testid="member-error">
              {describeError(change.error)}
            </Callout>
          )}
          {members.isSuccess && members.data.length === 0 && <p className="pf-muted" data-testid="members-empty">Nobody works on this publication yet.</p>}
          {members.isSuccess && members.data.length > 0 && (
            <HTMLTable className="pf-table" compact data-testid="members-table">
              <TableHead columns={['Name', 'Role here', 'Account', { hidden: 'Actions' }]} />
              <tbody>
                {members.data.map((m) => (
                  <tr key={m.id} data-testid="member-row" data-email={m.email}>
                    <td>
                      {m.displayName}
                      <br />
                      <span className="pf-muted pf-small">{m.email}</span>
                    </td>
                    <td>
                      <HTMLSelect value={m.publicationRole} onChange={(e) => change.mutate({ userId: m.id, role: e.currentTarget.value as Role })} options={roleOptions} aria-label={`Role of ${m.displayName} here`} data-testid="member-role" />
                    </td>
                    <td className="pf-small">{USER_STATE_LABELS[m.state]}</td>
                    <td>
                      <Button size="small" variant="minimal" icon="cross" text="Remove" onClick={() => change.mutate({ userId: m.id, role: null })} data-testid="member-remove" />
                    </td>
                  </tr>
                ))}
              </tbody>
            </HTMLTable>
          )}
          <h3>Add someone</h3>
          <AddMember publicationId={p.id} memberIds={memberIds} onAdded={refresh} />
        </section>
      </div>
      <section className="pf-section">
        <h2>History</h2>
        <SubjectAudit kind="publication" id={p.id} />
      </section>
    </div>
  );
}
