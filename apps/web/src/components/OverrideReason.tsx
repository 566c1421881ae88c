import { useState, type FormEvent, type ReactNode } from 'react';
import { Button, Callout, FormGroup, TextArea } from '@blueprintjs/core';
import { DELIVERY_LIMITS } from '@psiform/contracts';

/**
 * The client side of the one "go ahead with a written reason" gate (apps/api/src/gates/gate.ts): what failed (when
 * `failures` is given), and a reason of at least DELIVERY_LIMITS.reasonMin characters that the server audits. Used by
 * the preflight approval and the colour checks of a house style or batch re-render. Test ids `<prefix>-form`,
 * `<prefix>-failures`, `<prefix>-reason`, `<prefix>-short`, `<prefix>-submit`.
 */
export function OverrideReason({
  failures,
  label,
  submitText,
  pending,
  onSubmit,
  testIdPrefix,
  children,
}: {
  failures?: string[];
  label: string;
  submitText: string;
  pending: boolean;
  onSubmit(reason: string): void;
  testIdPrefix: string;
  /** Shown under the button (the outcome of the request). */
  children?: ReactNode;
}) {
  const [reason, setReason] = useState('');
  const tooShort = reason.trim().length < DELIVERY_LIMITS.reasonMin;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!tooShort) onSubmit(reason.trim());
  };
  return (
    <form onSubmit={submit} data-testid={`${testIdPrefix}-form`}>
      {failures && (
        <Callout intent="danger" compact data-testid={`${testIdPrefix}-failures`}>
          <ul className="pf-plain-bullets">
            {failures.map((f) => (
              <li key={f}>{f.charAt(0).toUpperCase() + f.slice(1)}.</li>
            ))}
          </ul>
        </Callout>
      )}
      <FormGroup label={label} labelFor={`${testIdPrefix}-reason`} className="pf-gap">
        <TextArea id={`${testIdPrefix}-reason`} fill rows={3} value={reason} onChange={(e) => setReason(e.currentTarget.value)} data-testid={`${testIdPrefix}-reason`} />
      </FormGroup>
      {reason.length > 0 && tooShort && (
        <div className="pf-field-error" role="alert" data-testid={`${testIdPrefix}-short`}>
          At least {DELIVERY_LIMITS.reasonMin} characters: say why the failures are acceptable.
        </div>
      )}
      <Button type="submit" intent="warning" icon="warning-sign" text={submitText} disabled={tooShort} loading={pending} data-testid={`${testIdPrefix}-submit`} />
      {children}
    </form>
  );
}
