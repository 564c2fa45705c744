import 'reflect-metadata';
import fs from 'node:fs';
import path from 'node:path';
import { DataSource } from 'typeorm';
import { entities } from './entities';
import { migrations } from './migrations';
import { serialiseConnection } from './serialize';

export function createDataSource(databasePath: string): DataSource {
  if (databasePath !== ':memory:') fs.mkdirSync(path.dirname(path.resolve(databasePath)), { recursive: true });
  return new DataSource({
    type: 'better-sqlite3',
    database: databasePath,
    entities,
    migrations,
    synchronize: false,
    migrationsRun: false,
    enableWAL: true,
    // better-sqlite3's busy timeout in milliseconds: wait for a writer instead of failing at once.
    timeout: 5000,
    prepareDatabase: (db: { pragma: (s: string) => unknown }) => {
      db.pragma('foreign_keys = ON');
      db.pragma('busy_timeout = 5000');
      // WAL's default (NORMAL) may lose the last commits on a power cut; a write answered 2xx must not be.
      db.pragma('synchronous = FULL');
    },
    logging: ['error'],
  });
}

/** Open the database file and bring its schema up to date with the committed migrations. */
export async function openDatabase(databasePath: string): Promise<DataSource> {
  const ds = createDataSource(databasePath);
  await ds.initialize();
  serialiseConnection(ds);
  await ds.runMigrations({ transaction: 'each' });
  return ds;
}
