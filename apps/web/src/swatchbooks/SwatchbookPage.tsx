import { Button, Callout, HTMLTable, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import type { SwatchbookDto } from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { formatDate } from '../figures/model';
import { exportFileName, files } from './fileIo';
import { SwatchbookEditor } from './SwatchbookEditor';
import { Chips } from './SwatchbooksPage';
import { exportSwatchbook, getSwatchbook, setSwatchbookLocked, swatchbookVersions } from './swatchbookApi';
import { TableHead } from '../components/TableHead';

const ACTION_WORDS: Record<string, string> = { create: 'created', update: 'edited', lock: 'locked', unlock: 'unlocked', import: 'imported' };

function Versions({ book }: { book: SwatchbookDto }) {
  const api = useApi();
  const versions = useQuery({ queryKey: ['swatchbook-versions', book.id, book.version, book.locked], queryFn: ({ signal }) => swatchbookVersions(api, book.id, signal) });
  if (versions.isPending) return <Spinner size={20} />;
  if (versions.isError)
    return (
      <Callout intent="danger" data-testid="sw-versions-error">
        The history could not be loaded: {describeError(versions.error)}
      </Callout>
    );
  return (
    <HTMLTable compact className="pf-table" data-testid="sw-versions">
      <TableHead columns={['Version', 'What', 'Colours', 'When']} />
      <tbody>
        {[...versions.data].reverse().map((v, i) => (
          <tr key={`${v.version}-${i}`} data-testid="sw-version-row">
            <td>v{v.version}</td>
            <td>
              {ACTION_WORDS[v.action] ?? v.action}
              {v.name !== book.name && <span className="pf-muted"> (as “{v.name}”)</span>}
            </td>
            <td>
              <Chips colors={v.colors} />
            </td>
            <td className="pf-muted">{formatDate(v.createdAt)}</td>
          </tr>
        ))}
      </tbody>
    </HTMLTable>
  );
}

export function SwatchbookPage() {
  const { swatchbookId = '' } = useParams<{ swatchbookId: string }>();
  const api = useApi();
  const { user } = useAuth();
  const queryClient = useQueryClient();
  const book = useQuery({ queryKey: ['swatchbook', swatchbookId], queryFn: ({ signal }) => getSwatchbook(api, swatchbookId, signal) });
  const canEdit = user?.role === 'art_director';

  const lock = useMutation({
    mutationFn: (locked: boolean) => setSwatchbookLocked(api, swatchbookId, locked),
    onSuccess: (sb) => {
      queryClient.setQueryData(['swatchbook', sb.id], sb);
      void queryClient.invalidateQueries({ queryKey: ['swatchbooks'] });
    },
  });
  const exp = useMutation({
    mutationFn: () => exportSwatchbook(api, swatchbookId),
    onSuccess: (file) => files.download(exportFileName(file.name), `${JSON.stringify(file, null, 2)}\n`),
  });

  if (book.isPending)
    return (
      <div className="pf-page" data-testid="swatchbook-loading">
        <NonIdealState icon={<Spinner size={32} />} title="Loading the swatchbook…" />
      </div>
    );
  if (book.isError) {
    const notFound = book.error instanceof ApiError && book.error.status === 404;
    return (
      <div className="pf-page">
        <Callout intent={notFound ? 'warning' : 'danger'} title={notFound ? 'Swatchbook not found' : 'The swatchbook could not be loaded'} data-testid="swatchbook-error">
          <p>{notFound ? 'There is no such swatchbook.' : describeError(book.error)}</p>
          <Link to="/swatchbooks">All swatchbooks</Link>
        </Callout>
      </div>
    );
  }
  const b = book.data;

  return (
    <div className="pf-page pf-page-wide" data-testid="swatchbook-page">
      <header className="pf-page-head pf-head-row">
        <div>
          <p className="pf-crumbs">
            <Link to="/swatchbooks">Swatchbooks</Link>
          </p>
          <h1 data-testid="swatchbook-title">{b.name}</h1>
          <div className="pf-meta">
            <span data-testid="swatchbook-version">Version {b.version}</span>
            {b.locked ? (
              <Tag minimal icon="lock" intent="warning" data-testid="swatchbook-locked">
                Locked: unlock to edit
              </Tag>
            ) : (
              <Tag minimal data-testid="swatchbook-unlocked">
                Editable
              </Tag>
            )}
            <span className="pf-muted">updated {formatDate(b.updatedAt)}</span>
          </div>
        </div>
        <div className="pf-head-actions">
          <Button icon="export" text="Export JSON" onClick={() => exp.mutate()} loading={exp.isPending} data-testid="sw-export" />
          {canEdit && (
            <Button
              icon={b.locked ? 'unlock' : 'lock'}
              text={b.locked ? 'Unlock' : 'Lock'}
              onClick={() => lock.mutate(!b.locked)}
              loading={lock.isPending}
              data-testid={b.locked ? 'sw-unlock' : 'sw-lock'}
            />
          )}
        </div>
      </header>
      {(lock.isError || exp.isError) && (
        <Callout intent="danger" className="pf-gap" data-testid="swatchbook-action-error">
          {describeError(lock.error ?? exp.error)}
        </Callout>
      )}
      {!canEdit && <p className="pf-muted pf-small">Only art directors edit swatchbooks; you can read it and its checks.</p>}

      <SwatchbookEditor key={`${b.id}-${b.locked}`} existing={b} canEdit={canEdit} />

      <section className="pf-section">
        <h2>Version history</h2>
        <Versions book={b} />
      </section>
    </div>
  );
}
