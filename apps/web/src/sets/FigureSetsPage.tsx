// Figure sets: several figures of one publication as labelled panels of ONE image (one camera, one length scale),
// exported like a single figure. Create from the library's figures or the "every orbital of one shell" preset.
import { useEffect, useMemo, useState } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { Button, Callout, Checkbox, FormGroup, HTMLSelect, HTMLTable, InputGroup, NonIdealState, Spinner, TextArea } from '@blueprintjs/core';
import { DEFAULT_DELIVERY_PROFILE, FIGURE_SET_LIMITS, FIGURE_STATUSES, TEXT_LIMITS, textProblem, titleProblem, type DeliveryProfile, type FigureSetDto, type FigureSummaryDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { PublicationChooser } from '../figures/PublicationChooser';
import { usePublications } from '../figures/usePublications';
import { DownloadList, ExportProgress, firstDpi, useExportJob } from '../studio/ExportDialog';
import { getDeliveryProfile } from '../print/printApi';
import { fromMm } from '../studio/exportSize';
import { CanvasSizeFields, columnChoices, useCanvasSize } from '../studio/CanvasSizeFields';
import { matchFigures, orbitalRecipe, SHELL_MAX_N, shellOrbitals } from './shell';
import './sets.css';
import { Typeset } from '../components/Typeset';
import { statusLabel } from '../figures/model';
import { labelKey } from './shell';
import { TableHead } from '../components/TableHead';
import { QueryStatus } from '../components/QueryStatus';

const SUBSHELLS = ['s', 'p', 'd', 'f', 'hybrid', 'other'] as const;

/** s, p, d, f for single named orbitals, hybrid for sp…, other for the rest (read from the label). */
export function subshellOf(label: string | undefined): string {
  const k = labelKey(label ?? '');
  if (/^\d*sp/.test(k)) return 'hybrid';
  const m = /^\d+([spdf])/.exec(k);
  return m && !/·| \+ /.test(label ?? '') ? m[1] : 'other';
}

const MODEL_NOTE = 'One-electron hydrogen-like model; many-electron orbitals differ. Every panel is drawn with the same camera and the same length scale.';

export function FigureSetsPage() {
  const publications = usePublications();
  const list = publications.data ?? [];
  const [chosen, setChosen] = useState<string>('');
  const current = list.find((p) => p.id === chosen) ?? list[0];

  return (
    <div className="pf-page pf-page-wide" data-testid="sets-page">
      <header className="pf-page-head pf-head-row">
        <div>
          <h1>Figure sets</h1>
          <p className="pf-muted">Several figures as labelled panels of one print image, at one scale.</p>
        </div>
        {current && <PublicationChooser publications={list} value={current.id} onChange={setChosen} inline />}
      </header>
      <QueryStatus query={publications} what="publications" testId="sets" />
      {publications.isSuccess && !current && <NonIdealState icon="book" title="No publications yet" description="Ask an admin to add you to a publication." />}
      {current && <SetsOfPublication key={current.id} publicationId={current.id} />}
      <p className="pf-muted pf-small" data-testid="sets-model">
        {MODEL_NOTE}
      </p>
    </div>
  );
}

function SetsOfPublication({ publicationId }: { publicationId: string }) {
  const api = useApi();
  const sets = useQuery({
    queryKey: ['figure-sets', publicationId],
    queryFn: ({ signal }) => api.request<FigureSetDto[]>(`/api/figure-sets?publicationId=${encodeURIComponent(publicationId)}`, { signal }),
  });
  const figures = useQuery({
    queryKey: ['figures', 'set-picker', publicationId],
    queryFn: ({ signal }) => api.listFigures({ publicationId, page: 1, pageSize: 100, sort: 'title', order: 'asc' }, signal),
  });
  const queryClient = useQueryClient();
  const [selected, setSelected] = useState<string | null>(null);
  const [created, setCreated] = useState<FigureSetDto | null>(null);
  const chosenSet = (sets.data ?? []).find((s) => s.id === selected) ?? (created?.id === selected ? created : null);
  function onCreated(set: FigureSetDto) {
    // Shown at once (top of the list, selected, its export form open); the refetch then confirms it.
    queryClient.setQueryData<FigureSetDto[]>(['figure-sets', publicationId], (old) => [set, ...(old ?? []).filter((x) => x.id !== set.id)]);
    void queryClient.invalidateQueries({ queryKey: ['figure-sets', publicationId] });
    setCreated(set);
    setSelected(set.id);
  }
  useEffect(() => {
    if (created) document.querySelector(`[data-set-id="${created.id}"]`)?.scrollIntoView?.({ block: 'nearest' });
  }, [created, sets.data]);
  const byId = useMemo(() => new Map((figures.data?.items ?? []).map((f) => [f.id, f])), [figures.data]);

  return (
    <div className="pf-sets">
      <section>
        <h2>New set</h2>
        {figures.isPending && <Spinner size={24} />}
        {figures.isError && (
          <Callout intent="danger" data-testid="set-figures-error">
            The figures could not be loaded: {describeError(figures.error)}
          </Callout>
        )}
        {figures.data && <NewSetForm publicationId={publicationId} figures={figures.data.items} onCreated={onCreated} />}
      </section>
      <section>
        <h2>Sets of this publication</h2>
        {created && (
          <Callout intent="success" className="pf-gap-sm" data-testid="set-created">
            Created “{created.title}” with {created.figureIds.length} panel{created.figureIds.length === 1 ? '' : 's'}: it is selected below, ready to export.
          </Callout>
        )}
        {sets.isError && <Callout intent="danger">The sets could not be loaded: {describeError(sets.error)}</Callout>}
        {sets.data && sets.data.length === 0 && (
          <p className="pf-muted" data-testid="set-list-empty">
            No figure sets yet.
          </p>
        )}
        {sets.data && sets.data.length > 0 && (
          <HTMLTable compact interactive className="pf-table" data-testid="set-list">
            <TableHead columns={['Title', 'Panels', 'Columns', 'Created']} />
            <tbody>
              {sets.data.map((s) => (
                <tr key={s.id} data-testid="set-row" data-set-id={s.id} onClick={() => setSelected(s.id)} className={s.id === selected ? 'pf-row-selected' : undefined}>
                  <td>{s.title}</td>
                  <td>
                    {s.figureIds.map((id, i) => (
                      <span key={`${id}-${i}`}>
                        {i > 0 && ', '}
                        {byId.get(id)?.label ? <Typeset text={byId.get(id)!.label!} /> : byId.get(id)?.title || '?'}
                      </span>
                    ))}
                  </td>
                  <td>{s.columns}</td>
                  <td>{new Date(s.createdAt).toLocaleDateString('en-GB')}</td>
                </tr>
              ))}
            </tbody>
          </HTMLTable>
        )}
        {chosenSet && <SetExportForm key={chosenSet.id} set={chosenSet} />}
      </section>
    </div>
  );
}

export function NewSetForm({ publicationId, figures, onCreated }: { publicationId: string; figures: FigureSummaryDto[]; onCreated(set: FigureSetDto): void }) {
  const api = useApi();
  const queryClient = useQueryClient();
  const [title, setTitle] = useState('');
  const [caption, setCaption] = useState('');
  const [pickedFigures, setPickedFigures] = useState<FigureSummaryDto[]>([]);
  const picked = pickedFigures.map((f) => f.id);
  const [query, setQuery] = useState('');
  const [debounced, setDebounced] = useState('');
  const [status, setStatus] = useState('');
  const [subshell, setSubshell] = useState('');
  useEffect(() => {
    const t = setTimeout(() => setDebounced(query.trim()), 300);
    return () => clearTimeout(t);
  }, [query]);
  const found = useQuery({
    queryKey: ['figures', 'set-picker', publicationId, debounced, status],
    queryFn: ({ signal }) => api.listFigures({ publicationId, page: 1, pageSize: 50, sort: 'title', order: 'asc', ...(debounced ? { q: debounced } : {}), ...(status ? { status: status as FigureSummaryDto['status'] } : {}) }, signal),
    placeholderData: (prev) => prev,
  });
  const shown = (found.data?.items ?? []).filter((f) => !subshell || subshellOf(f.label) === subshell);
  const [columns, setColumns] = useState(3);
  const [shellN, setShellN] = useState(2);
  const [shellL, setShellL] = useState<string>('all');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  const wanted = useMemo(() => {
    try {
      return { ok: true as const, list: shellOrbitals(shellN, shellL === 'all' ? null : Number(shellL)) };
    } catch (e) {
      return { ok: false as const, message: (e as Error).message };
    }
  }, [shellN, shellL]);
  const matches = wanted.ok ? matchFigures(wanted.list, figures) : [];
  const missing = wanted.ok ? wanted.list.filter((_, i) => !matches[i]) : [];

  const L = FIGURE_SET_LIMITS;
  const tp = titleProblem(title);
  const titleError = tp ? `The title ${tp}.` : null;
  const captionProblem = textProblem(caption, TEXT_LIMITS.captionMax);
  const captionError = captionProblem ? `The caption ${captionProblem}.` : null;
  const countError = picked.length < L.figuresMin ? 'Pick at least one figure.' : picked.length > L.figuresMax ? `A set holds at most ${L.figuresMax} figures.` : null;

  function toggle(f: FigureSummaryDto, on: boolean) {
    setPickedFigures((p) => (on ? (p.some((x) => x.id === f.id) ? p : [...p, f]) : p.filter((x) => x.id !== f.id)));
  }
  function move(i: number, by: number) {
    setPickedFigures((p) => {
      const j = i + by;
      if (j < 0 || j >= p.length) return p;
      const next = [...p];
      [next[i], next[j]] = [next[j], next[i]];
      return next;
    });
  }

  async function applyShell() {
    if (!wanted.ok) return;
    setBusy(true);
    setError(null);
    try {
      const chosen: FigureSummaryDto[] = [];
      for (const [i, o] of wanted.list.entries()) {
        const existing = matches[i] ? figures.find((f) => f.id === matches[i]) : undefined;
        if (existing) chosen.push(existing);
        else {
          const f = await api.createFigure({ publicationId, title: o.label, recipe: orbitalRecipe(o) });
          chosen.push({ id: f.id, publicationId, title: o.label, label: o.label, status: 'draft', versionNumber: 1, ownerId: '', updatedAt: new Date().toISOString() });
        }
      }
      const ids = chosen.map((f) => f.id);
      if (missing.length) void queryClient.invalidateQueries({ queryKey: ['figures'] });
      setPickedFigures(chosen);
      setColumns(Math.min(ids.length, wanted.list.length === 3 ? 3 : 4));
      if (!title.trim()) setTitle(`Shell n = ${shellN}${shellL === 'all' ? '' : ` (${'spdf'[Number(shellL)]})`}`);
    } catch (err) {
      setError(`The missing figures could not be created: ${describeError(err)}`);
    } finally {
      setBusy(false);
    }
  }

  async function create() {
    if (titleError || countError) return;
    setBusy(true);
    setError(null);
    try {
      const body = { publicationId, title: title.trim(), figureIds: picked, columns: Math.min(columns, picked.length), ...(caption.trim() ? { caption: caption.trim() } : {}) };
      const set = await api.request<FigureSetDto>('/api/figure-sets', { method: 'POST', body });
      onCreated(set);
      setPickedFigures([]);
      setTitle('');
      setCaption('');
    } catch (err) {
      setError(describeError(err));
    } finally {
      setBusy(false);
    }
  }

  const lChoices = [{ value: 'all', label: 'every subshell' }, ...[...Array(Math.min(shellN, 4)).keys()].map((l) => ({ value: String(l), label: `${shellN}${'spdf'[l]} only` }))];
  return (
    <div className="pf-set-form" data-testid="new-set-form">
      <div className="pf-form-row">
        <FormGroup label="Every orbital of shell n" labelFor="set-shell-n">
          <HTMLSelect
            id="set-shell-n"
            value={String(shellN)}
            onChange={(e) => {
              setShellN(Number(e.currentTarget.value));
              setShellL('all');
            }}
            options={[...Array(SHELL_MAX_N).keys()].map((i) => ({ value: String(i + 1), label: `n = ${i + 1}` }))}
            data-testid="set-shell-n"
          />
        </FormGroup>
        <FormGroup label="Subshell" labelFor="set-shell-l">
          <HTMLSelect id="set-shell-l" value={shellL} onChange={(e) => setShellL(e.currentTarget.value)} options={lChoices} data-testid="set-shell-l" />
        </FormGroup>
        <FormGroup label=" ">
          <Button icon="grid-view" text="Pick these" onClick={() => void applyShell()} loading={busy} disabled={!wanted.ok || wanted.list.length > L.figuresMax} data-testid="set-shell-apply" />
        </FormGroup>
      </div>
      {wanted.ok && (
        <p className="pf-muted pf-small" data-testid="set-shell-summary">
          {wanted.list.map((o) => o.label).join(', ')}
          {wanted.list.length > L.figuresMax
            ? ` — ${wanted.list.length} orbitals, more than a set holds (${L.figuresMax}): choose one subshell.`
            : missing.length
              ? ` — not yet in this publication, created on "Pick these": ${missing.map((o) => o.label).join(', ')} (Z = 1, grid 64, 90% enclosed).`
              : ' — all in this publication already.'}
        </p>
      )}

      <h3>Panels, in order</h3>
      {pickedFigures.length === 0 ? (
        <p className="pf-muted" data-testid="set-picked-empty">
          No figure picked yet: find figures below, or use the shell preset.
        </p>
      ) : (
        <ol className="pf-set-picked" data-testid="set-picked">
          {pickedFigures.map((f, i) => (
            <li key={f.id} data-testid="set-picked-item" data-figure-id={f.id}>
              <strong>{String.fromCharCode(97 + i)}</strong> {f.title}
              {f.label && (
                <>
                  {' '}
                  (<Typeset text={f.label} />)
                </>
              )}
              <Button small minimal icon="arrow-up" aria-label={`Move ${f.title} up`} disabled={i === 0} onClick={() => move(i, -1)} />
              <Button small minimal icon="arrow-down" aria-label={`Move ${f.title} down`} disabled={i === pickedFigures.length - 1} onClick={() => move(i, 1)} />
              <Button small minimal icon="cross" aria-label={`Remove ${f.title}`} onClick={() => toggle(f, false)} data-testid="set-picked-remove" />
            </li>
          ))}
        </ol>
      )}

      <h3>Find figures</h3>
      <div className="pf-form-row">
        <InputGroup leftIcon="search" placeholder="Search titles and labels" value={query} onValueChange={setQuery} data-testid="set-figure-search" aria-label="Search figures" />
        <HTMLSelect
          value={status}
          onChange={(e) => setStatus(e.currentTarget.value)}
          options={[{ value: '', label: 'Any status' }, ...FIGURE_STATUSES.map((st) => ({ value: st, label: statusLabel(st) }))]}
          data-testid="set-figure-status"
          aria-label="Filter by status"
        />
        <HTMLSelect
          value={subshell}
          onChange={(e) => setSubshell(e.currentTarget.value)}
          options={[{ value: '', label: 'Any orbital' }, ...SUBSHELLS.map((x) => ({ value: x, label: x === 'other' ? 'superpositions and others' : x === 'hybrid' ? 'hybrids' : `${x} orbitals` }))]}
          data-testid="set-figure-subshell"
          aria-label="Filter by kind of orbital"
        />
        {found.isFetching && <Spinner size={16} aria-label="Searching" />}
      </div>
      {found.isError && (
        <Callout intent="danger" data-testid="set-figures-error">
          The figures could not be searched: {describeError(found.error)}
        </Callout>
      )}
      <HTMLTable compact className="pf-table" data-testid="set-figures">
        <TableHead columns={['', 'Title', 'Orbital', 'Status', 'Panel']} />
        <tbody>
          {shown.map((f) => {
            const at = picked.indexOf(f.id);
            return (
              <tr key={f.id} data-testid="set-figure-row">
                <td>
                  <Checkbox checked={at >= 0} onChange={(e) => toggle(f, e.currentTarget.checked)} aria-label={`Use ${f.title}`} data-testid="set-figure-check" data-figure-id={f.id} className="pf-no-margin" />
                </td>
                <td>{f.title}</td>
                <td>{f.label ? <Typeset text={f.label} /> : ''}</td>
                <td>{statusLabel(f.status)}</td>
                <td data-testid="set-figure-order">{at >= 0 ? String.fromCharCode(97 + at) : ''}</td>
              </tr>
            );
          })}
          {found.data && shown.length === 0 && (
            <tr>
              <td colSpan={5} className="pf-muted" data-testid="set-figures-none">
                {figures.length === 0 ? 'This publication has no figures yet: use the shell preset above, or create figures in the Library.' : 'No figure matches the search and filters.'}
              </td>
            </tr>
          )}
        </tbody>
      </HTMLTable>
      {found.data && found.data.total > found.data.items.length && (
        <p className="pf-muted pf-small" data-testid="set-figures-more">
          Showing {found.data.items.length} of {found.data.total} matching figures: narrow the search to see the rest.
        </p>
      )}

      <div className="pf-form-row">
        <FormGroup
          label="Title"
          labelFor="set-title"
          intent={titleError && title ? 'danger' : 'none'}
          helperText={<span data-testid={titleError ? 'set-title-error' : undefined}>{titleError ?? `Up to ${TEXT_LIMITS.titleMax} characters.`}</span>}
        >
          <InputGroup id="set-title" value={title} onValueChange={setTitle} data-testid="set-title" />
        </FormGroup>
        <FormGroup label="Columns" labelFor="set-columns">
          <HTMLSelect id="set-columns" value={String(columns)} onChange={(e) => setColumns(Number(e.currentTarget.value))} options={[...Array(L.columnsMax).keys()].map((i) => ({ value: String(i + 1), label: String(i + 1) }))} data-testid="set-columns" />
        </FormGroup>
      </div>
      <FormGroup
        label="Caption (printed under the panels, which are lettered a, b, c …)"
        labelFor="set-caption"
        intent={captionError ? 'danger' : 'none'}
        helperText={<span data-testid={captionError ? 'set-caption-error' : undefined}>{captionError ?? `Up to ${TEXT_LIMITS.captionMax} characters.`}</span>}
      >
        <TextArea id="set-caption" fill value={caption} onChange={(e) => setCaption(e.currentTarget.value)} data-testid="set-caption" />
      </FormGroup>
      {countError && (
        <Callout intent="warning" data-testid="set-count-error">
          {countError}
        </Callout>
      )}
      {error && (
        <Callout intent="danger" data-testid="set-error" title="Not done">
          {error}
        </Callout>
      )}
      <Button intent="primary" icon="add" text="Create the set" onClick={() => void create()} disabled={Boolean(titleError || countError || captionError) || busy} loading={busy} data-testid="set-create" />
    </div>
  );
}

/** The set's export, once the publication's delivery profile is read (its column widths and minimum dpi come first). */
export function SetExportForm({ set }: { set: FigureSetDto }) {
  const api = useApi();
  const q = useQuery({ queryKey: ['delivery-profile', set.publicationId], queryFn: () => getDeliveryProfile(api, set.publicationId), retry: false });
  if (q.isPending) return <Spinner size={24} />;
  return <ProfiledSetExportForm set={set} profile={q.data ?? DEFAULT_DELIVERY_PROFILE} />;
}

/** Canvas size (mm or inches, the profile's column presets, dpi) and the PNG export of a set, with progress and download. */
function ProfiledSetExportForm({ set, profile }: { set: FigureSetDto; profile: DeliveryProfile }) {
  const columns = useMemo(() => columnChoices(profile), [profile]);
  const widest = columns.reduce((a, b) => (b.widthMm > a.widthMm ? b : a));
  const size = useCanvasSize({ widthMm: widest.widthMm, heightMm: 60, dpi: firstDpi(300, profile.minDpi), transparent: false });
  const { unit, setW, dpi, transparent, widthMm, heightMm, px } = size;
  const { jobId, result, setResult, error, sending, start, running } = useExportJob(`/api/figure-sets/${encodeURIComponent(set.id)}/exports`);


  async function submit() {
    if (widthMm === null || heightMm === null) return;
    await start({ format: 'png', widthMm: Number(widthMm.toFixed(3)), heightMm: Number(heightMm.toFixed(3)), dpi, ...(transparent ? { transparent: true } : {}) });
  }

  const png = result?.assets.filter((a) => a.kind === 'png') ?? [];
  return (
    <div className="pf-export pf-gap-sm" data-testid="set-export-form">
      <h3>Export “{set.title}”</h3>
      <CanvasSizeFields size={size} idPrefix="set" presets={columns} minDpi={profile.minDpi} onPreset={(c) => setW(fromMm(c.widthMm, unit))} />
      <p className="pf-pixels" data-testid="set-pixels">
        {px ? `${px.text}, ${set.figureIds.length} panels in ${Math.min(set.columns, set.figureIds.length)} columns` : 'Enter a valid width and height to see the pixel size.'}
      </p>
      {error && (
        <Callout intent="danger" data-testid="set-export-error" title="The export was not started">
          {error}
        </Callout>
      )}
      {jobId && <ExportProgress key={jobId} jobId={jobId} onDone={setResult} />}
      {result?.state === 'completed' &&
        (png.length > 0 ? (
          <DownloadList assets={png} testid="export-ready" />
        ) : (
          <Callout intent="warning" data-testid="export-no-asset">
            The export finished but reported no file.
          </Callout>
        ))}
      <Button intent="primary" icon="export" text={running ? 'Exporting…' : 'Export PNG'} onClick={() => void submit()} loading={sending} disabled={running || !px} data-testid="set-export" className="pf-gap-sm" />
    </div>
  );
}
