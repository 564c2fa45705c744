import { describe, expect, it } from 'vitest';
import { loadConfig, startupWarnings } from '../../../server/config';

// Issue 16 item 5: production is not a demo.
const SECRET = 'a-production-secret-of-at-least-32-characters';
const prod = (env: Record<string, string> = {}) =>
  loadConfig({ NODE_ENV: 'production', SESSION_SECRET: SECRET, PUBLIC_URL: 'https://kfield.example.org', ...env });

describe('configuration in production', () => {
  it('loads no demo data unless DEMO_DATA=true is set explicitly', () => {
    expect(prod().DEMO_DATA).toBe(false);
    expect(prod({ DEMO_DATA: 'true' }).DEMO_DATA).toBe(true);
    expect(loadConfig({}).DEMO_DATA).toBe(true);
  });

  it('warns at start that the demo password is public when demo data are on', () => {
    expect(startupWarnings(prod())).toEqual([]);
    const warnings = startupWarnings(prod({ DEMO_DATA: 'true' }));
    expect(warnings.join('\n')).toMatch(/demo accounts.*password.*public/i);
    expect(startupWarnings(loadConfig({}))).toEqual([]);
  });

  it('makes cookies Secure by default when PUBLIC_URL is https, and lets COOKIE_SECURE=false say otherwise', () => {
    expect(prod().COOKIE_SECURE).toBe(true);
    expect(loadConfig({ PUBLIC_URL: 'https://kfield.example.org' }).COOKIE_SECURE).toBe(true);
    expect(loadConfig({}).COOKIE_SECURE).toBe(false);
    expect(prod({ COOKIE_SECURE: 'false' }).COOKIE_SECURE).toBe(false);
  });

  it('refuses an http PUBLIC_URL unless ALLOW_HTTP_PUBLIC_URL=true', () => {
    expect(() => prod({ PUBLIC_URL: 'http://kfield.example.org' })).toThrow(/PUBLIC_URL: .*https.*ALLOW_HTTP_PUBLIC_URL=true/);
    const allowed = prod({ PUBLIC_URL: 'http://kfield.example.org', ALLOW_HTTP_PUBLIC_URL: 'true' });
    expect(allowed.PUBLIC_URL).toBe('http://kfield.example.org');
    expect(allowed.COOKIE_SECURE).toBe(false);
    // Development keeps its http default.
    expect(loadConfig({}).PUBLIC_URL).toBe('http://localhost:3000');
  });

  it('lists every production problem in one message', () => {
    let message = '';
    try {
      loadConfig({ NODE_ENV: 'production' });
    } catch (e) {
      message = (e as Error).message;
    }
    expect(message).toMatch(/SESSION_SECRET/);
    expect(message).toMatch(/PUBLIC_URL/);
  });
});
