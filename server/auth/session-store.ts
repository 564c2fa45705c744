import session from 'express-session';
import { LessThan, type DataSource, type Repository } from 'typeorm';
import { SessionRow } from './session.entity';

type Cb<T = void> = (err?: unknown, value?: T) => void;

/**
 * express-session store on the app's own SQLite file (the memory store loses sessions on restart
 * and leaks). Expired rows are ignored on read and swept periodically.
 */
/** A rolling session's expiry is written at most this often (each write is a commit with fsync). */
const TOUCH_EVERY_MS = 60_000;
const MAX_REMEMBERED = 50_000;

export class SqliteSessionStore extends session.Store {
  private repo: Repository<SessionRow>;
  private sweeper: NodeJS.Timeout;
  /** The expiry last read or written per session id, so that touch() can skip a write that changes little. */
  private stored = new Map<string, number>();

  constructor(
    ds: DataSource,
    private readonly defaultTtlMs: number,
  ) {
    super();
    this.repo = ds.getRepository(SessionRow);
    this.sweeper = setInterval(() => void this.sweep().catch(() => undefined), 10 * 60 * 1000);
    this.sweeper.unref();
  }

  close(): void {
    clearInterval(this.sweeper);
  }

  async sweep(now = Date.now()): Promise<number> {
    const r = await this.repo.delete({ expiresAtMs: LessThan(now) });
    return r.affected ?? 0;
  }

  private expiry(sess: session.SessionData): number {
    const expires = sess.cookie?.expires ? new Date(sess.cookie.expires).getTime() : NaN;
    return Number.isFinite(expires) ? expires : Date.now() + this.defaultTtlMs;
  }

  override get(sid: string, cb: Cb<session.SessionData | null>): void {
    // A plain statement: this runs on every request, and TypeORM's entity building is most of its cost.
    (this.repo.manager.query('SELECT "data", "expiresAtMs" FROM "sessions" WHERE "sid" = ?', [sid]) as Promise<{ data: string; expiresAtMs: number }[]>)
      .then((rows) => rows[0])
      .then(async (row) => {
        if (!row) return cb(null, null);
        if (row.expiresAtMs < Date.now()) {
          this.stored.delete(sid);
          await this.repo.delete({ sid });
          return cb(null, null);
        }
        this.remember(sid, row.expiresAtMs);
        cb(null, JSON.parse(row.data) as session.SessionData);
      })
      .catch(cb);
  }

  private remember(sid: string, expiresAtMs: number): void {
    this.stored.delete(sid);
    this.stored.set(sid, expiresAtMs);
    if (this.stored.size > MAX_REMEMBERED) this.stored.delete(this.stored.keys().next().value!);
  }

  override set(sid: string, sess: session.SessionData, cb?: Cb): void {
    const userId = (sess as { passport?: { user?: string } }).passport?.user ?? null;
    const expiresAtMs = this.expiry(sess);
    this.repo
      .upsert({ sid, data: JSON.stringify(sess), expiresAtMs, userId }, ['sid'])
      .then(() => {
        this.remember(sid, expiresAtMs);
        cb?.();
      })
      .catch((e) => cb?.(e));
  }

  /**
   * A rolling session moves its expiry on every request; writing it each time would cost every
   * signed-in read a commit. The row is written when the expiry has moved by a minute or more, so
   * an idle timeout is honoured to within a minute.
   */
  override touch(sid: string, sess: session.SessionData, cb?: Cb): void {
    const expiresAtMs = this.expiry(sess);
    const known = this.stored.get(sid);
    if (known !== undefined && expiresAtMs - known < TOUCH_EVERY_MS) return void cb?.();
    this.repo
      .update({ sid }, { expiresAtMs })
      .then(() => {
        this.remember(sid, expiresAtMs);
        cb?.();
      })
      .catch((e) => cb?.(e));
  }

  override destroy(sid: string, cb?: Cb): void {
    this.stored.delete(sid);
    this.repo
      .delete({ sid })
      .then(() => cb?.())
      .catch((e) => cb?.(e));
  }

  /** Sign a user out everywhere (account disabled, password reset). */
  async destroyForUser(userId: string): Promise<void> {
    // Forget every remembered expiry: the rows are gone, and a stale entry must not skip a later write.
    this.stored.clear();
    await this.repo.delete({ userId });
  }
}
