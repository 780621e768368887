import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cleanAirSkills, labSkills, mediaTypes, symptoms, type MediaType } from '../vocabulary';
import { cautionCodes, cautions, triage, triageRules, type TriageInput } from './triage';

// The rules are common practice in the data-recovery trade with no published source; the cases below
// are the examples the product brief gives for triage, plus the edges of the rule table.

const codes = (input: TriageInput) => triage(input).cautions.map((c) => c.code);

describe('triage: hard drives (common practice)', () => {
  it.each(['hdd_3_5', 'hdd_2_5'] as const)('a clicking %s needs a head swap in clean air and tells the shop not to power it again', (mediaType) => {
    const result = triage({ mediaType, symptoms: ['clicking'] });
    expect(result.requiredSkills).toEqual(['hdd_head_swap']);
    expect(result.needsCleanAir).toBe(true);
    expect(codes({ mediaType, symptoms: ['clicking'] })).toEqual(['do_not_power_on', 'do_not_open_drive']);
  });

  it('a beeping drive needs platter work and a head swap; a drive that does not spin needs electronics and platter work', () => {
    expect(triage({ mediaType: 'hdd_3_5', symptoms: ['beeping'] }).requiredSkills).toEqual(['hdd_head_swap', 'hdd_platter_work']);
    const notSpinning = triage({ mediaType: 'hdd_3_5', symptoms: ['not_spinning'] });
    expect(notSpinning.requiredSkills).toEqual(['hdd_electronics', 'hdd_platter_work']);
    expect(notSpinning.needsCleanAir).toBe(true);
    expect(notSpinning.cautions[0].code).toBe('do_not_power_on');
  });

  it('a burnt smell needs HDD electronics and no clean air', () => {
    const result = triage({ mediaType: 'hdd_2_5', symptoms: ['burnt_smell'] });
    expect(result.requiredSkills).toEqual(['hdd_electronics']);
    expect(result.needsCleanAir).toBe(false);
  });

  it('combines symptoms: a dropped drive that now clicks and was then formatted needs head swap and logical recovery', () => {
    const result = triage({ mediaType: 'hdd_2_5', symptoms: ['dropped', 'clicking', 'formatted'] });
    expect(result.requiredSkills).toEqual(['logical', 'hdd_head_swap']);
    expect(result.matchedRules.map((r) => r.ruleId)).toEqual(['hdd-never-open', 'hdd-clicking', 'hdd-dropped', 'deleted-or-formatted']);
    expect(result.unmatchedSymptoms).toEqual([]);
  });

  it('every matched rule carries its trigger and reason, so the shop can see why', () => {
    const [clicking] = triage({ mediaType: 'hdd_3_5', symptoms: ['clicking'] }).matchedRules.filter((r) => r.ruleId === 'hdd-clicking');
    expect(clicking).toEqual({
      ruleId: 'hdd-clicking',
      trigger: 'clicking',
      skills: ['hdd_head_swap'],
      reason: expect.stringMatching(/failed read\/write heads/),
    });
  });

  it('a drive with no reported symptom still needs a lab that can image and read it', () => {
    const result = triage({ mediaType: 'hdd_3_5', symptoms: [] });
    expect(result.requiredSkills).toEqual(['logical']);
    expect(result.matchedRules.at(-1)?.ruleId).toBe('default-logical');
  });
});

