import type { DataSource } from 'typeorm';
import type { Config } from '../config';
import type { OrganizationKind, Role } from '@shared/vocabulary';

/** What every service needs; passed in, never imported, so tests build their own. */
export interface ServiceContext {
  db: DataSource;
  config: Config;
}

/** The signed-in user as the guard established it: the only source of "who" and "which organisation". */
export interface Actor {
  userId: string;
  organizationId: string;
  organizationKind: OrganizationKind;
  role: Role;
}
