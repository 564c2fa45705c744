import { describe, expect, it } from 'vitest';
import { splitLinks } from '@/lib/linkify';
import { safeNextPath, signInPathFor } from '@/lib/safe-next';

describe('outbox links', () => {
  it('turns http(s) addresses into links and leaves sentence punctuation outside them', () => {
    const text = 'Open http://localhost:3000/invitations/abc123. Or https://kfield.example/reset-password?token=x&y=1, then sign in.';
    expect(splitLinks(text).filter((p) => p.kind === 'link')).toEqual([
      { kind: 'link', href: 'http://localhost:3000/invitations/abc123' },
      { kind: 'link', href: 'https://kfield.example/reset-password?token=x&y=1' },
    ]);
    expect(
      splitLinks(text)
        .map((p) => (p.kind === 'link' ? p.href : p.text))
        .join(''),
    ).toBe(text);
  });

  it('never makes a link of other schemes', () => {
    expect(splitLinks('javascript:alert(1) data:text/html,x')).toEqual([
      { kind: 'text', text: 'javascript:alert(1) data:text/html,x' },
    ]);
  });
});

describe('?next= after sign-in', () => {
  it('follows a path on this site', () => {
    expect(safeNextPath('/sites/s1/members?tab=x')).toBe('/sites/s1/members?tab=x');
  });

  it('refuses other origins and loops back to sign-in', () => {
    for (const next of ['//evil.example/x', 'https://evil.example', '/\\evil.example', '/sign-in?next=/x', '', null]) {
      expect(safeNextPath(next)).toBe('/');
    }
  });

  it('keeps the page a signed-out visitor asked for', () => {
    expect(signInPathFor({ pathname: '/admin/outbox', search: '?message=m1' })).toBe(
      `/sign-in?next=${encodeURIComponent('/admin/outbox?message=m1')}`,
    );
    expect(signInPathFor({ pathname: '/', search: '' })).toBe('/sign-in');
  });
});
