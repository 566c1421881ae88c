import { useQuery } from '@tanstack/react-query';
import { useApi } from '../auth/AuthProvider';
import { AuditTimeline } from '../components/AuditTimeline';
import { subjectAudit } from './adminApi';

/** History of a user, publication or house style (newest first): who did what, when, in words. */
export function SubjectAudit({ kind, id }: { kind: 'user' | 'publication' | 'house_style'; id: string }) {
  const api = useApi();
  const audit = useQuery({ queryKey: ['subject-audit', kind, id], queryFn: ({ signal }) => subjectAudit(api, kind, id, signal) });
  return <AuditTimeline query={audit} entries={(page) => page.items} testId="subject-audit" />;
}
