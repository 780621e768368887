// Append-only custody log for a case's original media. Each entry's hash covers the previous entry's
// hash and the entry itself (SHA-256, FIPS 180-4), so editing, removing or reordering an earlier entry
// breaks every hash after it. Uses Web Crypto so the browser and the server compute the same value.
//
// The chain proves the log was not altered after the fact only relative to a hash kept somewhere else:
// whoever can rewrite every row can recompute every hash. Keep the latest head hash outside the log
// (a receipt, a certificate, a webhook) and pass it to verifyChain as `expectedHeadHash`.

export const custodyActions = [
  'packed_by_shop',
  'handed_to_carrier',
  'delivered',
  'checked_in',
  'to_clean_bench',
  'imaged',
  'returned',
  'sanitized',
  'transferred',
] as const;
export type CustodyAction = (typeof custodyActions)[number];

export const custodyActionLabels: Record<CustodyAction, string> = {
  packed_by_shop: 'Packed by the shop',
  handed_to_carrier: 'Handed to the carrier',
  delivered: 'Delivered to the lab',
  checked_in: 'Checked in',
  to_clean_bench: 'Moved to the clean bench',
  imaged: 'Imaged',
  returned: 'Returned',
  sanitized: 'Sanitized',
  transferred: 'Transferred to another lab',
};

/** JSON values allowed in `details`: what survives a JSON round trip unchanged. */
export type CustodyDetailValue = string | number | boolean | null | CustodyDetailValue[] | { [key: string]: CustodyDetailValue };

export interface CustodyEntry {
  /** 1 for the first entry of a case, then +1 per entry. */
  sequence: number;
  caseId: string;
  action: CustodyAction;
  /** Who did it: a user id, or a carrier name for carrier scans. */
  actor: string;
  /** When; a Date or an ISO 8601 string. Hashed as the UTC ISO form with milliseconds. */
  at: Date | string;
  location: string | null;
  details?: Record<string, CustodyDetailValue>;
}

export interface StoredCustodyEntry extends CustodyEntry {
  hash: string;
}

export type ChainVerification =
  | { intact: true }
  | { intact: false; firstBrokenSequence: number; reason: string };

const hexPattern = /^[0-9a-f]{64}$/;

/** Lower-case hex SHA-256 of the UTF-8 bytes of `text`. */
export async function sha256Hex(text: string): Promise<string> {
  if (typeof text !== 'string') throw new TypeError('sha256Hex expects a string');
  const digest = await globalThis.crypto.subtle.digest('SHA-256', new TextEncoder().encode(text));
  return Array.from(new Uint8Array(digest), (byte) => byte.toString(16).padStart(2, '0')).join('');
}

function canonicalIso(at: Date | string): string {
  const date = at instanceof Date ? at : typeof at === 'string' ? new Date(at) : null;
  if (date === null || Number.isNaN(date.getTime())) {
    throw new RangeError(`custody entry "at" must be a valid date or ISO 8601 string, got ${String(at)}`);
  }
  if (typeof at === 'string' && !/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/.test(at)) {
    // Date.parse accepts many local formats whose meaning depends on the machine's time zone.
    throw new RangeError(`custody entry "at" must be an ISO 8601 date-time with a time zone, got "${at}"`);
  }
  return date.toISOString();
}

/** Rebuilds a JSON value with object keys in sorted order, refusing anything JSON would change or drop. */
function sortedValue(value: unknown, path: string): CustodyDetailValue {
  if (value === null || typeof value === 'string' || typeof value === 'boolean') return value;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new RangeError(`${path} must be a finite number, got ${value}`);
    return value;
  }
  if (Array.isArray(value)) return value.map((item, index) => sortedValue(item, `${path}[${index}]`));
  if (typeof value === 'object' && Object.getPrototypeOf(value) === Object.prototype) {
    const result: Record<string, CustodyDetailValue> = {};
    // Default sort compares UTF-16 code units, the same order RFC 8785 (JCS) uses, so it is engine-independent.
    for (const key of Object.keys(value).sort()) {
      result[key] = sortedValue((value as Record<string, unknown>)[key], `${path}.${key}`);
    }
    return result;
  }
  throw new TypeError(`${path} must be a JSON value (string, finite number, boolean, null, array or plain object)`);
}

