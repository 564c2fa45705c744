// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { setCsrfToken } from '@/lib/api-client';
import { AuditTrail } from '@/features/fits/components/audit-trail';
import { FitActions } from '@/features/fits/components/fit-actions';
import { fit, FIT_ID as ID, at } from './fit-fixtures';
import { cleanup, click, getButton, getByLabel, jsonResponse, render, stubApi, type, waitFor } from './helpers';

beforeEach(() => setCsrfToken('tok'));
afterEach(async () => {
  await cleanup();
  vi.unstubAllGlobals();
});

describe('check actions', () => {
  it('will not send a fit back without a comment, and sends the comment with the decision', async () => {
    const server = stubApi({
      [`POST /api/fits/${ID}/check`]: () => jsonResponse(fit({ status: 'sent-back', checkComment: 'Start later', can: { edit: false, revise: false, submit: false, check: false } })),
      [`GET /api/fits/${ID}`]: () => jsonResponse(fit({ status: 'sent-back' })),
    });
    const { container } = await render(<FitActions fit={fit()} dirty={false} />);
    await click(getButton(container, 'Send back'));
    await click(getButton(container, 'Confirm: Send back'));
    expect(container.textContent).toContain('Say what to change when sending a fit back');
    expect(server.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
    await type(getByLabel(container, 'What should change?'), 'Start later');
    await click(getButton(container, 'Confirm: Send back'));
    await waitFor(() => expect(server.calls.some((c) => c.method === 'POST')).toBe(true));
    const body = JSON.parse(String(server.calls.find((c) => c.method === 'POST')!.init!.body));
    expect(body).toEqual({ decision: 'sent-back', comment: 'Start later' });
  });

  it('shows the server’s refusal when the preparer tries to check their own fit', async () => {
    stubApi({
      [`POST /api/fits/${ID}/check`]: () =>
        jsonResponse({ error: { code: 'SELF_CHECK', message: 'You prepared this fit, so someone else must check it (separation of duties)' } }, 403),
    });
    const { container } = await render(<FitActions fit={fit()} dirty={false} />);
    await click(getButton(container, 'Check'));
    await click(getButton(container, 'Confirm: Checked'));
    await waitFor(() => expect(container.textContent).toContain('someone else must check it'));
  });

  it('offers Submit only when saved, and no check to someone who may not check', async () => {
    const { container } = await render(<FitActions fit={fit({ status: 'draft', can: { edit: true, revise: false, submit: true, check: false } })} dirty />);
    expect(getButton(container, 'Submit for check').disabled).toBe(true);
    expect(getButton(container, 'Submit for check').title).toBe('Save the changes first');
    expect(() => getButton(container, 'Check')).toThrow();
  });
});

describe('audit trail', () => {
  it('shows who changed what, from → to, and the Checker’s comment', async () => {
    stubApi({
      [`GET /api/fits/${ID}/audit`]: () =>
        jsonResponse({
          events: [
            { id: 'e1', fitId: ID, kind: 'created', actor: { id: 'a', name: 'Tomas Ferreira' }, at, details: { method: 'hvorslev', line: 'anchored', kMetersPerSecond: 1.2e-5 } },
            { id: 'e2', fitId: ID, kind: 'sent-back', actor: { id: 'c', name: 'Ines Okafor' }, at, details: { comment: 'Start the window later' } },
            {
              id: 'e3',
              fitId: ID,
              kind: 'parameters-changed',
              actor: { id: 'a', name: 'Tomas Ferreira' },
              at,
              details: {
                changes: {
                  window: { from: null, to: { kind: 'time', fromSeconds: 20, toSeconds: 120 } },
                  'geometry.screenLengthM': { from: 3, to: 2.5 },
                },
                kMetersPerSecond: 1.4e-5,
              },
            },
          ],
        }),
    });
    const { container } = await render(
      <QueryBoundary>
        <AuditTrail fitId={ID} siteId="s1" />
      </QueryBoundary>,
    );
    await waitFor(() => expect(container.textContent).toContain('Audit trail (3 events)'));
    const text = container.textContent ?? '';
    expect(text).toContain('Created by Tomas Ferreira');
    expect(text).toContain('Hvorslev (1951), anchored line');
    expect(text).toContain('Sent back by Ines Okafor');
    expect(text).toContain('Start the window later');
    expect(text).toContain('Fitting window: the recommended range → changed to t = 20 – 120 s');
    expect(text).toContain('Screen length (m): 3 → changed to 2.5');
    expect(text).toContain('K = 1.40 × 10⁻⁵ m/s');
  });
});
