// Sanitizing the customer's original media after recovery, by NIST SP 800-88 Rev. 1 ("Guidelines for
// Media Sanitization", December 2014), Appendix A, read from memory. Appendix A has one table per media
// kind with a Clear, a Purge and a Destroy row; the rows below restate it per media type of our
// vocabulary, each with its reason. Where Appendix A says nothing for a case, the row says so and gives
// our own reading or common practice. (NIST later issued Rev. 2, which moves the per-media techniques
// to IEEE 2883; Rev. 1 Appendix A is what the lab's certificates cite today.)

import { mediaTypeLabels, mediaTypes, type MediaType } from '../vocabulary';

/** Clear < purge < destroy: each level also meets the ones before it. */
export const sanitizationLevels = ['clear', 'purge', 'destroy'] as const;
export type SanitizationLevel = (typeof sanitizationLevels)[number];

export const sanitizationLevelLabels: Record<SanitizationLevel, string> = {
  clear: 'Clear',
  purge: 'Purge',
  destroy: 'Destroy',
};

export const sanitizationTechniques = [
  'overwrite',
  'block_erase',
  'cryptographic_erase',
  'degauss',
  'shred',
  'crush',
  'disintegrate',
  'incinerate',
] as const;
export type SanitizationTechnique = (typeof sanitizationTechniques)[number];

export const sanitizationTechniqueLabels: Record<SanitizationTechnique, string> = {
  overwrite: 'Overwrite',
  block_erase: 'Block erase',
  cryptographic_erase: 'Cryptographic erase',
  degauss: 'Degauss',
  shred: 'Shred',
  crush: 'Crush',
  disintegrate: 'Disintegrate',
  incinerate: 'Incinerate',
};

/** Facts about the device that change what a technique achieves; the technician confirms them. */
export type SanitizationCondition = 'self_encrypting' | 'drive_command';

export interface SanitizationRule {
  /** Level reached when the condition (if any) holds; null when the technique does not sanitize this media. */
  achieves: SanitizationLevel | null;
  /**
   * `self_encrypting`: the device encrypts all stored data itself and the erase destroys its key.
   * `drive_command`: the overwrite is run by the drive's own sanitize or secure-erase command,
   * not written sector by sector from the host.
   */
  requires?: SanitizationCondition;
  /** Level reached when `requires` does not hold; null (the default) refuses it. */
  otherwise?: SanitizationLevel | null;
  reason: string;
  /** What the technician must know before doing it. */
  caution?: string;
}

export type MediaSanitizationRules = Record<SanitizationTechnique, SanitizationRule>;

const destroyReason =
  'Appendix A: Destroy by shredding, disintegrating, pulverizing, or incinerating in a licensed incinerator.';

const crushRefusedMagnetic: SanitizationRule = {
  achieves: null,
  reason:
    'Appendix A does not list crushing for Destroy; NIST warns that bending, cutting or punching may leave parts of the ' +
    'platters readable with laboratory techniques. Crushing after a purge (such as degaussing) is common practice to ' +
    'show the drive is out of service: record the purge as the sanitization, or shred or disintegrate instead.',
};

const crushRefusedFlash: SanitizationRule = {
  achieves: null,
  reason:
    'Appendix A does not list crushing for Destroy; a crushed board can leave memory chips whole, and a whole chip ' +
    'can be read off the board (chip-off recovery, our own trade). Shred, disintegrate or incinerate instead.',
};

const flashParticleCaution =
  'Flash chips are small: the shredder or disintegrator must cut every memory chip, not just the board; check its ' +
  'particle size with the maker.';

const noDegaussFlash: SanitizationRule = {
  achieves: null,
  reason:
    'Flash memory stores data as electric charge, not magnetism: a degausser leaves it readable. Appendix A gives no ' +
    'degaussing method for flash media.',
};

const batteryCaution =
  'Remove the lithium battery first (or confirm it is out): a cut or burnt cell can catch fire in the machine.';

function destroyRules(extra: { caution?: string; crush: SanitizationRule }): Pick<
  MediaSanitizationRules,
  'shred' | 'disintegrate' | 'incinerate' | 'crush'
