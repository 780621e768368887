import type { DataSource } from 'typeorm';
import type { OrganizationKind, Role } from '@shared/vocabulary';
import { hashPassword, User } from '../../server/auth';
import { Organization } from '../../server/organizations';
import { unique } from './api';

let cachedHash: Promise<string> | undefined;
export const TEST_PASSWORD = 'correct-horse-battery';

/** A fresh organisation of its own, so a test can change it without touching anyone else. */
export async function createOrganization(db: DataSource, kind: OrganizationKind, name = unique(`${kind}-`)) {
  return db.getRepository(Organization).save({ kind, name, slug: unique(`${kind}-`), country: 'US', timeZone: 'America/Chicago' });
}

export async function createUser(db: DataSource, input: { role: Role; organizationId: string; status?: User['status'] }) {
  cachedHash ??= hashPassword(TEST_PASSWORD);
  const email = `${unique('user')}@test.example`;
  return db.getRepository(User).save({
    email,
    name: `Test ${input.role}`,
    role: input.role,
    organizationId: input.organizationId,
    status: input.status ?? 'active',
    passwordHash: input.status === 'invited' ? null : await cachedHash,
  });
}
