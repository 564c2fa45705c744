import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('database', () => {
  it('has a schema that the committed migrations fully describe (nothing left for synchronize)', async () => {
    const pending = await ts.ds.driver.createSchemaBuilder().log();
    expect(pending.upQueries.map((q) => q.query)).toEqual([]);
  });

  it('runs with WAL, foreign keys and a busy timeout', async () => {
    expect((await ts.ds.query('PRAGMA journal_mode'))[0].journal_mode).toBe('wal');
    expect((await ts.ds.query('PRAGMA foreign_keys'))[0].foreign_keys).toBe(1);
    expect((await ts.ds.query('PRAGMA busy_timeout'))[0].timeout).toBeGreaterThanOrEqual(5000);
  });
});
