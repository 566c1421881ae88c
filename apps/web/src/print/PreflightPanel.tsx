import { Callout, HTMLTable, Tag } from '@blueprintjs/core';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { PREFLIGHT_RULES, type FigureDto, type PreflightFileReport } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { approveWithOverride, getFigurePreflight } from './printApi';
import { TableHead } from '../components/TableHead';
import { OverrideReason } from '../components/OverrideReason';

const RULE_NAME = Object.fromEntries(PREFLIGHT_RULES.map((r) => [r.id, r.name]));

/** One file's preflight: every rule with pass or fail, what the profile asks and what the file has. */
export function PreflightFileTable({ file: f, testid = 'preflight-table' }: { file: PreflightFileReport; testid?: string }) {
  return (
    <div>
      <h3>
        {f.file} <Tag intent={f.passed ? 'success' : 'danger'} data-testid="preflight-file-verdict">{f.passed ? 'passes' : 'fails'}</Tag>
      </h3>
      <HTMLTable compact className="pf-table" data-testid={testid}>
        <TableHead columns={['Check', 'Result', 'Asked', 'The file has']} />
        <tbody>
          {f.results.map((x) => (
            <tr key={x.rule} data-testid="preflight-row" data-rule={x.rule} data-status={x.status}>
              <td>{RULE_NAME[x.rule] ?? x.rule}</td>
              <td>
                <Tag minimal intent={x.status === 'pass' ? 'success' : 'danger'}>{x.status}</Tag>
              </td>
              <td>{x.expected}</td>
              <td>{x.actual}</td>
            </tr>
          ))}
        </tbody>
      </HTMLTable>
    </div>
  );
}

/**
 * The current version's preflight reports (every rule, pass or fail, per delivered file) and, when they fail, the
 * editor's "approve with a written reason" (the server audits it).
 */
export function PreflightPanel({ figure }: { figure: Pick<FigureDto, 'id' | 'status'> }) {
  const api = useApi();
  const { user } = useAuth();
  const qc = useQueryClient();
  const q = useQuery({ queryKey: ['figure-preflight', figure.id], queryFn: () => getFigurePreflight(api, figure.id) });
  const approve = useMutation({
    mutationFn: (reason: string) => approveWithOverride(api, figure.id, reason),
    onSuccess: () => {
      for (const key of [['figure', figure.id], ['figure-audit', figure.id], ['review-desk'], ['figures'], ['figure-preflight', figure.id]]) void qc.invalidateQueries({ queryKey: key });
    },
  });
  if (q.isPending) return <p className="pf-muted" data-testid="preflight-loading">Checking preflight…</p>;
  if (q.isError) return <Callout intent="danger" data-testid="preflight-error">{describeError(q.error)}</Callout>;
  const pf = q.data;
  return (
    <section className="pf-section" data-testid="preflight-panel" data-blocks={pf.blocksApproval ? 'true' : 'false'}>
      <h2>Preflight of version {pf.versionNumber}</h2>
      {pf.reports.length === 0 ? (
        <p className="pf-muted" data-testid="preflight-none">
          No export of this version has been preflighted yet. Every TIFF, PDF, SVG and bundle export is checked against the publication&apos;s delivery profile.
        </p>
      ) : (
        pf.reports.map((r) => (
          <div key={r.assetId} data-testid="preflight-report" data-kind={r.kind}>
            {r.report.files.map((f) => (
              <PreflightFileTable key={f.file} file={f} />
            ))}
          </div>
        ))
      )}
      {pf.blocksApproval && (
        <Callout intent="warning" title="Preflight failures block approval" data-testid="preflight-blocks">
          <ul>
            {pf.failures.map((f) => (
              <li key={f}>{f}</li>
            ))}
          </ul>
          {user?.role === 'editor' && figure.status === 'in_review' && (
            <OverrideReason
              label="Approve anyway: say why these failures are acceptable (recorded in the audit trail)"
              submitText="Approve with this reason"
              pending={approve.isPending}
              onSubmit={(reason) => approve.mutate(reason)}
              testIdPrefix="preflight-override"
            >
              {approve.isError && <Callout intent="danger" data-testid="preflight-override-error">{describeError(approve.error)}</Callout>}
              {approve.isSuccess && <span data-testid="preflight-override-done">Approved; the reason is in the audit trail.</span>}
            </OverrideReason>
          )}
        </Callout>
      )}
    </section>
  );
}