describe('triage: SSDs and flash (common practice)', () => {
  it('an SSD that is not detected needs SSD controller work', () => {
    expect(triage({ mediaType: 'ssd_m2_nvme', symptoms: ['not_detected'] }).requiredSkills).toEqual(['ssd_controller']);
  });

  it('deleted files on an SSD need logical recovery, tell the shop to stop using it, and warn that TRIM often makes them unrecoverable', () => {
    const result = triage({ mediaType: 'ssd_sata', symptoms: ['deleted_files'] });
    expect(result.requiredSkills).toEqual(['logical']);
    expect(codes({ mediaType: 'ssd_sata', symptoms: ['deleted_files'] })).toEqual([
      'do_not_remove_chips',
      'stop_using_device',
      'no_repair_tools',
      'trim_erases_deleted_data',
    ]);
    expect(result.cautions.find((c) => c.code === 'trim_erases_deleted_data')?.reason).toMatch(/TRIM/);
  });

  it('formatted hard drives get the stop-using caution but not the TRIM warning', () => {
    const result = codes({ mediaType: 'hdd_3_5', symptoms: ['formatted'] });
    expect(result).toContain('stop_using_device');
    expect(result).not.toContain('trim_erases_deleted_data');
  });

  it('a snapped USB stick needs flash chip-off; a broken memory card needs monolithic flash work', () => {
    expect(triage({ mediaType: 'usb_flash', symptoms: ['physically_broken'] }).requiredSkills).toEqual(['flash_chip_off']);
    expect(triage({ mediaType: 'memory_card', symptoms: ['physically_broken'] }).requiredSkills).toEqual(['monolith_flash']);
  });

  it('a wet memory card also needs liquid remediation and the no-heat caution', () => {
    const result = triage({ mediaType: 'memory_card', symptoms: ['liquid_damage'] });
    expect(result.requiredSkills).toEqual(['monolith_flash', 'liquid_remediation']);
    expect(result.cautions.map((c) => c.code)).toContain('do_not_dry_with_heat');
  });

  it('lists symptoms that do not apply to the media type instead of inventing a skill for them', () => {
    const result = triage({ mediaType: 'usb_flash', symptoms: ['clicking', 'not_detected'] });
    expect(result.requiredSkills).toEqual(['flash_chip_off']);
    expect(result.unmatchedSymptoms).toEqual(['clicking']);
  });
});

describe('triage: phones, arrays, tape, other (common practice)', () => {
  it('a phone that will not boot needs board repair, and asks for a battery declaration when none was given', () => {
    const result = triage({ mediaType: 'phone', symptoms: ['wont_boot'] });
    expect(result.requiredSkills).toEqual(['phone_board']);
    expect(result.cautions.map((c) => c.code)).toEqual(['do_not_power_on', 'do_not_heat_board', 'battery_not_declared']);
  });

  it('a swollen phone battery marks the case as a battery hazard (its cautions come from battery.ts)', () => {
    const result = triage({ mediaType: 'phone', symptoms: ['dropped'], battery: { installed: true, condition: 'swollen' } });
    expect(result.batteryHazard).toBe(true);
    expect(result.cautions.map((c) => c.code)).not.toContain('battery_not_declared');
  });

  it('an intact battery is no hazard', () => {
    expect(triage({ mediaType: 'tablet', symptoms: [], battery: { installed: true, condition: 'intact' } }).batteryHazard).toBe(false);
  });

  it('a RAID with a clicking member needs a rebuild and a head swap, and names how many members to send', () => {
    const result = triage({ mediaType: 'raid_nas', symptoms: ['clicking'], raidMemberCount: 4 });
    expect(result.requiredSkills).toEqual(['hdd_head_swap', 'raid_rebuild']);
    expect(result.cautions.find((c) => c.code === 'raid_keep_members')?.message).toMatch(/This array has 4 members: send all 4\./);
  });

  it('tape always needs the tape skill', () => {
    expect(triage({ mediaType: 'tape', symptoms: ['physically_broken'] }).requiredSkills).toEqual(['tape']);
  });

  it('other media starts from logical recovery and asks the network to review', () => {
    const result = triage({ mediaType: 'other', symptoms: ['no_power'] });
    expect(result.requiredSkills).toEqual(['logical']);
    expect(result.needsReview).toBe(true);
  });
});

