import { describe, expect, it } from 'vitest';
import { matchingAutoAcceptRule } from './dispatch';
import { noCandidateReason } from './ranking';

describe('noCandidateReason', () => {
  it('counts the labs behind each exclusion reason, most common first, in words', () => {
    const reason = noCandidateReason([
      { labId: 'a', labName: 'A', location: null, reasons: [{ code: 'missing_skills', message: '' }, { code: 'media_type', message: '' }] },
      { labId: 'b', labName: 'B', location: null, reasons: [{ code: 'missing_skills', message: '' }] },
      { labId: 'c', labName: 'C', location: null, reasons: [{ code: 'clean_air_expired', message: '' }] },
    ]);
    expect(reason).toBe(
      'No lab can take this case now: 2 labs lack a required skill; 1 lab has a clean-air certificate past its re-test date; 1 lab does not take this media type.',
    );
  });

  it('says so when the network has no labs at all', () => {
    expect(noCandidateReason([])).toMatch(/no labs on the network/);
  });
});

describe('matchingAutoAcceptRule', () => {
  const rules = [
    { skills: ['logical' as const], maxDistanceKm: 100 },
    { skills: ['logical' as const, 'encrypted_volumes' as const], maxDistanceKm: 20 },
  ];

  it('matches a rule that covers every required skill within its distance', () => {
    expect(matchingAutoAcceptRule(rules, ['logical'], 80)).toBe(rules[0]);
    expect(matchingAutoAcceptRule(rules, ['logical', 'encrypted_volumes'], 20)).toBe(rules[1]);
  });

  it('matches none when a skill is outside every rule or the shop is too far', () => {
    expect(matchingAutoAcceptRule(rules, ['logical', 'forensic_custody'], 5)).toBeNull();
    expect(matchingAutoAcceptRule(rules, ['logical', 'encrypted_volumes'], 21)).toBeNull();
    expect(matchingAutoAcceptRule(rules, ['logical'], 100.1)).toBeNull();
    expect(matchingAutoAcceptRule([], ['logical'], 0)).toBeNull();
  });
});
