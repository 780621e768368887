import { describe, expect, it } from 'vitest';
import {
  canonicalEntry,
  chainHash,
  custodyActions,
  sha256Hex,
  verifyChain,
  type CustodyEntry,
  type StoredCustodyEntry,
} from './custody-chain';

describe('sha256Hex', () => {
  // FIPS 180-4 / FIPS 180-2 Appendix B.1 one-block message "abc" (NIST example values).
  it('hashes "abc" to the FIPS 180-4 example digest', async () => {
    expect(await sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  // The well-known SHA-256 of the empty message (NIST CAVP byte-oriented vectors, Len = 0; from memory).
  it('hashes the empty string to the published empty-message digest', async () => {
    expect(await sha256Hex('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  // FIPS 180-2 Appendix B.2 two-block message (NIST example values, from memory).
  it('hashes the 448-bit two-block example message to the FIPS example digest', async () => {
    expect(await sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe(
      '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
    );
  });

  // FIPS 180-2 Appendix B.3: one million repetitions of "a" (NIST example values, from memory).
  it('hashes a million "a" characters to the FIPS example digest', async () => {
    expect(await sha256Hex('a'.repeat(1_000_000))).toBe('cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0');
  });
});

const baseEntry: CustodyEntry = {
  sequence: 1,
  caseId: 'case-7Q2K',
  action: 'packed_by_shop',
  actor: 'user-101',
  at: '2024-05-02T14:03:00Z',
  location: 'Front counter, Maple Ave shop',
  details: { seal: 'S-44120', bag: 'anti-static' },
};

describe('canonicalEntry', () => {
  it('writes the seven fields with keys sorted, at every level, and the time as UTC ISO with milliseconds', () => {
    const text = canonicalEntry({ ...baseEntry, details: { z: 1, a: { y: true, b: null } } });
    expect(text).toBe(
      '{"action":"packed_by_shop","actor":"user-101","at":"2024-05-02T14:03:00.000Z","caseId":"case-7Q2K",' +
        '"details":{"a":{"b":null,"y":true},"z":1},"location":"Front counter, Maple Ave shop","sequence":1}',
    );
  });

  it('gives the same text whatever order the keys were written in, and for equal instants', () => {
    const reordered: CustodyEntry = {
      details: { bag: 'anti-static', seal: 'S-44120' },
      location: baseEntry.location,
      at: new Date('2024-05-02T16:03:00+02:00'),
      actor: baseEntry.actor,
      action: baseEntry.action,
      caseId: baseEntry.caseId,
      sequence: 1,
    };
    expect(canonicalEntry(reordered)).toBe(canonicalEntry(baseEntry));
  });

  it('treats missing details as an empty object', () => {
    const { details: _omitted, ...withoutDetails } = baseEntry;
    expect(canonicalEntry(withoutDetails)).toContain('"details":{}');
  });

  it('refuses values that JSON would silently drop or change, and bad fields, naming the field', () => {
    expect(() => canonicalEntry({ ...baseEntry, details: { weight: Number.NaN } })).toThrow(/entry\.details\.weight/);
    expect(() => canonicalEntry({ ...baseEntry, details: { when: new Date() as never } })).toThrow(/JSON value/);
    expect(() => canonicalEntry({ ...baseEntry, details: { note: undefined as never } })).toThrow(/JSON value/);
    expect(() => canonicalEntry({ ...baseEntry, action: 'lost' as never })).toThrow(/action "lost"/);
    expect(() => canonicalEntry({ ...baseEntry, sequence: 0 })).toThrow(/sequence/);
    expect(() => canonicalEntry({ ...baseEntry, at: '05/02/2024 14:03' })).toThrow(/"at"/);
    expect(() => canonicalEntry({ ...baseEntry, at: '2024-05-02T14:03:00' })).toThrow(/time zone/);
  });
});

describe('chainHash', () => {
  it('is SHA-256 of the canonical entry for the first entry, and of previous hash + canonical entry after', async () => {
    const first = await chainHash(null, baseEntry);
    expect(first).toBe(await sha256Hex(canonicalEntry(baseEntry)));
    const second: CustodyEntry = { ...baseEntry, sequence: 2, action: 'handed_to_carrier', actor: 'carrier' };
    expect(await chainHash(first, second)).toBe(await sha256Hex(first + canonicalEntry(second)));
  });

  it('refuses a previous hash that is not 64 lower-case hex characters', async () => {
    await expect(chainHash('ABC', baseEntry)).rejects.toThrow(/64 lower-case hex/);
  });
});

async function buildChain(entries: CustodyEntry[]): Promise<StoredCustodyEntry[]> {
  const stored: StoredCustodyEntry[] = [];
  let previous: string | null = null;
  for (const entry of entries) {
    const hash = await chainHash(previous, entry);
    stored.push({ ...entry, hash });
    previous = hash;
  }
  return stored;
}

const journey: CustodyEntry[] = [
  baseEntry,
  { sequence: 2, caseId: 'case-7Q2K', action: 'handed_to_carrier', actor: 'carrier:ground', at: '2024-05-02T17:40:00Z', location: 'Maple Ave shop', details: { tracking: 'TRK000123' } },
  { sequence: 3, caseId: 'case-7Q2K', action: 'delivered', actor: 'carrier:ground', at: '2024-05-04T10:12:00Z', location: 'Lab dock', details: {} },
  { sequence: 4, caseId: 'case-7Q2K', action: 'checked_in', actor: 'user-205', at: '2024-05-04T10:30:00Z', location: 'Receiving', details: { seal: 'S-44120', sealIntact: true } },
  { sequence: 5, caseId: 'case-7Q2K', action: 'to_clean_bench', actor: 'user-301', at: '2024-05-05T09:00:00Z', location: 'Clean bench 2', details: {} },
  { sequence: 6, caseId: 'case-7Q2K', action: 'imaged', actor: 'user-301', at: '2024-05-06T15:45:00Z', location: 'Imaging rack', details: { unreadableSectors: 1184 } },
];

describe('verifyChain', () => {
  it('accepts an untouched chain of several entries, and an empty log', async () => {
    expect(await verifyChain(await buildChain(journey))).toEqual({ intact: true });
    expect(await verifyChain([])).toEqual({ intact: true });
  });

  const fieldChanges: [string, (entry: StoredCustodyEntry) => StoredCustodyEntry][] = [
    ['caseId', (e) => ({ ...e, caseId: 'case-OTHER' })],
    ['action', (e) => ({ ...e, action: 'returned' })],
    ['actor', (e) => ({ ...e, actor: 'user-999' })],
    ['at', (e) => ({ ...e, at: '2024-05-04T10:31:00Z' })],
    ['location', (e) => ({ ...e, location: null })],
    ['details', (e) => ({ ...e, details: { seal: 'S-44120', sealIntact: false } })],
    ['sequence', (e) => ({ ...e, sequence: 5 })],
  ];

  it.each(fieldChanges)('detects a changed %s in a middle entry at that entry', async (_field, change) => {
    const chain = await buildChain(journey);
    chain[3] = change(chain[3]);
    const result = await verifyChain(chain);
    expect(result.intact).toBe(false);
    if (!result.intact) expect(result.firstBrokenSequence).toBe(4);
  });

  it('detects a middle entry rewritten with a freshly computed hash at the entry after it', async () => {
    const chain = await buildChain(journey);
    const forged = { ...chain[3], details: { seal: 'S-44120', sealIntact: false } };
    chain[3] = { ...forged, hash: await chainHash(chain[2].hash, forged) };
    const result = await verifyChain(chain);
    expect(result).toMatchObject({ intact: false, firstBrokenSequence: 5 });
  });

  it('detects a removed middle entry at the missing sequence', async () => {
    const chain = await buildChain(journey);
    chain.splice(2, 1);
    const result = await verifyChain(chain);
    expect(result).toMatchObject({ intact: false, firstBrokenSequence: 3 });
    if (!result.intact) expect(result.reason).toMatch(/missing/);
  });

  it('detects a removed middle entry even when later sequences were renumbered', async () => {
    const chain = await buildChain(journey);
    chain.splice(2, 1);
    const renumbered = chain.map((entry, index) => ({ ...entry, sequence: index + 1 }));
    expect(await verifyChain(renumbered)).toMatchObject({ intact: false, firstBrokenSequence: 3 });
  });

  it('detects a removed first entry', async () => {
    const chain = await buildChain(journey);
    expect(await verifyChain(chain.slice(1))).toMatchObject({ intact: false, firstBrokenSequence: 1 });
  });

  it('detects two swapped entries at the first one out of place', async () => {
    const chain = await buildChain(journey);
    [chain[1], chain[2]] = [chain[2], chain[1]];
    const result = await verifyChain(chain);
    expect(result).toMatchObject({ intact: false, firstBrokenSequence: 2 });
  });

  it('detects swapped entries whose sequence numbers were swapped back', async () => {
    const chain = await buildChain(journey);
    const [a, b] = [chain[1], chain[2]];
    chain[1] = { ...b, sequence: 2 };
    chain[2] = { ...a, sequence: 3 };
    expect(await verifyChain(chain)).toMatchObject({ intact: false, firstBrokenSequence: 2 });
  });

  it('cannot see a removed last entry on its own, but does with the head hash kept elsewhere', async () => {
    const chain = await buildChain(journey);
    const head = chain[chain.length - 1].hash;
    const truncated = chain.slice(0, -1);
    expect(await verifyChain(truncated)).toEqual({ intact: true });
    expect(await verifyChain(truncated, { expectedHeadHash: head })).toMatchObject({ intact: false, firstBrokenSequence: 6 });
    expect(await verifyChain(chain, { expectedHeadHash: head })).toEqual({ intact: true });
  });

  it('checks a tail of the log from a known previous hash', async () => {
    const chain = await buildChain(journey);
    const tail = chain.slice(3);
    expect(await verifyChain(tail, { firstSequence: 4, previousHash: chain[2].hash })).toEqual({ intact: true });
    expect(await verifyChain(tail, { firstSequence: 4, previousHash: chain[1].hash })).toMatchObject({
      intact: false,
      firstBrokenSequence: 4,
    });
  });

  it('reports an entry with an unknown action as malformed at that entry', async () => {
    const chain = await buildChain(journey);
    chain[4] = { ...chain[4], action: 'misplaced' as never };
    const result = await verifyChain(chain);
    expect(result).toMatchObject({ intact: false, firstBrokenSequence: 5 });
    if (!result.intact) expect(result.reason).toMatch(/malformed/);
  });
});

describe('custodyActions', () => {
  it('holds the plain action names of the custody log', () => {
    expect(custodyActions).toEqual([
      'packed_by_shop',
      'handed_to_carrier',
      'delivered',
      'checked_in',
      'to_clean_bench',
      'imaged',
      'returned',
      'sanitized',
      'transferred',
    ]);
  });
});
