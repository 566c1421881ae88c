import { useState } from 'react';
import { Button, Callout, FormGroup, Spinner, Tag, TextArea } from '@blueprintjs/core';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { TEXT_LIMITS, textProblem, type CommentDto, type FigureDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { formatDate } from '../figures/model';
import { addComment } from './reviewApi';
import type { NumberedPin, Pin } from './ProofImage';

/** Numbers pins 1, 2, … in comment order (the markers on the image use the same numbers). */
export function numberPins(comments: readonly CommentDto[]): Map<string, NumberedPin> {
  const out = new Map<string, NumberedPin>();
  let n = 0;
  for (const c of comments) if (c.pin) out.set(c.id, { ...c.pin, n: ++n });
  return out;
}

export function CommentsPanel({
  figure,
  comments,
  loading,
  error,
  pin,
  pinsPossible,
  onClearPin,
}: {
  figure: FigureDto;
  comments: CommentDto[];
  loading: boolean;
  error: unknown;
  pin: Pin | null;
  pinsPossible: boolean;
  onClearPin(): void;
}) {
  const api = useApi();
  const queryClient = useQueryClient();
  const [body, setBody] = useState('');
  // The limit in the API's own words (libs/contracts), shown as it is passed rather than cutting the text off.
  const bodyProblem = textProblem(body.trim(), TEXT_LIMITS.commentMax);
  const post = useMutation({
    mutationFn: () => addComment(api, figure.id, { body: body.trim(), versionId: figure.currentVersion.id, ...(pin ? { pin } : {}) }),
    onSuccess: () => {
      setBody('');
      onClearPin();
      void queryClient.invalidateQueries({ queryKey: ['figure-comments', figure.id] });
      void queryClient.invalidateQueries({ queryKey: ['figure-audit', figure.id] });
    },
  });
  const numbered = numberPins(comments);

  return (
    <div className="pf-comments" data-testid="comments">
      {loading && <Spinner size={20} />}
      {Boolean(error) && (
        <Callout intent="danger" data-testid="comments-error">
          Comments could not be loaded: {describeError(error)}
        </Callout>
      )}
      {!loading && !error && comments.length === 0 && (
        <p className="pf-muted" data-testid="comments-empty">
          No comments yet.
        </p>
      )}
      {comments.length > 0 && (
        <ol className="pf-comment-list">
          {comments.map((c) => {
            const p = numbered.get(c.id);
            return (
              <li key={c.id} data-testid="comment">
                <div className="pf-comment-head">
                  {p && (
                    <span className="pf-pin pf-pin-inline" data-testid="comment-pin">
                      {p.n}
                    </span>
                  )}
                  <strong>{c.authorName ?? 'Someone'}</strong>
                  <span className="pf-muted pf-small">{formatDate(c.createdAt)}</span>
                  {c.versionId && c.versionId !== figure.currentVersion.id && (
                    <Tag minimal className="pf-small">
                      earlier version
                    </Tag>
                  )}
                </div>
                <p className="pf-comment-body" data-testid="comment-body">
                  {c.body}
                </p>
              </li>
            );
          })}
        </ol>
      )}

      <form
        onSubmit={(e) => {
          e.preventDefault();
          if (body.trim() && !bodyProblem) post.mutate();
        }}
        data-testid="comment-form"
      >
        <FormGroup
          label="Add a comment"
          labelFor="comment-body"
          intent={bodyProblem ? 'danger' : 'none'}
          helperText={
            bodyProblem
              ? <span data-testid="comment-error-limit">The comment {bodyProblem}.</span>
              : pin
              ? `Pinned at ${Math.round(pin.x * 100)}% across, ${Math.round(pin.y * 100)}% down.`
              : pinsPossible
                ? 'Click on the proof image to pin the comment to a spot (optional).'
                : 'Pins need a rendered PNG proof; this comment is about the figure as a whole.'
          }
        >
          <TextArea id="comment-body" fill rows={3} value={body} onChange={(e) => setBody(e.target.value)} intent={bodyProblem ? 'danger' : 'none'} data-testid="comment-input" />
        </FormGroup>
        <div className="pf-head-actions">
          {pin && <Button variant="minimal" text="Remove pin" onClick={onClearPin} data-testid="comment-clear-pin" />}
          <Button type="submit" intent="primary" text="Comment" disabled={!body.trim() || !!bodyProblem} loading={post.isPending} data-testid="comment-submit" />
        </div>
        {post.isError && (
          <Callout intent="danger" className="pf-gap" data-testid="comment-error">
            The comment was not saved: {describeError(post.error)}
          </Callout>
        )}
      </form>
    </div>
  );
}
