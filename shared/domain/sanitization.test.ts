import { describe, expect, it } from 'vitest';
import { mediaTypes, type MediaType } from '../vocabulary';
import {
  achievedLevel,
  checkSanitization,
  equipmentHazardDeferral,
  equipmentHazards,
  hazardsForTechnique,
  sanitizationLevels,
  sanitizationRules,
  sanitizationTechniques,
  techniquesMeeting,
  type SanitizationLevel,
  type SanitizationTechnique,
} from './sanitization';

type Expected = Record<SanitizationTechnique, SanitizationLevel | null>;

// What each technique reaches with no special condition confirmed, restated from
// NIST SP 800-88 Rev. 1, Appendix A (from memory). Rows Appendix A is silent on are marked beside them.
const magnetic: Expected = {
  overwrite: 'clear',
  block_erase: null,
  cryptographic_erase: null, // purge only on a self-encrypting drive (checked below)
  degauss: 'purge',
  shred: 'destroy',
  crush: null, // not a Destroy method in Appendix A
  disintegrate: 'destroy',
  incinerate: 'destroy',
};
const solidState: Expected = {
  overwrite: 'clear',
  block_erase: 'purge',
  cryptographic_erase: null,
  degauss: null, // flash is not magnetic
  shred: 'destroy',
  crush: null,
  disintegrate: 'destroy',
  incinerate: 'destroy',
};
const removableFlash: Expected = { ...solidState, block_erase: null };
const mobile: Expected = {
  overwrite: null,
  block_erase: null,
  cryptographic_erase: 'clear', // factory reset without storage encryption; purge when encrypted
  degauss: null,
  shred: 'destroy',
  crush: null,
  disintegrate: 'destroy',
  incinerate: 'destroy',
};
const raid: Expected = { ...magnetic, degauss: null }; // members may be flash (our reading)
const tape: Expected = { ...magnetic }; // Appendix A tape: overwrite clears, degauss purges, shred/incinerate destroy
const unknown: Expected = {
  overwrite: null,
  block_erase: null,
  cryptographic_erase: null,
  degauss: null,
  shred: 'destroy',
  crush: null,
  disintegrate: 'destroy',
  incinerate: 'destroy',
};

const expectedByMedia: Record<MediaType, Expected> = {
  hdd_3_5: magnetic,
  hdd_2_5: magnetic,
  ssd_sata: solidState,
  ssd_m2_nvme: solidState,
  usb_flash: removableFlash,
  memory_card: removableFlash,
  phone: mobile,
  tablet: mobile,
  raid_nas: raid,
  tape,
  other: unknown,
};

const rank: Record<SanitizationLevel, number> = { clear: 1, purge: 2, destroy: 3 };

