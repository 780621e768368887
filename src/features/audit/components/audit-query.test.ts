import { describe, expect, it } from 'vitest';
import { auditQueryFrom } from './audit-log';

describe('auditQueryFrom', () => {
  it('turns the address’s calendar days into the start of "from" and the end of "to" in local time, and drops what is not a date', () => {
    const q = auditQueryFrom(new URLSearchParams('action=auth&actor=%20maya%20&from=2026-03-01&to=2026-03-02'));
    expect(q).toMatchObject({ action: 'auth', actor: 'maya', limit: '50' });
    expect(q.from).toBe(new Date(2026, 2, 1).toISOString());
    // "To" includes its whole day: the range ends at the next local midnight.
    expect(q.to).toBe(new Date(2026, 2, 3).toISOString());
    expect(auditQueryFrom(new URLSearchParams('from=yesterday')).from).toBeUndefined();
  });
});
