import { describe, expect, it } from 'vitest';
import type { EntityManager } from 'typeorm';
import { readLabDirectory } from '../../server/routing/directory';
import { labManagers, networkAdmins, shopUsers } from '../../server/routing/notify';
import { setupApi } from '../support/api';
import { createOrganization, createUser } from '../support/factories';
import { statementsOf } from '../support/statements';

// Who is e-mailed about offers is kept in memory and follows the database through
// recipient_directory_version. Each check runs in a REPEATABLE READ transaction, so that files running
// beside this one (which add users of their own) cannot change the version it sees half-way.
const { db } = await setupApi();

const lab = await createOrganization(db, 'lab');
const manager = await createUser(db, { role: 'lab_manager', organizationId: lab.id });
const shop = await createOrganization(db, 'partner');
const staff = await createUser(db, { role: 'partner_staff', organizationId: shop.id });

/** Runs `work` in a transaction that is always undone, so nothing it changes reaches other files. */
async function undone(work: (m: EntityManager) => Promise<void>): Promise<void> {
  await db
    .transaction('REPEATABLE READ', async (m) => {
      await work(m);
      throw new Error('undo');
    })
    .catch((e: Error) => expect(e.message).toBe('undo'));
}

const version = async (m: EntityManager) => ((await m.query(`SELECT version::text AS v FROM recipient_directory_version`)) as { v: string }[])[0].v;

describe('the e-mail recipient lists intake reads', () => {
  it('reads the active people of each kind', async () => {
    await undone(async (m) => {
      await readLabDirectory(m);
      expect((await labManagers(m, lab.id)).map((p) => p.email)).toEqual([manager.email]);
      expect((await shopUsers(m, shop.id)).map((p) => p.email)).toEqual([staff.email]);
      expect((await networkAdmins(m)).every((p) => p.status === 'active')).toBe(true);
    });
  });

  it('keeps a list while the people do not change, and uses it without a statement', async () => {
    await undone(async (m) => {
      await readLabDirectory(m);
      const first = await labManagers(m, lab.id);
      const again = await statementsOf(() => labManagers(m, lab.id));
      expect(again.statements).toEqual([]);
      expect(again.result).toBe(first);
    });
  });

  it('reads the people again after one of them changes, and shows the change', async () => {
    await undone(async (m) => {
      await readLabDirectory(m);
      await labManagers(m, lab.id);
      const before = await version(m);
      await m.query(`UPDATE users SET name = 'Renamed Manager' WHERE id = $1`, [manager.id]);
      expect(await version(m)).not.toBe(before);
      await readLabDirectory(m);
      const after = await statementsOf(() => labManagers(m, lab.id));
      expect(after.statements).toHaveLength(1);
      expect(after.result.map((p) => p.name)).toEqual(['Renamed Manager']);
    });
  });

  it('does not keep a list read inside a transaction that rolled back', async () => {
    await undone(async (m) => {
      await m.query(`UPDATE users SET status = 'disabled' WHERE id = $1`, [manager.id]);
      await readLabDirectory(m);
      expect(await labManagers(m, lab.id)).toEqual([]);
    });
    await undone(async (m) => {
      await readLabDirectory(m);
      expect((await labManagers(m, lab.id)).map((p) => p.id)).toEqual([manager.id]);
    });
  });

  it('keeps the version through a sign-in, and changes it when an organisation is switched off', async () => {
    await undone(async (m) => {
      const before = await version(m);
      await m.query(`UPDATE users SET last_sign_in_at = now(), failed_sign_ins = 0 WHERE id = $1`, [manager.id]);
      expect(await version(m)).toBe(before);
      await m.query(`UPDATE organizations SET active = false WHERE id = $1`, [lab.id]);
      expect(await version(m)).not.toBe(before);
    });
  });

  it('always reads afresh through the shared manager, which no version reading belongs to', async () => {
    await readLabDirectory(db.manager);
    await labManagers(db.manager, lab.id);
    const again = await statementsOf(() => labManagers(db.manager, lab.id));
    expect(again.statements).toHaveLength(1);
  });
});
