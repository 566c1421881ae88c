import type { ReactNode } from 'react';
import { Callout } from '@blueprintjs/core';

// An admin form's messages, sorted by field with messagesByField (adminApi): under a field the messages about it,
// above the submit button those about no one field (key ''). One look for the invitation and the publication forms.

/** The messages about one field, for its FormGroup's helperText; undefined when there are none. */
export function fieldMessages(messages: string[] | undefined, testId: string): ReactNode {
  return messages?.length ? (
    <span className="pf-field-error" data-testid={testId}>
      {messages.join(' ')}
    </span>
  ) : undefined;
}

/** The messages about no one field (the server's other reasons), or nothing. */
export function FormMessages({ messages, testId }: { messages: string[] | undefined; testId: string }) {
  return messages?.length ? (
    <Callout intent="danger" compact data-testid={testId}>
      {messages.join(' ')}
    </Callout>
  ) : null;
}
