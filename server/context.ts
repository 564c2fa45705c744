import type { DataSource } from 'typeorm';
import type { Config } from './config';
import type { Outbox } from './features/mail/outbox';

/** What every service needs, built once by createApp. */
export interface AppContext {
  config: Config;
  ds: DataSource;
  /** Mail goes into the outbox inside the caller's transaction, never straight to the relay. */
  outbox: Outbox;
}
