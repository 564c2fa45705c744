import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { openDatabase } from '../../../server/db/data-source';
import { MapVersion } from '../../../server/features/map/map-version.entity';

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('one SQLite connection shared by concurrent requests', () => {
  let ds: DataSource;
  beforeAll(async () => {
    ds = await openDatabase(path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-serial-')), 'kfield.sqlite'));
    await ds.query('CREATE TABLE "probe" ("x" integer NOT NULL)');
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it("keeps a write made while another request's transaction is open when that transaction rolls back", async () => {
    await ds.query('DELETE FROM "probe"');
    await ds.getRepository(MapVersion).clear();
    // Request A: a transaction that waits (as it would on a mail relay) and then fails.
    const a = ds.transaction(async (m) => {
      await m.query('INSERT INTO "probe" ("x") VALUES (1)');
      await sleep(150);
      throw new Error('the relay refused the message');
    });
    await sleep(20);
    // Requests B and C, answered while A is still open: a plain statement and a save (TypeORM's own transaction).
    const b = ds.query('INSERT INTO "probe" ("x") VALUES (2)');
    const c = ds.getRepository(MapVersion).save({ siteId: 'site-c', version: 3 });
    await expect(a).rejects.toThrow(/relay refused/);
    await b;
    await c;
    expect((await ds.query('SELECT "x" FROM "probe" ORDER BY "x"')).map((r: { x: number }) => r.x)).toEqual([2]);
    expect(await ds.getRepository(MapVersion).findOneBy({ siteId: 'site-c' })).toMatchObject({ version: 3 });
  });

  it('never lets a reader see another transaction before it commits', async () => {
    await ds.query('DELETE FROM "probe"');
    let seenDuring = -1;
    const a = ds.transaction(async (m) => {
      await m.query('INSERT INTO "probe" ("x") VALUES (7)');
      await sleep(100);
      throw new Error('rolled back');
    });
    await sleep(10);
    const reader = ds.query('SELECT count(*) AS n FROM "probe"').then((r: { n: number }[]) => (seenDuring = r[0].n));
    await expect(a).rejects.toThrow();
    await reader;
    expect(seenDuring).toBe(0);
  });

  it("runs a transaction's own statements on ds (not only on its manager) inside it", async () => {
    await ds.query('DELETE FROM "probe"');
    await ds.transaction(async (m) => {
      await m.query('INSERT INTO "probe" ("x") VALUES (1)');
      // The same request reading through the data source sees its own write and does not deadlock.
      const rows = await ds.query('SELECT count(*) AS n FROM "probe"');
      expect(rows[0].n).toBe(1);
      await ds.getRepository(MapVersion).save({ siteId: 'site-own', version: 1 });
    });
    expect(await ds.getRepository(MapVersion).countBy({ siteId: 'site-own' })).toBe(1);
  });

  it('serves many concurrent writers, each in its own transaction, with none lost', async () => {
    await ds.query('DELETE FROM "probe"');
    const failing = Array.from({ length: 20 }, (_, i) =>
      ds.transaction(async (m) => {
        await m.query('INSERT INTO "probe" ("x") VALUES (?)', [1000 + i]);
        await sleep(2);
        if (i % 2) throw new Error('fails');
      }).catch(() => undefined),
    );
    const plain = Array.from({ length: 50 }, (_, i) => ds.query('INSERT INTO "probe" ("x") VALUES (?)', [i]));
    await Promise.all([...failing, ...plain]);
    const rows: { x: number }[] = await ds.query('SELECT "x" FROM "probe"');
    expect(rows.filter((r) => r.x < 1000)).toHaveLength(50);
    expect(rows.filter((r) => r.x >= 1000).map((r) => r.x).sort()).toEqual(Array.from({ length: 10 }, (_, i) => 1000 + 2 * i));
  });

  it('commits with synchronous = FULL in WAL mode, so a confirmed commit survives a power cut', async () => {
    expect((await ds.query('PRAGMA journal_mode'))[0].journal_mode).toBe('wal');
    // 2 = FULL (SQLite documentation, PRAGMA synchronous).
    expect((await ds.query('PRAGMA synchronous'))[0].synchronous).toBe(2);
  });
});
