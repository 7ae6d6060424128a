/** What every route module receives from createApp. */
import type { AuthLucia } from '../auth/lucia.ts';
import type { SignInLimiter } from '../auth/rate-limit.ts';
import type { Config } from '../config.ts';
import type { Db } from '../db/index.ts';
import type { Mailer } from '../mail/index.ts';
import type { ObjectStore } from '../storage/objects.ts';

export interface RouteContext {
  db: Db;
  config: Config;
  mailer: Mailer;
  /** The bucket of stored files (attachments). */
  objects: ObjectStore;
  lucia: AuthLucia;
  limiter: SignInLimiter;
  /** This instance's runner of sweep jobs: woken when a sweep is queued here (other instances find it when they poll). */
  sweeps?: { wake(): void };
}

/** A named route parameter as one string (Express 5 types wildcard parameters as arrays). */
export function param(value: string | string[] | undefined): string {
  return Array.isArray(value) ? value.join('/') : (value ?? '');
}
