import { describe, expect, it } from 'vitest';
import { triage } from '@shared/domain/triage';
import { readLabDirectory } from '../../server/routing/directory';
import { rankLabs, RANKED_SHOWN } from '../../server/routing/ranking';
import { setupApi } from '../support/api';

// Routing holds the labs in memory and follows the database through lab_directory_version.
const { db } = await setupApi();

async function someLab(): Promise<{ id: string; weekly: number }> {
  const [row] = await db.query(`SELECT organization_id AS id, weekly_throughput AS weekly FROM lab_profiles ORDER BY organization_id LIMIT 1`);
  return row;
}

describe('the lab directory routing reads', () => {
  it('is read once and kept while nothing about the labs changes', async () => {
    const first = await readLabDirectory(db.manager);
    const second = await readLabDirectory(db.manager);
    expect(second.directory).toBe(first.directory);
  });

  it('is read again after a lab profile changes, and shows the change', async () => {
    const lab = await someLab();
    const before = await readLabDirectory(db.manager);
    // Inside a transaction that is then undone, so that files running beside this one never see it.
    await db
      .transaction(async (manager) => {
        await manager.query(`UPDATE lab_profiles SET weekly_throughput = $2 WHERE organization_id = $1`, [lab.id, lab.weekly + 1]);
        const after = await readLabDirectory(manager);
        expect(after.directory).not.toBe(before.directory);
        expect(after.directory.byId.get(lab.id)?.weeklyThroughput).toBe(lab.weekly + 1);
        throw new Error('undo');
      })
      .catch((e: Error) => expect(e.message).toBe('undo'));
  });

  it('does not keep a change that was rolled back', async () => {
    const lab = await someLab();
    await expect(
      db.transaction(async (manager) => {
        await manager.query(`UPDATE lab_profiles SET weekly_throughput = 999 WHERE organization_id = $1`, [lab.id]);
        expect((await readLabDirectory(manager)).directory.byId.get(lab.id)?.weeklyThroughput).toBe(999);
        throw new Error('roll back');
      }),
    ).rejects.toThrow('roll back');
    expect((await readLabDirectory(db.manager)).directory.byId.get(lab.id)?.weeklyThroughput).toBe(lab.weekly);
  });

  it('counts each lab’s open cases afresh on every reading, without reading the labs again', async () => {
    const [held] = await db.query(
      `SELECT id, lab_organization_id AS lab, status FROM referrals WHERE lab_organization_id IS NOT NULL AND status = 'accepted' LIMIT 1`,
    );
    expect(held).toBeDefined();
    const before = await readLabDirectory(db.manager);
    await db
      .transaction(async (manager) => {
        await manager.query(`UPDATE referrals SET status = 'closed' WHERE id = $1`, [held.id]);
        const after = await readLabDirectory(manager);
        expect(after.directory).toBe(before.directory);
        expect(after.openCases.get(held.lab) ?? 0).toBe((before.openCases.get(held.lab) ?? 0) - 1);
        throw new Error('undo');
      })
      .catch((e: Error) => expect(e.message).toBe('undo'));
  });
});

describe('rankLabs', () => {
  const kase = { mediaType: 'usb_flash' as const, origin: { lat: 39.7392, lon: -104.9903 }, triage: triage({ mediaType: 'usb_flash', symptoms: ['deleted_files'], sensitivity: [] }) };
  const asOf = new Date('2026-12-01T15:00:00Z');

  it('keeps the best candidates only, exactly the head of the full ranking, and says how many qualified', async () => {
    const full = await rankLabs(db.manager, kase, { asOf, limit: null });
    expect(full.candidates.length).toBeGreaterThan(1);
    expect(full.candidateCount).toBe(full.candidates.length);
    const best = await rankLabs(db.manager, kase, { asOf, limit: 1 });
    expect(best.candidates).toEqual(full.candidates.slice(0, 1));
    expect(best.candidateCount).toBe(full.candidateCount);
    expect(best.excluded).toEqual(full.excluded);
  });

  it(`keeps ${RANKED_SHOWN} by default`, async () => {
    const full = await rankLabs(db.manager, kase, { asOf, limit: null });
    const shown = await rankLabs(db.manager, kase, { asOf });
    expect(shown.candidates).toEqual(full.candidates.slice(0, RANKED_SHOWN));
  });
});
