import { useState } from 'react';
import { Button, Callout, Dialog, DialogBody, DialogFooter, FormGroup, TextArea, type Intent } from '@blueprintjs/core';
import type { IconName } from '@blueprintjs/icons';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { TEXT_LIMITS, textProblem, type FigureDto, type ReviewTransitionDto } from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { availableDecisions, DECISION_LABELS, roundFromAudit } from './decisions';
import { auditTrail, decide, houseStyle, type Decision } from './reviewApi';
import { CallFailed } from '../components/CallFailed';

const LOOK: Record<Decision, { icon: IconName; intent: Intent }> = {
  submit: { icon: 'send-message', intent: 'primary' },
  request_changes: { icon: 'annotation', intent: 'warning' },
  approve: { icon: 'tick', intent: 'success' },
  colour_signoff: { icon: 'tint', intent: 'success' },
  release: { icon: 'export', intent: 'primary' },
};

/** The server's refusal in words a reviewer can act on (403: role or ownership; 409: state). */
export function decisionErrorText(err: unknown): string {
  const said = describeError(err);
  const full = /[.!?]$/.test(said) ? said : `${said}.`;
  if (err instanceof ApiError && err.status === 409) return `Not possible in the figure's current state: ${full}`;
  if (err instanceof ApiError && err.status === 403) return `Not allowed for your role: ${full}`;
  if (err instanceof ApiError && err.status === 404) return 'The figure is not in any publication you belong to.';
  return full;
}

export function useFigureAudit(figureId: string) {
  const api = useApi();
  return useQuery({ queryKey: ['figure-audit', figureId], queryFn: ({ signal }) => auditTrail(api, figureId, signal) });
}

export function useHouseStyle(publicationId: string) {
  const api = useApi();
  return useQuery({ queryKey: ['house-style', publicationId], queryFn: ({ signal }) => houseStyle(api, publicationId, signal) });
}

/** The review decisions the signed-in role may take on this figure now; refetches the figure after each. */
export function DecisionBar({ figure }: { figure: FigureDto }) {
  const api = useApi();
  const { user } = useAuth();
  const queryClient = useQueryClient();
  const audit = useFigureAudit(figure.id);
  const house = useHouseStyle(figure.publicationId);
  const [asking, setAsking] = useState(false);
  const [note, setNote] = useState('');
  const [noteTouched, setNoteTouched] = useState(false);
  const [done, setDone] = useState<ReviewTransitionDto | null>(null);

  const mutation = useMutation({
    mutationFn: ({ decision, note: n }: { decision: Decision; note?: string }) => decide(api, figure.id, decision, n),
    onSuccess: (res) => {
      setDone(res);
      setAsking(false);
      setNote('');
      setNoteTouched(false);
    },
    onSettled: () => {
      // A refusal may mean someone else moved the figure on: refetch either way.
      void queryClient.invalidateQueries({ queryKey: ['figure', figure.id] });
      void queryClient.invalidateQueries({ queryKey: ['figure-audit', figure.id] });
      void queryClient.invalidateQueries({ queryKey: ['review-desk'] });
      void queryClient.invalidateQueries({ queryKey: ['figures'] });
    },
  });

  if (!user) return null;
  const decisions = availableDecisions({
    role: user.role,
    status: figure.status,
    isOwner: figure.ownerId === user.id,
    requireColourSignOff: house.data?.requireColourSignOff ?? false,
    round: roundFromAudit(audit.data ?? []),
  });
  const noteMissing = note.trim() === '';
  // The API's limit in its own words (libs/contracts), shown rather than cutting the note off.
  const noteTooLong = textProblem(note.trim(), TEXT_LIMITS.noteMax);

  function run(decision: Decision) {
    setDone(null);
    if (decision === 'request_changes') {
      mutation.reset();
      setAsking(true);
      return;
    }
    mutation.mutate({ decision });
  }

  return (
    <div className="pf-decisions" data-testid="decision-bar">
      {decisions.length === 0 ? (
        <p className="pf-muted pf-small" data-testid="no-decisions">
          No review step for you on this figure in its current state.
        </p>
      ) : (
        <div className="pf-decision-buttons">
          {decisions.map((d) => (
            <Button
              key={d}
              icon={LOOK[d].icon}
              intent={LOOK[d].intent}
              text={DECISION_LABELS[d]}
              onClick={() => run(d)}
              loading={mutation.isPending && mutation.variables?.decision === d}
              disabled={mutation.isPending || audit.isPending || house.isPending}
              data-testid={`decide-${d}`}
            />
          ))}
        </div>
      )}
      {house.data?.requireColourSignOff && figure.status === 'in_review' && (
        <p className="pf-muted pf-small" data-testid="signoff-required">
          This publication's house style requires an art director's colour sign-off as well as an editor's approval.
        </p>
      )}
      {done && (
        <Callout intent="success" className="pf-gap" data-testid="decision-done">
          {done.message.charAt(0).toUpperCase() + done.message.slice(1)}.
        </Callout>
      )}
      {mutation.isError && !asking && (
        <Callout intent="danger" className="pf-gap" data-testid="decision-error">
          {decisionErrorText(mutation.error)}
        </Callout>
      )}

      <Dialog isOpen={asking} onClose={() => setAsking(false)} title="Request changes" icon="annotation">
        <form
          onSubmit={(e) => {
            e.preventDefault();
            setNoteTouched(true);
            if (!noteMissing && !noteTooLong) mutation.mutate({ decision: 'request_changes', note: note.trim() });
          }}
          data-testid="request-changes-form"
        >
          <DialogBody>
            <FormGroup
              label="What should change?"
              labelFor="rc-note"
              helperText={
                noteTooLong
                  ? `The note ${noteTooLong}.`
                  : noteTouched && noteMissing
                    ? 'A note is required: say what the illustrator should change.'
                    : 'The illustrator receives this note by mail and sees it in the audit trail.'
              }
              intent={noteTooLong || (noteTouched && noteMissing) ? 'danger' : 'none'}
            >
              <TextArea
                id="rc-note"
                fill
                rows={4}
                value={note}
                onChange={(e) => setNote(e.target.value)}
                onBlur={() => setNoteTouched(true)}
                data-testid="request-changes-note"
              />
            </FormGroup>
            <CallFailed call={mutation} testId="request-changes-error" describe={decisionErrorText} />
          </DialogBody>
          <DialogFooter
            actions={
              <>
                <Button text="Cancel" onClick={() => setAsking(false)} />
                <Button type="submit" intent="warning" text="Send the request" disabled={noteMissing || !!noteTooLong} loading={mutation.isPending} data-testid="request-changes-submit" />
              </>
            }
          />
        </form>
      </Dialog>
    </div>
  );
}