describe('checkSanitization against NIST SP 800-88 Rev. 1, Appendix A (from memory)', () => {
  it('has a rule with a reason for every media type of the vocabulary and every technique', () => {
    for (const mediaType of mediaTypes) {
      for (const technique of sanitizationTechniques) {
        expect(sanitizationRules[mediaType][technique].reason.length, `${mediaType}/${technique}`).toBeGreaterThan(20);
      }
    }
  });

  describe.each(mediaTypes)('%s', (mediaType) => {
    const expected = expectedByMedia[mediaType];

    it.each(sanitizationTechniques)('%s is accepted up to its level and refused above it', (technique) => {
      const reaches = expected[technique];
      for (const level of sanitizationLevels) {
        const result = checkSanitization({ mediaType, level, technique });
        const shouldPass = reaches !== null && rank[reaches] >= rank[level];
        expect(result.ok, `${technique} for ${level}`).toBe(shouldPass);
        if (!result.ok) expect(result.reason).toMatch(/\S/);
        if (result.ok) expect(result.achieves).toBe(reaches);
      }
    });
  });

  it('accepts overwrite as Clear on a hard drive (Appendix A, ATA/SCSI hard drives)', () => {
    expect(checkSanitization({ mediaType: 'hdd_3_5', level: 'clear', technique: 'overwrite' })).toMatchObject({ ok: true });
  });

  it('purges a hard drive by overwrite only through the drive\'s own sanitize command (Appendix A)', () => {
    const hostOverwrite = checkSanitization({ mediaType: 'hdd_2_5', level: 'purge', technique: 'overwrite' });
    expect(hostOverwrite).toMatchObject({ ok: false });
    if (!hostOverwrite.ok) expect(hostOverwrite.reason).toMatch(/reaches clear, not purge.*own sanitize/);
    expect(checkSanitization({ mediaType: 'hdd_2_5', level: 'purge', technique: 'overwrite', driveCommand: true })).toMatchObject({
      ok: true,
      achieves: 'purge',
    });
  });

  it('keeps overwrite at Clear on flash even through a drive command: spare area and wear levelling (Appendix A)', () => {
    for (const mediaType of ['ssd_sata', 'ssd_m2_nvme', 'usb_flash', 'memory_card'] as const) {
      expect(achievedLevel(mediaType, 'overwrite', { driveCommand: true }), mediaType).toBe('clear');
      const result = checkSanitization({ mediaType, level: 'purge', technique: 'overwrite', driveCommand: true });
      expect(result.ok, mediaType).toBe(false);
      if (!result.ok) expect(result.reason).toMatch(/wear levelling/);
    }
  });

  it('refuses degaussing for every flash media type, saying why (Appendix A: degaussing does not sanitize flash)', () => {
    for (const mediaType of ['ssd_sata', 'ssd_m2_nvme', 'usb_flash', 'memory_card', 'phone', 'tablet'] as const) {
      const result = checkSanitization({ mediaType, level: 'purge', technique: 'degauss' });
      expect(result.ok, mediaType).toBe(false);
      if (!result.ok) expect(result.reason).toMatch(/charge, not magnetism/);
    }
  });

  it('purges a hard drive and a tape by degaussing, warning that modern drives are unusable afterwards (Appendix A)', () => {
    const hdd = checkSanitization({ mediaType: 'hdd_3_5', level: 'purge', technique: 'degauss' });
    expect(hdd).toMatchObject({ ok: true, achieves: 'purge' });
    if (hdd.ok) expect(hdd.caution).toMatch(/unusable/);
    expect(checkSanitization({ mediaType: 'tape', level: 'purge', technique: 'degauss' })).toMatchObject({ ok: true });
  });

  it('purges by cryptographic erase only on self-encrypting media (Appendix A)', () => {
    for (const mediaType of ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'ssd_m2_nvme', 'usb_flash', 'raid_nas'] as const) {
      const plain = checkSanitization({ mediaType, level: 'purge', technique: 'cryptographic_erase' });
      expect(plain.ok, mediaType).toBe(false);
      if (!plain.ok) expect(plain.reason).toMatch(/self-encrypting/);
      expect(
        checkSanitization({ mediaType, level: 'purge', technique: 'cryptographic_erase', selfEncrypting: true }),
        mediaType,
      ).toMatchObject({ ok: true, achieves: 'purge' });
    }
  });

  it('never accepts cryptographic erase for memory cards, tape or unknown media, even when claimed self-encrypting', () => {
    for (const mediaType of ['memory_card', 'tape', 'other'] as const) {
      expect(achievedLevel(mediaType, 'cryptographic_erase', { selfEncrypting: true }), mediaType).toBeNull();
    }
  });

  it('treats a phone or tablet reset as Purge when storage is encrypted and as Clear otherwise (Appendix A, mobile devices)', () => {
    for (const mediaType of ['phone', 'tablet'] as const) {
      expect(achievedLevel(mediaType, 'cryptographic_erase', { selfEncrypting: true })).toBe('purge');
      expect(achievedLevel(mediaType, 'cryptographic_erase')).toBe('clear');
    }
  });

  it('refuses crushing as Destroy on every media type, naming the Appendix A Destroy methods', () => {
    for (const mediaType of mediaTypes) {
      const result = checkSanitization({ mediaType, level: 'destroy', technique: 'crush' });
      expect(result.ok, mediaType).toBe(false);
      if (!result.ok) expect(result.reason).toMatch(/shred|Destroy/i);
    }
  });

  it('warns to remove the lithium battery before a phone is shredded', () => {
    const result = checkSanitization({ mediaType: 'phone', level: 'destroy', technique: 'shred' });
    expect(result).toMatchObject({ ok: true, achieves: 'destroy' });
    if (result.ok) expect(result.caution).toMatch(/lithium battery/);
  });

  it('refuses a level that is too high with the level the technique does reach', () => {
    const result = checkSanitization({ mediaType: 'ssd_sata', level: 'destroy', technique: 'block_erase' });
    expect(result).toMatchObject({ ok: false });
    if (!result.ok) expect(result.reason).toMatch(/reaches purge, not destroy/);
  });

  it('refuses unknown codes with the list of known ones', () => {
    expect(() => checkSanitization({ mediaType: 'floppy' as MediaType, level: 'clear', technique: 'overwrite' })).toThrow(
      /unknown media type "floppy"/,
    );
    expect(() => checkSanitization({ mediaType: 'hdd_3_5', level: 'erase' as SanitizationLevel, technique: 'overwrite' })).toThrow(
      /unknown sanitization level/,
    );
    expect(() =>
      checkSanitization({ mediaType: 'hdd_3_5', level: 'clear', technique: 'magnet' as SanitizationTechnique }),
    ).toThrow(/unknown sanitization technique/);
  });
});

