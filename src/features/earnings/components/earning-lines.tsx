import { formatBasisPoints } from '@shared/domain/commission';
import { formatMoney } from '@shared/domain/money';
import { earningLineKindLabels, type EarningLineDto } from '@shared/schemas/money';
import { TextLink } from '@/components/ui/link';
import { Table, type TableColumn } from '@/components/ui/table';
import { formatDate } from '@/lib/format';
import { usePayee } from '../payee';

const columnsFor = (caseHref: (id: string) => string): TableColumn<EarningLineDto>[] => [
  { header: 'Date', cell: (l) => formatDate(l.accruedAt, 'UTC'), className: 'whitespace-nowrap' },
  { header: 'Case', cell: (l) => <TextLink to={caseHref(l.referralId)}>{l.reference}</TextLink>, className: 'whitespace-nowrap' },
  { header: 'Line', cell: (l) => earningLineKindLabels[l.kind] },
  {
    header: 'Service lines',
    cell: (l) => (l.baseMinor === null ? '—' : `${formatMoney(l.baseMinor, l.currency)}${l.basisPoints === null ? '' : ` × ${formatBasisPoints(l.basisPoints)}`}`),
    className: 'text-right tabular-nums whitespace-nowrap',
  },
  { header: 'Amount', cell: (l) => formatMoney(l.amountMinor, l.currency), className: 'text-right tabular-nums font-semibold' },
  { header: 'Statement', cell: (l) => (l.statementId ? 'On a statement' : 'Not settled yet'), className: 'text-ink-muted' },
];

/** Earning lines, each linked to its case as the payee sees it. */
export function EarningLines({ lines, caption, empty }: { lines: EarningLineDto[]; caption: string; empty: string }) {
  const { words } = usePayee();
  return <Table caption={caption} columns={columnsFor(words.caseHref)} rows={lines} rowKey={(l) => l.id} empty={empty} />;
}
