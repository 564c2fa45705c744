import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from '../../../server/config';

describe('configuration', () => {
  it('has offline-safe defaults', () => {
    const c = loadConfig({});
    expect(c).toMatchObject({ PORT: 3000, FAKE_SMTP: true, SMTP_HOST: '127.0.0.1', DEMO_DATA: true, COOKIE_SECURE: false });
  });

  it('lists every bad value in one readable message', () => {
    let err: unknown;
    try {
      loadConfig({ PORT: 'eighty', BCRYPT_COST: '4', COOKIE_SECURE: 'maybe' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ConfigError);
    const msg = (err as Error).message;
    expect(msg).toMatch(/PORT: must be a port number/);
    expect(msg).toMatch(/BCRYPT_COST: .*at least 10/);
    expect(msg).toMatch(/COOKIE_SECURE: must be true or false/);
  });

  it('refuses the development session secret in production', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET/);
  });
});