> {
  return {
    shred: { achieves: 'destroy', reason: destroyReason, caution: extra.caution },
    disintegrate: { achieves: 'destroy', reason: destroyReason, caution: extra.caution },
    incinerate: {
      achieves: 'destroy',
      reason: `${destroyReason} Only a licensed incinerator counts; the lab does not burn media itself.`,
      caution: extra.caution,
    },
    crush: extra.crush,
  };
}

const hardDiskRules: MediaSanitizationRules = {
  overwrite: {
    achieves: 'purge',
    requires: 'drive_command',
    otherwise: 'clear',
    reason:
      'Appendix A (ATA and SCSI hard drives): Clear by overwriting every user-addressable sector, at least one pass of a ' +
      'fixed value such as zeros. Purge by overwrite only through the drive\'s own command (ATA SANITIZE OVERWRITE EXT, ' +
      'ATA SECURITY ERASE UNIT, SCSI SANITIZE OVERWRITE), which also reaches sectors the drive has remapped.',
  },
  block_erase: {
    achieves: null,
    reason: 'Block erase is a flash-memory command; a magnetic hard drive has nothing to block-erase. Overwrite or degauss it.',
  },
  cryptographic_erase: {
    achieves: 'purge',
    requires: 'self_encrypting',
    reason:
      'Appendix A: Purge by cryptographic erase (ATA CRYPTO SCRAMBLE EXT, TCG Opal or Enterprise) only on a ' +
      'self-encrypting drive, where destroying the media key leaves nothing but ciphertext. A drive that does not encrypt ' +
      'internally has no key to destroy.',
  },
  degauss: {
    achieves: 'purge',
    reason:
      'Appendix A: Purge by degaussing in a degausser rated for the drive\'s coercivity (magnetic media only).',
    caution:
      'Degaussing also erases the servo tracks of a modern (high-coercivity) drive, so the drive is unusable afterwards; ' +
      'degauss only a drive released for disposal, never one the customer wants back.',
  },
  ...destroyRules({ crush: crushRefusedMagnetic }),
};

function solidStateRules(kind: string): MediaSanitizationRules {
  return {
    overwrite: {
      achieves: 'clear',
      reason:
        `Appendix A (${kind}): overwriting through the host interface is Clear at best: over-provisioned spare area and ` +
        'wear levelling keep old copies of data in blocks the host cannot address. Use block erase or cryptographic ' +
        'erase to purge.',
    },
    block_erase: {
      achieves: 'purge',
      reason:
        `Appendix A (${kind}): Purge by the drive's own block erase (ATA SANITIZE BLOCK ERASE EXT, NVMe Sanitize Block ` +
        'Erase, or NVMe Format with user-data erase), which erases every block including spare area.',
      caution: 'Some firmware implements these commands badly: read the drive back afterwards to verify.',
    },
    cryptographic_erase: {
      achieves: 'purge',
      requires: 'self_encrypting',
      reason:
        `Appendix A (${kind}): Purge by cryptographic erase (ATA CRYPTO SCRAMBLE EXT, NVMe Sanitize Crypto Erase or ` +
        'Format with crypto erase, TCG Opal) only where the drive encrypted all stored data itself and the erase ' +
        'destroys that key.',
    },
    degauss: noDegaussFlash,
    ...destroyRules({ caution: flashParticleCaution, crush: crushRefusedFlash }),
  };
}

function removableFlashRules(kind: string, selfEncryptingPossible: boolean): MediaSanitizationRules {
  return {
    overwrite: {
      achieves: 'clear',
      reason:
        `Appendix A (${kind}): Clear by overwriting the whole device; the controller's wear levelling hides old blocks, ` +
        'so overwriting never reaches Purge.',
    },
    block_erase: {
      achieves: null,
      reason: `Appendix A (${kind}): these devices expose no sanitize or block erase command to the host; Purge is "see Destroy".`,
    },
    cryptographic_erase: selfEncryptingPossible
      ? {
          achieves: 'purge',
          requires: 'self_encrypting',
          reason:
            `Purge by cryptographic erase only on a hardware-encrypting ${kind} whose own controller destroys the key; ` +
            'ordinary sticks do not encrypt (our reading of Appendix A\'s general cryptographic-erase rule).',
        }
      : {
          achieves: null,
          reason: `Appendix A (${kind}): no cryptographic erase is available; Purge is "see Destroy".`,
        },
    degauss: noDegaussFlash,
    ...destroyRules({ caution: flashParticleCaution, crush: crushRefusedFlash }),
  };
}

