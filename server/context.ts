import type { Database_ } from '../db/client';
import type { Clock } from './clock';
import type { AppConfig } from './config';
import type { Mailer } from './mail/mailer';

/** Everything a router needs, handed in by createApp so tests can replace any part. */
export interface AppContext {
  database: Database_;
  mailer: Mailer;
  clock: Clock;
  config: AppConfig;
  log: (line: string) => void;
}
