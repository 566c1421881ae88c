import { useRef, useState } from 'react';
import { Button, Callout, HTMLSelect, HTMLTable, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, useNavigate } from 'react-router-dom';
import type { SwatchbookColorsDto, SwatchbookDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { formatDate } from '../figures/model';
import { files } from './fileIo';
import { SwatchbookEditor } from './SwatchbookEditor';
import { importSwatchbook, listSwatchbooks } from './swatchbookApi';
import { usePublications } from '../figures/usePublications';

export function Chips({ colors }: { colors: SwatchbookColorsDto }) {
  const list = [colors.positive, colors.negative, colors.background, colors.label, colors.nucleus, colors.axes].filter(Boolean) as string[];
  return (
    <span className="pf-chips" aria-hidden="true">
      {list.map((c, i) => (
        <i key={`${c}-${i}`} style={{ background: c }} />
      ))}
    </span>
  );
}

/** The caller's swatchbooks; with publicationId only those usable in that publication (its own and its publisher's). */
export function useSwatchbooks(publicationId?: string) {
  const api = useApi();
  return useQuery({ queryKey: ['swatchbooks', publicationId ?? 'all'], queryFn: ({ signal }) => listSwatchbooks(api, signal, publicationId) });
}

/** Reads a chosen JSON file and hands it to POST /api/swatchbooks/import; the server validates it. */
function ImportButton({ publicationId }: { publicationId: string | undefined }) {
  const api = useApi();
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const input = useRef<HTMLInputElement>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const imp = useMutation({
    mutationFn: (doc: unknown) => importSwatchbook(api, doc, publicationId!),
    onSuccess: (sb: SwatchbookDto) => {
      void queryClient.invalidateQueries({ queryKey: ['swatchbooks'] });
      navigate(`/swatchbooks/${encodeURIComponent(sb.id)}`);
    },
  });
  async function onFile(file: File | undefined) {
    setReadError(null);
    imp.reset();
    if (!file) return;
    let doc: unknown;
    try {
      doc = JSON.parse(await files.read(file));
    } catch {
      setReadError(`${file.name} is not a JSON file (a swatchbook export is JSON).`);
      return;
    }
    imp.mutate(doc);
  }
  return (
    <>
      <input
        ref={input}
        type="file"
        accept="application/json,.json"
        hidden
        onChange={(e) => {
          void onFile(e.target.files?.[0]);
          e.target.value = '';
        }}
        data-testid="sw-import-file"
      />
      <Button icon="import" text="Import JSON" onClick={() => input.current?.click()} loading={imp.isPending} disabled={!publicationId} data-testid="sw-import" />
      {(readError || imp.isError) && (
        <Callout intent="danger" className="pf-gap" data-testid="sw-import-error">
          Not imported: {readError ?? describeError(imp.error)}
        </Callout>
      )}
    </>
  );
}

export function SwatchbooksPage() {
  const { user } = useAuth();
  const books = useSwatchbooks();
  const [creating, setCreating] = useState(false);
  const canEdit = user?.role === 'art_director';
  // A swatchbook belongs to one publication: new and imported ones go to the one chosen here.
  const publications = usePublications();
  const [chosen, setChosen] = useState<string | undefined>();
  const owner = chosen ?? publications.data?.[0]?.id;
  const titleOf = (id: string | null) => publications.data?.find((p) => p.id === id)?.title;

  return (
    <div className="pf-page pf-page-wide" data-testid="swatchbooks-page">
      <header className="pf-page-head pf-head-row">
        <div>
          <h1>Swatchbooks</h1>
          <p className="pf-muted">Palettes for figures: phase colours, background, label, nucleus and axes. A house style pins one per publication.</p>
        </div>
        {canEdit && (
          <div className="pf-head-actions">
            {(publications.data?.length ?? 0) > 1 && (
              <HTMLSelect aria-label="Publication for new swatchbooks" value={owner} onChange={(e) => setChosen(e.currentTarget.value)} data-testid="sw-publication">
                {publications.data!.map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.title}
                  </option>
                ))}
              </HTMLSelect>
            )}
            <ImportButton publicationId={owner} />
            <Button intent="primary" icon="plus" text="New swatchbook" onClick={() => setCreating(true)} disabled={creating} data-testid="sw-new" />
          </div>
        )}
      </header>

      {creating && (
        <section className="pf-section" data-testid="sw-create">
          <div className="pf-head-row">
            <h2>New swatchbook</h2>
            <Button variant="minimal" text="Cancel" onClick={() => setCreating(false)} />
          </div>
          <SwatchbookEditor canEdit={canEdit} publicationId={owner} />
        </section>
      )}

      {books.isPending && (
        <div data-testid="swatchbooks-loading">
          <NonIdealState icon={<Spinner size={32} />} title="Loading swatchbooks…" />
        </div>
      )}
      {books.isError && (
        <Callout intent="danger" title="Swatchbooks could not be loaded" data-testid="swatchbooks-error">
          <p>{describeError(books.error)}</p>
          <Button text="Try again" icon="refresh" onClick={() => void books.refetch()} />
        </Callout>
      )}
      {books.isSuccess && books.data.length === 0 && !creating && (
        <div data-testid="swatchbooks-empty">
          <NonIdealState icon="tint" title="No swatchbooks yet" description={canEdit ? 'Create one, or import an exported swatchbook file.' : 'An art director creates them.'} />
        </div>
      )}
      {books.isSuccess && books.data.length > 0 && (
        <HTMLTable className="pf-table" striped data-testid="swatchbooks-table">
          <thead>
            <tr>
              <th>Name</th>
              <th>Belongs to</th>
              <th>Colours</th>
              <th>Version</th>
              <th>State</th>
              <th>Updated</th>
            </tr>
          </thead>
          <tbody>
            {books.data.map((b) => (
              <tr key={b.id} data-testid="swatchbook-row">
                <td>
                  <Link to={`/swatchbooks/${encodeURIComponent(b.id)}`} data-testid="swatchbook-name">
                    {b.name}
                  </Link>
                </td>
                <td data-testid="swatchbook-scope">{b.publisher ? `all of ${b.publisher}` : (titleOf(b.publicationId) ?? 'a publication')}</td>
                <td>
                  <Chips colors={b.colors} />
                </td>
                <td>v{b.version}</td>
                <td>{b.locked ? <Tag minimal icon="lock">Locked</Tag> : <span className="pf-muted">editable</span>}</td>
                <td className="pf-muted">{formatDate(b.updatedAt)}</td>
              </tr>
            ))}
          </tbody>
        </HTMLTable>
      )}
    </div>
  );
}
