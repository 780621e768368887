// Listed by hand, oldest first: migrations are reviewed code, not a folder glob.
import { Foundation1764633600000 } from './1764633600000-foundation';
import { ReferralsAndRouting1764979200000 } from './1764979200000-referrals-and-routing';
import { PartnerApi1764892800000 } from './1764892800000-partner-api';
import { ReferralPhotos1765065600000 } from './1765065600000-referral-photos';
import { PartnerWebhooks1765152000000 } from './1765152000000-partner-webhooks';
import { LabWork1765584000000 } from './1765584000000-lab-work';
import { CustodyAndDisposition1765756800000 } from './1765756800000-custody-and-disposition';
import { Shipping1765238400000 } from './1765238400000-shipping';
import { LedgerAndCommissions1765411200000 } from './1765411200000-ledger-and-commissions';
import { LabDirectoryVersion1765843200000 } from './1765843200000-lab-directory-version';
import { DeferredSnapshotLink1765929600000 } from './1765929600000-deferred-snapshot-link';
import { RecipientDirectoryVersion1766016000000 } from './1766016000000-recipient-directory-version';
import { Lz4Compression1766102400000 } from './1766102400000-lz4-compression';

export const migrations = [Foundation1764633600000, PartnerApi1764892800000, ReferralsAndRouting1764979200000, ReferralPhotos1765065600000, PartnerWebhooks1765152000000, Shipping1765238400000, LedgerAndCommissions1765411200000, LabWork1765584000000, CustodyAndDisposition1765756800000, LabDirectoryVersion1765843200000, DeferredSnapshotLink1765929600000, RecipientDirectoryVersion1766016000000, Lz4Compression1766102400000];
