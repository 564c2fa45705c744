// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { setCsrfToken } from '@/lib/api-client';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { cleanup, click, getButton, getByLabel, jsonResponse, render, stubApi, type, waitFor } from './helpers';

beforeEach(() => setCsrfToken('tok'));
afterEach(async () => {
  await cleanup();
  vi.unstubAllGlobals();
});

function errorTextFor(input: HTMLElement): string | undefined {
  const ids = input.getAttribute('aria-describedby')?.split(' ') ?? [];
  return ids.map((id) => document.getElementById(id)?.textContent).find(Boolean) ?? undefined;
}

describe('sign-in form', () => {
  it('shows the schema messages beside empty fields and sends nothing', async () => {
    const server = stubApi({});
    const { container } = await render(<SignInForm onSignedIn={() => {}} />);

    await click(getButton(container, 'Sign in'));

    await waitFor(() => expect(errorTextFor(getByLabel(container, 'E-mail'))).toBe('E-mail is required'));
    expect(errorTextFor(getByLabel(container, 'Password'))).toBe('Password is required');
    expect(getByLabel(container, 'E-mail').getAttribute('aria-invalid')).toBe('true');
    expect(server.calls).toHaveLength(0);
  });

  it('shows the server message for wrong credentials', async () => {
    stubApi({
      'POST /api/auth/login': () =>
        jsonResponse({ error: { code: 'BAD_CREDENTIALS', message: 'E-mail or password is wrong.' } }, 401),
    });
    const onSignedIn = vi.fn();
    const { container } = await render(<SignInForm onSignedIn={onSignedIn} />);

    await type(getByLabel(container, 'E-mail'), 'lead@example.test');
    await type(getByLabel(container, 'Password'), 'not the password');
    await click(getButton(container, 'Sign in'));

    const alert = await waitFor(() => {
      const el = container.querySelector('[role="alert"]');
      if (!el) throw new Error('no alert yet');
      return el;
    });
    expect(alert.textContent).toContain('E-mail or password is wrong.');
    expect(onSignedIn).not.toHaveBeenCalled();
  });

  it('puts server field errors beside their fields', async () => {
    stubApi({
      'POST /api/auth/login': () =>
        jsonResponse({ error: { code: 'VALIDATION', message: 'Check the form', fields: { password: 'Password is too long' } } }, 400),
    });
    const { container } = await render(<SignInForm onSignedIn={() => {}} />);

    await type(getByLabel(container, 'E-mail'), 'lead@example.test');
    await type(getByLabel(container, 'Password'), 'x');
    await click(getButton(container, 'Sign in'));

    await waitFor(() => expect(errorTextFor(getByLabel(container, 'Password'))).toBe('Password is too long'));
    expect(container.querySelector('[role="alert"]')).toBeNull();
  });

  it('hands the signed-in user over and sends the e-mail in lower case', async () => {
    const user = { id: 'u1', email: 'lead@example.test', name: 'Lena Lead', isAdmin: false };
    const server = stubApi({ 'POST /api/auth/login': () => jsonResponse({ user, csrfToken: 'fresh' }) });
    const onSignedIn = vi.fn();
    const { container } = await render(<SignInForm onSignedIn={onSignedIn} />);

    await type(getByLabel(container, 'E-mail'), ' Lead@Example.TEST ');
    await type(getByLabel(container, 'Password'), 'correct horse battery');
    await click(getButton(container, 'Sign in'));

    await waitFor(() => expect(onSignedIn).toHaveBeenCalledWith(user));
    expect(JSON.parse(String(server.calls[0].init?.body))).toEqual({ email: 'lead@example.test', password: 'correct horse battery' });
  });
});
