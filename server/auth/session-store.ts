import session from 'express-session';
import { LessThan, type DataSource, type Repository } from 'typeorm';
import { SessionRow } from './session.entity';

type Cb<T = void> = (err?: unknown, value?: T) => void;

/**
 * express-session store on the app's own SQLite file (the memory store loses sessions on restart
 * and leaks). Expired rows are ignored on read and swept periodically.
 */
export class SqliteSessionStore extends session.Store {
  private repo: Repository<SessionRow>;
  private sweeper: NodeJS.Timeout;

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
    this.repo
      .findOne({ where: { sid } })
      .then(async (row) => {
        if (!row) return cb(null, null);
        if (row.expiresAtMs < Date.now()) {
          await this.repo.delete({ sid });
          return cb(null, null);
        }
        cb(null, JSON.parse(row.data) as session.SessionData);
      })
      .catch(cb);
  }

  override set(sid: string, sess: session.SessionData, cb?: Cb): void {
    const userId = (sess as { passport?: { user?: string } }).passport?.user ?? null;
    this.repo
      .upsert({ sid, data: JSON.stringify(sess), expiresAtMs: this.expiry(sess), userId }, ['sid'])
      .then(() => cb?.())
      .catch((e) => cb?.(e));
  }

  override touch(sid: string, sess: session.SessionData, cb?: Cb): void {
    this.repo
      .update({ sid }, { expiresAtMs: this.expiry(sess) })
      .then(() => cb?.())
      .catch((e) => cb?.(e));
  }

  override destroy(sid: string, cb?: Cb): void {
    this.repo
      .delete({ sid })
      .then(() => cb?.())
      .catch((e) => cb?.(e));
  }

  /** Sign a user out everywhere (account disabled, password reset). */
  async destroyForUser(userId: string): Promise<void> {
    await this.repo.delete({ userId });
  }
}
