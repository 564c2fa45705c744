import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type session from 'express-session';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SqliteSessionStore } from '../../../server/auth/session-store';
import { SessionRow } from '../../../server/auth/session.entity';
import { openDatabase } from '../../../server/db/data-source';

const data = (expires: number) => ({ cookie: { expires: new Date(expires), originalMaxAge: 3600_000 } }) as unknown as session.SessionData;
const call = (fn: (cb: (e?: unknown) => void) => void) => new Promise<void>((resolve, reject) => fn((e) => (e ? reject(e) : resolve())));

describe('session store', () => {
  let ds: DataSource;
  let store: SqliteSessionStore;
  beforeAll(async () => {
    ds = await openDatabase(path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-sessions-')), 'kfield.sqlite'));
    store = new SqliteSessionStore(ds, 3600_000);
  });
  afterAll(async () => {
    store.close();
    await ds.destroy();
  });

  it('writes a rolling expiry only when it has moved by a minute, so a signed-in read costs no commit', async () => {
    const t0 = Date.now() + 3600_000;
    await call((cb) => store.set('sid-a', data(t0), cb));
    const expiry = async () => (await ds.getRepository(SessionRow).findOneByOrFail({ sid: 'sid-a' })).expiresAtMs;
    await call((cb) => store.touch('sid-a', data(t0 + 30_000), cb));
    expect(await expiry()).toBe(t0);
    await call((cb) => store.touch('sid-a', data(t0 + 61_000), cb));
    expect(await expiry()).toBe(t0 + 61_000);
  });

  it('still ends a session that stayed idle past its expiry', async () => {
    await call((cb) => store.set('sid-b', data(Date.now() - 1), cb));
    const got = await new Promise((resolve, reject) => store.get('sid-b', (e, v) => (e ? reject(e) : resolve(v))));
    expect(got).toBeNull();
  });
});
