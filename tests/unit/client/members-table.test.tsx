// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { setCsrfToken } from '@/lib/api-client';
import { MembersTable } from '@/features/members/components/members-table';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { cleanup, click, getButton, getByLabel, jsonResponse, render, stubApi, waitFor } from './helpers';

beforeEach(() => setCsrfToken('tok'));
afterEach(async () => {
  await cleanup();
  vi.unstubAllGlobals();
});

const lead = { userId: 'u1', name: 'Lena Lead', email: 'lead@example.test', role: 'Lead', disabled: false, since: '2025-01-01T00:00:00.000Z' };
const analyst = { userId: 'u3', name: 'Ana Analyst', email: 'analyst@example.test', role: 'Analyst', disabled: false, since: '2025-01-03T00:00:00.000Z' };

async function changeSelect(select: HTMLElement, value: string) {
  const { act } = await import('react');
  await act(async () => {
    (select as HTMLSelectElement).value = value;
    select.dispatchEvent(new Event('change', { bubbles: true }));
  });
}

function table(onMembershipChanged = () => {}) {
  return (
    <QueryBoundary>
      <MembersTable siteId="s1" canManage myUserId="u1" onMembershipChanged={onMembershipChanged} onLeftSite={() => {}} />
    </QueryBoundary>
  );
}

describe('members table for a Lead', () => {
  it('changes a role through the API and tells the caller the membership changed', async () => {
    const server = stubApi({
      'GET /api/sites/s1/members': () => jsonResponse({ members: [lead, analyst], invitations: [] }),
      'PATCH /api/sites/s1/members/u3': () => jsonResponse({ ...analyst, role: 'Checker' }),
    });
    const onMembershipChanged = vi.fn();
    const { container } = await render(table(onMembershipChanged));

    const select = await waitFor(() => getByLabel(container, 'Role for Ana Analyst'));
    await changeSelect(select, 'Checker');

    await waitFor(() => expect(onMembershipChanged).toHaveBeenCalled());
    const patch = server.calls.find((c) => c.method === 'PATCH');
    expect(JSON.parse(String(patch?.init?.body))).toEqual({ role: 'Checker' });
    expect(document.body.textContent).toContain('Ana Analyst is now Checker.');
  });

  it('shows the server’s reason when the last Lead would be removed, and keeps the row', async () => {
    stubApi({
      'GET /api/sites/s1/members': () => jsonResponse({ members: [lead, analyst], invitations: [] }),
      'DELETE /api/sites/s1/members/u1': () =>
        jsonResponse({ error: { code: 'LAST_LEAD', message: 'A site needs at least one Lead.' } }, 409),
    });
    const { container } = await render(table());

    await click(await waitFor(() => getButton(container, 'Leave this site')));
    await click(getButton(container, 'Leave'));

    await waitFor(() => expect(document.body.querySelector('[role="alert"]')?.textContent).toContain('A site needs at least one Lead.'));
    expect(container.textContent).toContain('Lena Lead');
  });
});
