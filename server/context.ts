import type { DataSource } from 'typeorm';
import type { Config } from './config';
import type { Mailer } from './features/mail/mailer';

/** What every service needs, built once by createApp. */
export interface AppContext {
  config: Config;
  ds: DataSource;
  mailer: Mailer;
}