describe('techniquesMeeting', () => {
  it('lists what purges an SSD, and adds cryptographic erase when it is self-encrypting (Appendix A, from memory)', () => {
    expect(techniquesMeeting('ssd_m2_nvme', 'purge')).toEqual(['block_erase', 'shred', 'disintegrate', 'incinerate']);
    expect(techniquesMeeting('ssd_m2_nvme', 'purge', { selfEncrypting: true })).toEqual([
      'block_erase',
      'cryptographic_erase',
      'shred',
      'disintegrate',
      'incinerate',
    ]);
  });

  it('lists what clears a hard drive', () => {
    expect(techniquesMeeting('hdd_3_5', 'clear')).toEqual(['overwrite', 'degauss', 'shred', 'disintegrate', 'incinerate']);
  });
});

describe('equipment hazards', () => {
  it('warns about implants, magnetic media and tools near the degausser, and defers to the maker\'s manual', () => {
    const text = equipmentHazards.degausser.notes.join(' ');
    expect(text).toMatch(/pacemaker/);
    expect(text).toMatch(/implanted/);
    expect(text).toMatch(/steel tools/);
    expect(text).toMatch(/maker's manual/);
  });

  it('warns about pinching, flying fragments and eye protection at the crusher and shredder', () => {
    for (const equipment of ['crusher', 'shredder'] as const) {
      const text = `${equipmentHazards[equipment].title} ${equipmentHazards[equipment].notes.join(' ')}`;
      expect(text, equipment).toMatch(/pinch/i);
      expect(text, equipment).toMatch(/fragments/);
      expect(text, equipment).toMatch(/eye protection/);
      expect(text, equipment).toMatch(/maker's manual/);
    }
  });

  it('defers to the maker, local rules and licensed practice', () => {
    expect(equipmentHazardDeferral).toMatch(/maker's manual.*licensed practice/);
  });

  it('gives the notes of the machine a technique uses, and none for command-based erasure', () => {
    expect(hazardsForTechnique('degauss')).toBe(equipmentHazards.degausser);
    expect(hazardsForTechnique('crush')).toBe(equipmentHazards.crusher);
    expect(hazardsForTechnique('disintegrate')).toBe(equipmentHazards.shredder);
    expect(hazardsForTechnique('block_erase')).toBeNull();
  });
});
