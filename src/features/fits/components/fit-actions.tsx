import { useId, useState } from 'react';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Fit } from '@shared/schemas/fits';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { useToast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { checkFit, fitKeys, invalidateFit, submitFit } from '../api';

type Decision = 'checked' | 'sent-back';

/** What Submit sends: the analyst's reasons for K-changing flags kept as they are. */
export interface SubmitAnswers {
  reasons: Record<string, string>;
  /** K-changing flags neither resolved nor given a reason: Submit waits for them. */
  unanswered: number;
  /** The server's field errors (reasons.<code>) when it refuses. */
  onRefused: (fields: Record<string, string>) => void;
}

/** Submit, Check and Send back, as `fit.can` allows; the server enforces the same rules. */
export function FitActions({ fit, dirty, onChanged, submitAnswers }: { fit: Fit; dirty: boolean; onChanged?: (fit: Fit) => void; submitAnswers?: SubmitAnswers }) {
  const queryClient = useQueryClient();
  const toast = useToast();
  const [decision, setDecision] = useState<Decision | null>(null);
  const [comment, setComment] = useState('');
  const [commentError, setCommentError] = useState<string | undefined>();
  const headingId = useId();

  const done = async (next: Fit, message: string) => {
    queryClient.setQueryData(fitKeys.detail(next.id), next);
    await invalidateFit(queryClient, next);
    toast.success(message);
    onChanged?.(next);
  };

  const submit = useMutation({
    mutationFn: () => submitFit(fit.id, Object.fromEntries(Object.entries(submitAnswers?.reasons ?? {}).filter(([, r]) => r.trim() !== ''))),
    onSuccess: (next) => done(next, 'Submitted for check: the site’s Checkers have been e-mailed.'),
    onError: (error) => {
      if (isApiError(error) && error.code === 'FLAGS_UNANSWERED' && error.fields) submitAnswers?.onRefused(error.fields);
    },
  });
  const waiting = submitAnswers?.unanswered ?? 0;
  const check = useMutation({
    mutationFn: (d: Decision) => checkFit(fit.id, { decision: d, comment: comment.trim() }),
    onSuccess: async (next, d) => {
      setDecision(null);
      setComment('');
      await done(next, d === 'checked' ? 'Checked: the fit now counts toward Well K.' : 'Sent back to the preparer with your comment.');
    },
  });

  const confirm = () => {
    if (!decision) return;
    if (decision === 'sent-back' && comment.trim() === '') {
      setCommentError('Say what to change when sending a fit back');
      return;
    }
    setCommentError(undefined);
    check.mutate(decision);
  };

  if (!fit.can.submit && !fit.can.check) return null;
  const error = submit.error ?? check.error;
  const serverCommentError = isApiError(check.error) ? check.error.fields?.comment : undefined;

  return (
    <>
      {fit.can.submit ? (
        <>
          <Button
            onClick={() => submit.mutate()}
            pending={submit.isPending}
            disabled={dirty || waiting > 0}
            title={dirty ? 'Save the changes first' : waiting > 0 ? 'Answer the flags that change K first' : undefined}
          >
            Submit for check
          </Button>
          {waiting > 0 && !dirty ? (
            <p className="text-xs text-amber-900" data-testid="submit-waiting">
              {waiting === 1 ? 'One QC flag changes K' : `${waiting} QC flags change K`}: apply the suggested action or give a reason (under Result) before submitting.
            </p>
          ) : null}
        </>
      ) : null}
      {fit.can.check && decision === null ? (
        <>
          <Button onClick={() => setDecision('checked')}>Check</Button>
          <Button variant="danger" onClick={() => setDecision('sent-back')}>
            Send back
          </Button>
        </>
      ) : null}
      {fit.can.check && decision !== null ? (
        <section role="group" aria-labelledby={headingId} className="w-full max-w-xl space-y-3 rounded-md bg-slate-50 p-3 text-left ring-1 ring-slate-200 ring-inset">
          <h3 id={headingId} className="text-sm font-semibold text-slate-900">
            {decision === 'checked' ? 'Sign this fit off as Checked' : 'Send this fit back to its preparer'}
          </h3>
          <TextAreaField
            label={decision === 'checked' ? 'Comment (optional)' : 'What should change?'}
            hint={decision === 'checked' ? 'Sent to the preparer with the decision.' : 'Required: the preparer receives it by e-mail.'}
            value={comment}
            onChange={(e) => setComment(e.target.value)}
            error={commentError ?? serverCommentError}
            autoFocus
          />
          <div className="flex flex-wrap gap-2">
            <Button variant={decision === 'checked' ? 'primary' : 'danger'} onClick={confirm} pending={check.isPending}>
              {decision === 'checked' ? 'Confirm: Checked' : 'Confirm: Send back'}
            </Button>
            <Button variant="ghost" onClick={() => setDecision(null)} disabled={check.isPending}>
              Cancel
            </Button>
          </div>
        </section>
      ) : null}
      {error ? (
        <Alert tone="error" className="w-full text-left">
          {describeError(error)}
        </Alert>
      ) : null}
    </>
  );
}