describe('triage: sensitivity (network rules from the product brief)', () => {
  it('legal evidence adds forensic custody on top of the hardware skills', () => {
    const result = triage({ mediaType: 'hdd_3_5', symptoms: ['clicking'], sensitivity: ['legal_evidence'] });
    expect(result.requiredSkills).toEqual(['hdd_head_swap', 'forensic_custody']);
    expect(result.cautions.map((c) => c.code)).toContain('chain_of_custody');
  });

  it('legal evidence alone still needs logical recovery besides custody', () => {
    expect(triage({ mediaType: 'hdd_3_5', symptoms: [], sensitivity: ['legal_evidence'] }).requiredSkills).toEqual(['logical', 'forensic_custody']);
  });

  it('health records require the health-data agreement, not a skill', () => {
    const result = triage({ mediaType: 'ssd_sata', symptoms: ['wont_boot'], sensitivity: ['health_records', 'financial'] });
    expect(result.needsHealthDataAgreement).toBe(true);
    expect(result.requiredSkills).toEqual(['logical']);
  });

  it('"none" is the same as no flags', () => {
    expect(triage({ mediaType: 'hdd_3_5', symptoms: ['clicking'], sensitivity: ['none'] })).toEqual(
      triage({ mediaType: 'hdd_3_5', symptoms: ['clicking'] }),
    );
  });
});

describe('triage: bad input', () => {
  it('names the field and the allowed values', () => {
    expect(() => triage({ mediaType: 'floppy' as MediaType, symptoms: [] })).toThrow(/mediaType must be one of hdd_3_5/);
    expect(() => triage({ mediaType: 'hdd_3_5', symptoms: ['smoking' as 'clicking'] })).toThrow(/unknown symptom "smoking"/);
    expect(() => triage({ mediaType: 'hdd_3_5', symptoms: [], sensitivity: ['none', 'financial'] })).toThrow(/"none" cannot be combined/);
    expect(() => triage({ mediaType: 'raid_nas', symptoms: [] })).toThrow(/raidMemberCount must be a whole number from 2 to 64/);
    expect(() => triage({ mediaType: 'hdd_3_5', symptoms: [], raidMemberCount: 2 })).toThrow(/applies only to raid_nas/);
    expect(() => triage({ mediaType: 'phone', symptoms: [], battery: { installed: true } })).toThrow(/battery.condition is required/);
  });
});

describe('triage rule table', () => {
  it('every rule has a reason and only vocabulary codes', () => {
    for (const rule of triageRules) {
      expect(rule.reason.length, rule.id).toBeGreaterThan(10);
      rule.skills.forEach((s) => expect(labSkills).toContain(s));
      rule.media.forEach((m) => expect(mediaTypes).toContain(m));
      rule.symptoms?.forEach((s) => expect(symptoms).toContain(s));
      rule.cautions.forEach((c) => expect(cautionCodes).toContain(c));
    }
    expect(new Set(triageRules.map((r) => r.id)).size).toBe(triageRules.length);
  });

  it('every caution has a message and a reason', () => {
    for (const code of cautionCodes) {
      expect(cautions[code].message.length).toBeGreaterThan(10);
      expect(cautions[code].reason.length).toBeGreaterThan(10);
    }
  });

  it('for any media type and symptoms: at least one skill, each once, in vocabulary order; clean air exactly when a mechanical skill is needed; cautions once each, most severe first', () => {
    const input = fc.record({
      mediaType: fc.constantFrom(...mediaTypes.filter((m) => m !== 'raid_nas')),
      symptoms: fc.subarray([...symptoms]),
      sensitivity: fc.subarray(['health_records', 'legal_evidence', 'financial'] as const),
    });
    fc.assert(
      fc.property(input, (i) => {
        const r = triage(i);
        expect(r.requiredSkills.length).toBeGreaterThan(0);
        expect(r.requiredSkills).toEqual(labSkills.filter((s) => r.requiredSkills.includes(s)));
        expect(r.needsCleanAir).toBe(r.requiredSkills.some((s) => cleanAirSkills.includes(s)));
        expect(new Set(r.cautions.map((c) => c.code)).size).toBe(r.cautions.length);
        const rank = { danger: 0, warning: 1, info: 2 };
        r.cautions.slice(1).forEach((c, k) => expect(rank[c.severity]).toBeGreaterThanOrEqual(rank[r.cautions[k].severity]));
        r.unmatchedSymptoms.forEach((s) => expect(i.symptoms).toContain(s));
      }),
    );
  });
});
