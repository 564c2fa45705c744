import { AsyncLocalStorage } from 'node:async_hooks';
import type { DataSource, QueryRunner } from 'typeorm';

/**
 * One SQLite connection serves every request. Without this, a statement or a save from request B
 * that runs while request A's transaction is open becomes part of A's transaction (TypeORM turns a
 * second BEGIN on the connection into a SAVEPOINT): B is answered 2xx, but its write commits only
 * with A and is lost if A rolls back or the process dies first.
 *
 * The gate below gives the connection one owner at a time. A transaction owns it from BEGIN to
 * COMMIT or ROLLBACK; a statement outside any transaction holds it for that statement alone. The
 * owner is told apart by an AsyncLocalStorage token set when its transaction starts, so the
 * owner's own statements (on `m` or on `ds`) pass while everyone else's wait their turn, in order.
 * See docs/decisions/010-serialised-transactions.md.
 */
class Gate {
  owner: symbol | null = null;
  private waiters: { token: symbol; resolve: () => void }[] = [];

  acquire(token: symbol): Promise<void> {
    if (this.owner === null) {
      this.owner = token;
      return Promise.resolve();
    }
    return new Promise((resolve) => this.waiters.push({ token, resolve }));
  }

  release(): void {
    const next = this.waiters.shift();
    this.owner = next?.token ?? null;
    next?.resolve();
  }

  get waiting(): number {
    return this.waiters.length;
  }
}

const ownerToken = new AsyncLocalStorage<symbol>();
const gates = new WeakMap<DataSource, Gate>();
const patched = Symbol('kfield.serialised');

type Runner = QueryRunner & { [patched]?: true; transactionDepth: number };

/** Make every transaction and every statement on this data source take its turn on the connection. */
export function serialiseConnection(ds: DataSource): void {
  const qr = ds.createQueryRunner() as Runner;
  if (qr[patched]) return;
  qr[patched] = true;
  const gate = new Gate();
  gates.set(ds, gate);
  const owns = () => gate.owner !== null && ownerToken.getStore() === gate.owner;

  const startTransaction = qr.startTransaction.bind(qr);
  const commitTransaction = qr.commitTransaction.bind(qr);
  const rollbackTransaction = qr.rollbackTransaction.bind(qr);
  const query = qr.query.bind(qr) as (...args: unknown[]) => Promise<unknown>;

  // Every way into a transaction on the data source's manager runs its whole course with a token
  // of its own (so two saves started side by side by one request still take turns).
  const manager = ds.manager as unknown as Record<string, (...args: unknown[]) => Promise<unknown>>;
  for (const name of ['transaction', 'save', 'remove', 'softRemove', 'recover']) {
    const original = manager[name].bind(ds.manager);
    manager[name] = async (...args: unknown[]) => {
      if (owns()) return original(...args);
      const token = Symbol(name);
      await gate.acquire(token);
      try {
        return await ownerToken.run(token, () => original(...args));
      } finally {
        if (gate.owner === token) gate.release();
      }
    };
  }

  qr.startTransaction = async (isolation) => {
    if (!owns()) {
      // A transaction begun past the manager (a query builder's own, a migration): the token is
      // set synchronously, before the first await, so the caller's continuation carries it too.
      const token = Symbol('transaction');
      ownerToken.enterWith(token);
      await gate.acquire(token);
    }
    try {
      await startTransaction(isolation);
    } catch (e) {
      if (qr.transactionDepth === 0 && owns()) gate.release();
      throw e;
    }
  };
  const ending = (end: () => Promise<void>) => async () => {
    try {
      await end();
    } finally {
      if (qr.transactionDepth === 0 && owns()) gate.release();
    }
  };
  qr.commitTransaction = ending(commitTransaction);
  qr.rollbackTransaction = ending(rollbackTransaction);
  (qr as { query: unknown }).query = async (...args: unknown[]) => {
    if (owns()) return query(...args);
    await gate.acquire(Symbol('statement'));
    try {
      return await query(...args);
    } finally {
      gate.release();
    }
  };
}

/**
 * Run `fn` with the connection to itself, for code that reads the better-sqlite3 handle directly
 * (it bypasses TypeORM's query runner): it then never sees another request's uncommitted writes.
 */
export async function exclusive<T>(ds: DataSource, fn: () => T | Promise<T>): Promise<T> {
  const gate = gates.get(ds);
  if (!gate || (gate.owner !== null && ownerToken.getStore() === gate.owner)) return fn();
  const token = Symbol('exclusive');
  await gate.acquire(token);
  try {
    return await ownerToken.run(token, fn);
  } finally {
    gate.release();
  }
}

/** How many statements or transactions wait for the connection now (for health figures and tests). */
export const connectionQueueLength = (ds: DataSource): number => gates.get(ds)?.waiting ?? 0;

/** Run `fn` (and whatever it starts) as a stranger to the caller's transaction: it waits its turn. */
export const outsideTransaction = <T>(fn: () => T): T => ownerToken.exit(fn);
