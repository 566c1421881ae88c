import { Callout } from '@blueprintjs/core';
import { describeError } from '../api/client';

/**
 * The error line of a call that failed (a mutation or a query): `lead` says what did not happen, then the reason in
 * words (`describe`, describeError unless the feature words its errors itself). Nothing while the call has not failed.
 */
export function CallFailed({ call, testId, lead, describe = describeError, className }: {
  call: { isError: boolean; error: unknown };
  testId: string;
  lead?: string;
  describe?: (err: unknown) => string;
  className?: string;
}) {
  if (!call.isError) return null;
  return (
    <Callout intent="danger" data-testid={testId} className={className}>
      {lead ? `${lead}: ` : null}
      {describe(call.error)}
    </Callout>
  );
}