const mobileDeviceRules: MediaSanitizationRules = {
  overwrite: {
    achieves: null,
    reason:
      'A phone or tablet does not expose its storage to the lab as a drive to overwrite; Appendix A uses the device\'s ' +
      'own erase (a cryptographic erase on encrypted devices) or Destroy.',
  },
  block_erase: {
    achieves: null,
    reason: 'Phones and tablets expose no block erase command to the lab; use the device\'s own erase or Destroy.',
  },
  cryptographic_erase: {
    achieves: 'purge',
    requires: 'self_encrypting',
    otherwise: 'clear',
    reason:
      'Appendix A (mobile devices): the built-in erase ("Erase All Content and Settings", a factory reset) purges when ' +
      'the device encrypts its storage, because the reset destroys the key; on a device without storage encryption the ' +
      'same reset only clears.',
  },
  degauss: {
    ...noDegaussFlash,
    caution: 'A degausser can also damage the speaker, camera and other magnetic parts without touching the data.',
  },
  ...destroyRules({ caution: `${batteryCaution} ${flashParticleCaution}`, crush: crushRefusedFlash }),
};

const raidRules: MediaSanitizationRules = {
  overwrite: {
    achieves: 'clear',
    reason:
      'A RAID or NAS is sanitized member by member. Overwriting every member in full is Clear whether the members are ' +
      'hard drives or SSDs; for Purge, take the members out and record each under its own media type.',
  },
  block_erase: {
    achieves: null,
    reason:
      'Array controllers do not pass block erase through to their members; take the members out and sanitize each SSD ' +
      'as its own media type.',
  },
  cryptographic_erase: {
    achieves: 'purge',
    requires: 'self_encrypting',
    reason:
      'Purge by cryptographic erase only when every member is a self-encrypting drive and each one\'s key is destroyed. ' +
      'Software volume encryption on the NAS does not count: the lab cannot show every copy of that key is gone.',
  },
  degauss: {
    achieves: null,
    reason:
      'Members may be SSDs, which a degausser does not sanitize; degauss only members identified as hard drives and ' +
      'record each under its own media type.',
  },
  ...destroyRules({ caution: 'Destroy every member drive, and the NAS\'s own boot flash if it has one.', crush: crushRefusedMagnetic }),
};

const tapeRules: MediaSanitizationRules = {
  overwrite: {
    achieves: 'clear',
    reason: 'Appendix A (magnetic tape): Clear by re-recording (overwriting) the whole tape with non-sensitive data.',
  },
  block_erase: { achieves: null, reason: 'Block erase is a flash-memory command; tape has nothing to block-erase.' },
  cryptographic_erase: {
    achieves: null,
    reason:
      'Appendix A gives no cryptographic erase for tape; tape-drive encryption keeps its keys outside the cartridge, so ' +
      'deleting them is key management the lab cannot verify on the media.',
  },
  degauss: {
    achieves: 'purge',
    reason: 'Appendix A (magnetic tape): Purge by degaussing in a degausser rated for the tape\'s coercivity.',
    caution:
      'Cartridges with factory-written servo tracks (LTO and similar) are unusable after degaussing (common practice).',
  },
  shred: { achieves: 'destroy', reason: 'Appendix A (magnetic tape): Destroy by shredding or by a licensed incinerator.' },
  disintegrate: {
    achieves: 'destroy',
    reason:
      'Appendix A names shredding and incineration for tape; disintegration cuts finer than shredding, so it reaches the ' +
      'same result (our reading).',
  },
  incinerate: { achieves: 'destroy', reason: 'Appendix A (magnetic tape): Destroy by burning in a licensed incinerator.' },
  crush: {
    achieves: null,
    reason: 'Crushing a cartridge leaves the wound tape readable; Appendix A destroys tape by shredding or incineration.',
  },
};