/** Stable JSON of the hashed fields with sorted keys at every level. */
export function canonicalEntry(entry: CustodyEntry): string {
  if (entry === null || typeof entry !== 'object') throw new TypeError('custody entry must be an object');
  const { sequence, caseId, action, actor, at, location, details = {} } = entry;
  if (!Number.isSafeInteger(sequence) || sequence < 1) {
    throw new RangeError(`custody entry sequence must be a whole number from 1, got ${String(sequence)}`);
  }
  if (typeof caseId !== 'string' || caseId.length === 0) throw new TypeError('custody entry caseId must be a non-empty string');
  if (!(custodyActions as readonly string[]).includes(action)) {
    throw new RangeError(`custody entry action "${String(action)}" is not one of: ${custodyActions.join(', ')}`);
  }
  if (typeof actor !== 'string' || actor.length === 0) throw new TypeError('custody entry actor must be a non-empty string');
  if (location !== null && typeof location !== 'string') throw new TypeError('custody entry location must be a string or null');
  if (details === null || typeof details !== 'object' || Array.isArray(details)) {
    throw new TypeError('custody entry details must be a plain object');
  }
  return JSON.stringify(
    sortedValue({ action, actor, at: canonicalIso(at), caseId, details, location, sequence }, 'entry'),
  );
}

/** SHA-256 of the previous entry's hash (nothing for the first entry) followed by this entry's canonical JSON. */
export async function chainHash(previousHash: string | null, entry: CustodyEntry): Promise<string> {
  if (previousHash !== null && !hexPattern.test(previousHash)) {
    throw new RangeError('previousHash must be null or 64 lower-case hex characters');
  }
  return sha256Hex((previousHash ?? '') + canonicalEntry(entry));
}

export interface VerifyChainOptions {
  /** Sequence of the first entry; 1 for a full log. Use a later value to check a tail from a known hash. */
  firstSequence?: number;
  /** Hash of the entry before `firstSequence`, when checking a tail; null for a full log. */
  previousHash?: string | null;
  /** Head hash kept outside the log; detects a removed last entry or a log rewritten from scratch. */
  expectedHeadHash?: string;
}

/** Checks order, case and every hash of a case's custody log, reporting the first entry that fails. */
export async function verifyChain(
  entries: readonly StoredCustodyEntry[],
  options: VerifyChainOptions = {},
): Promise<ChainVerification> {
  const { firstSequence = 1, previousHash = null, expectedHeadHash } = options;
  let expectedPrevious = previousHash;
  let expectedSequence = firstSequence;
  const caseId = entries[0]?.caseId;

  for (const entry of entries) {
    const broken = (reason: string): ChainVerification => ({
      intact: false,
      firstBrokenSequence: expectedSequence,
      reason,
    });
    if (entry.sequence !== expectedSequence) {
      return broken(
        entry.sequence > expectedSequence
          ? `entry ${expectedSequence} is missing: the next entry has sequence ${entry.sequence}`
          : `entry with sequence ${entry.sequence} is out of order: expected ${expectedSequence}`,
      );
    }
    if (entry.caseId !== caseId) {
      return broken(`entry ${entry.sequence} belongs to case ${entry.caseId}, not ${caseId}`);
    }
    let computed: string;
    try {
      computed = await chainHash(expectedPrevious, entry);
    } catch (error) {
      return broken(`entry ${entry.sequence} is malformed: ${(error as Error).message}`);
    }
    if (computed !== entry.hash) {
      return broken(`entry ${entry.sequence} does not match its stored hash: it or an earlier link was changed`);
    }
    expectedPrevious = entry.hash;
    expectedSequence += 1;
  }

  if (expectedHeadHash !== undefined && expectedHeadHash !== (expectedPrevious ?? undefined)) {
    return {
      intact: false,
      firstBrokenSequence: expectedSequence,
      reason:
        entries.length === 0
          ? 'the log is empty but a head hash was expected'
          : `the last entry's hash does not match the expected head: entries after ${expectedSequence - 1} are missing or the log was rewritten`,
    };
  }
  return { intact: true };
}
