import type { ReactNode } from 'react';
import { Callout, FormGroup, InputGroup } from '@blueprintjs/core';

/**
 * One labelled e-mail or password field of the account forms (sign in, set password, forgot password): the label is
 * tied to the input, and the browser's password manager gets the autocomplete hint it needs.
 */
export function AccountField(props: {
  id: string;
  label: string;
  type: 'email' | 'password';
  autoComplete: 'username' | 'current-password' | 'new-password';
  value: string;
  onChange: (value: string) => void;
  testId: string;
  name?: string;
  autoFocus?: boolean;
  disabled?: boolean;
}) {
  return (
    <FormGroup label={props.label} labelFor={props.id}>
      <InputGroup
        id={props.id}
        name={props.name}
        type={props.type}
        autoComplete={props.autoComplete}
        autoFocus={props.autoFocus}
        value={props.value}
        onValueChange={props.onChange}
        disabled={props.disabled}
        data-testid={props.testId}
      />
    </FormGroup>
  );
}

/** The account forms' one error line (announced to screen readers: role alert). */
export function AccountFormProblem({ testId, className, children }: { testId: string; className?: string; children: ReactNode }) {
  return (
    <Callout intent="danger" compact className={className} role="alert" data-testid={testId}>
      {children}
    </Callout>
  );
}