const unknownMediaRefusal: SanitizationRule = {
  achieves: null,
  reason:
    'The media type is unknown, so Appendix A gives no Clear or Purge method to check against; record the media under ' +
    'its real type first, or destroy it.',
};

const otherRules: MediaSanitizationRules = {
  overwrite: unknownMediaRefusal,
  block_erase: unknownMediaRefusal,
  cryptographic_erase: unknownMediaRefusal,
  degauss: unknownMediaRefusal,
  ...destroyRules({
    caution: `Check what the device holds before it goes in: ${batteryCaution}`,
    crush: {
      achieves: null,
      reason: 'Appendix A does not list crushing for Destroy, and for unknown media nothing shows that crushing reaches every part that stores data.',
    },
  }),
};

/** What each technique achieves on each media type of the vocabulary (NIST SP 800-88 Rev. 1, Appendix A, from memory). */
export const sanitizationRules: Record<MediaType, MediaSanitizationRules> = {
  hdd_3_5: hardDiskRules,
  hdd_2_5: hardDiskRules,
  ssd_sata: solidStateRules('ATA solid state drives'),
  ssd_m2_nvme: solidStateRules('NVMe solid state drives'),
  usb_flash: removableFlashRules('USB flash drive', true),
  memory_card: removableFlashRules('memory card', false),
  phone: mobileDeviceRules,
  tablet: mobileDeviceRules,
  raid_nas: raidRules,
  tape: tapeRules,
  other: otherRules,
};

export interface SanitizationRequest {
  mediaType: MediaType;
  level: SanitizationLevel;
  technique: SanitizationTechnique;
  /** The technician has confirmed the device encrypts all stored data itself (SED, encrypted phone). */
  selfEncrypting?: boolean;
  /** The overwrite runs as the drive's own sanitize or secure-erase command. */
  driveCommand?: boolean;
}

export type SanitizationCheck =
  | { ok: true; achieves: SanitizationLevel; reason: string; caution?: string }
  | { ok: false; reason: string };

const levelRank: Record<SanitizationLevel, number> = { clear: 1, purge: 2, destroy: 3 };

function conditionHolds(condition: SanitizationCondition, request: SanitizationRequest): boolean {
  return condition === 'self_encrypting' ? request.selfEncrypting === true : request.driveCommand === true;
}

const conditionWording: Record<SanitizationCondition, string> = {
  self_encrypting: 'the device is confirmed self-encrypting',
  drive_command: "it runs as the drive's own sanitize or secure-erase command",
};

/** Level a technique reaches on a media type under the given conditions; null when it does not sanitize it. */
export function achievedLevel(
  mediaType: MediaType,
  technique: SanitizationTechnique,
  conditions: Pick<SanitizationRequest, 'selfEncrypting' | 'driveCommand'> = {},
): SanitizationLevel | null {
  const rule = ruleFor(mediaType, technique);
  if (rule.requires && !conditionHolds(rule.requires, { mediaType, technique, level: 'clear', ...conditions })) {
    return rule.otherwise ?? null;
  }
  return rule.achieves;
}

function ruleFor(mediaType: MediaType, technique: SanitizationTechnique): SanitizationRule {
  if (!(mediaTypes as readonly string[]).includes(mediaType)) {
    throw new RangeError(`unknown media type "${String(mediaType)}"; expected one of: ${mediaTypes.join(', ')}`);
  }
  if (!(sanitizationTechniques as readonly string[]).includes(technique)) {
    throw new RangeError(
      `unknown sanitization technique "${String(technique)}"; expected one of: ${sanitizationTechniques.join(', ')}`,
    );
  }
  return sanitizationRules[mediaType][technique];
}

/** Whether a technique meets the requested level on this media, with the reason either way. */
export function checkSanitization(request: SanitizationRequest): SanitizationCheck {
  const { mediaType, level, technique } = request;
  if (!(sanitizationLevels as readonly string[]).includes(level)) {
    throw new RangeError(`unknown sanitization level "${String(level)}"; expected one of: ${sanitizationLevels.join(', ')}`);
  }
  const rule = ruleFor(mediaType, technique);
  const achieves = achievedLevel(mediaType, technique, request);
  const what = `${sanitizationTechniqueLabels[technique]} on ${mediaType} (${mediaTypeLabels[mediaType]})`;

  if (achieves === null) {
    const unmet = rule.requires && rule.achieves !== null ? ` It counts only when ${conditionWording[rule.requires]}.` : '';
    return { ok: false, reason: `${what} does not sanitize this media.${unmet} ${rule.reason}` };
  }
  if (levelRank[achieves] < levelRank[level]) {
    const unmet =
      rule.requires && rule.achieves !== null && levelRank[rule.achieves] >= levelRank[level]
        ? ` It reaches ${rule.achieves} only when ${conditionWording[rule.requires]}.`
        : '';
    return { ok: false, reason: `${what} reaches ${achieves}, not ${level}.${unmet} ${rule.reason}` };
  }
  return { ok: true, achieves, reason: rule.reason, ...(rule.caution ? { caution: rule.caution } : {}) };
}

/** Techniques that meet `level` on this media under the given conditions, in vocabulary order. */
export function techniquesMeeting(
  mediaType: MediaType,
  level: SanitizationLevel,
  conditions: Pick<SanitizationRequest, 'selfEncrypting' | 'driveCommand'> = {},
): SanitizationTechnique[] {
  return sanitizationTechniques.filter((technique) => {
    const achieves = achievedLevel(mediaType, technique, conditions);
    return achieves !== null && levelRank[achieves] >= levelRank[level];
  });
}

// Hazard notes for the lab's own sanitization equipment: shown beside the step, not a substitute for training.

export const sanitizationEquipment = ['degausser', 'crusher', 'shredder'] as const;
export type SanitizationEquipment = (typeof sanitizationEquipment)[number];

export interface EquipmentHazard {
  title: string;
  notes: string[];
}

export const equipmentHazardDeferral =
  "These are general notes. The equipment maker's manual, local workplace-safety rules and licensed practice decide.";

export const equipmentHazards: Record<SanitizationEquipment, EquipmentHazard> = {
  degausser: {
    title: 'Degausser: strong magnetic field',
    notes: [
      'Anyone with a pacemaker, implanted defibrillator, insulin pump or other implanted or worn medical device stays out of the exclusion zone the maker gives while the degausser runs.',
      'Keep media you mean to keep (customer drives, donor drives, tapes, cards with magnetic stripes) and steel tools away from it; loose steel can be pulled in.',
      'It makes a modern hard drive unusable: load only media released for disposal.',
      "Follow the maker's manual for the rated coercivity, duty cycle and safety distances.",
    ],
  },
  crusher: {
    title: 'Crusher: pinch and crush hazard',
    notes: [
      'Keep hands out of the press area; use the guards and two-hand controls it has, and never bypass an interlock.',
      'Glass platters shatter and housings crack: wear eye protection and keep the guard closed; fragments can fly.',
      'Never crush a device that still holds a lithium battery.',
      "Follow the maker's manual.",
    ],
  },
  shredder: {
    title: 'Shredder or disintegrator: in-feed and flying fragments',
    notes: [
      'In-feed pinch and entanglement hazard: no loose sleeves, ties, jewellery or long hair near the feed; use the feed chute, never push media in by hand, and lock the machine out before clearing a jam.',
      'Wear eye protection, and hearing protection where the maker calls for it; fragments can fly.',
      'Remove lithium batteries first: a cut cell can ignite inside the machine.',
      "Follow the maker's manual.",
    ],
  },
};

const equipmentForTechnique: Partial<Record<SanitizationTechnique, SanitizationEquipment>> = {
  degauss: 'degausser',
  crush: 'crusher',
  shred: 'shredder',
  disintegrate: 'shredder',
};

/** Hazard notes for the machine a technique uses in the lab; none for command-based erasure or off-site incineration. */
export function hazardsForTechnique(technique: SanitizationTechnique): EquipmentHazard | null {
  const equipment = equipmentForTechnique[technique];
  return equipment ? equipmentHazards[equipment] : null;
}
