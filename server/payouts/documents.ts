import PDFDocument from 'pdfkit';
import { formatBasisPoints } from '@shared/domain/commission';
import { formatMoney, fromMinorUnits } from '@shared/domain/money';
import { earningLineKindLabels, statementStatusLabels, type StatementDetailDto } from '@shared/schemas/money';

/*
 * A statement as a spreadsheet (CSV) and as a printable document (PDF). Both list every line with the
 * case it is about: its reference and a link to the case in the app, so a shop can reconcile each line
 * with its own ticket. Amounts are written with the currency's own minor-unit digits (USD 12.30, JPY 1200).
 */

const csvCell = (value: string | number | null) => {
  const text = value === null ? '' : String(value);
  // Quote when needed (RFC 4180), and keep a leading =, +, - or @ from being read as a formula.
  const safe = /^[=+\-@]/.test(text) && !/^-?\d+(\.\d+)?$/.test(text) ? `'${text}` : text;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};

export function statementFileName(s: StatementDetailDto, extension: 'csv' | 'pdf'): string {
  const org = s.organizationName.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'statement';
  return `platterpost-statement-${org}-${s.period}${s.currency === 'USD' ? '' : `-${s.currency.toLowerCase()}`}.${extension}`;
}

/** The case in the shop's portal (labs have no case page of that kind yet: their lines carry the reference only). */
function caseUrl(appUrl: string, s: StatementDetailDto, referralId: string): string | null {
  return s.payeeKind === 'partner' ? `${appUrl}/partner/cases/${referralId}` : null;
}

export function statementCsv(s: StatementDetailDto, appUrl: string): string {
  const header = ['date', 'case_reference', 'case_url', 'line', 'base', 'rate', 'amount', 'currency'];
  const rows: (string | number | null)[][] = s.lines.map((l) => [
    l.accruedAt.slice(0, 10),
    l.reference,
    caseUrl(appUrl, s, l.referralId),
    earningLineKindLabels[l.kind],
    l.baseMinor === null ? null : fromMinorUnits(l.baseMinor, s.currency),
    l.basisPoints === null ? null : formatBasisPoints(l.basisPoints),
    fromMinorUnits(l.amountMinor, s.currency),
    s.currency,
  ]);
  // The totals follow the lines, with no case: what was carried in, the total, the payout, what carries on.
  const summary: [string, number][] = [
    ['Carried in from earlier statements', s.openingCarryMinor],
    ['Statement total', s.totalMinor],
    ['Paid out', s.status === 'paid' ? s.payoutMinor : 0],
    ['Carried forward', s.carryForwardMinor],
  ];
  for (const [label, amount] of summary) rows.push([null, null, null, label, null, null, fromMinorUnits(amount, s.currency), s.currency]);
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}

export async function statementPdf(s: StatementDetailDto, appUrl: string): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'LETTER', margin: 48, info: { Title: `Platterpost statement ${s.period} — ${s.organizationName}` } });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const money = (minor: number) => formatMoney(minor, s.currency);
  const left = 48;
  const right = doc.page.width - 48;
  const width = right - left;

  doc.font('Helvetica-Bold').fontSize(9).fillColor('#2f6b5e').text('PLATTERPOST', left, 48);
  doc.fillColor('#1f2a30').font('Helvetica-Bold').fontSize(18).text(`Statement for ${s.period}`, left, 64);
  doc.font('Helvetica').fontSize(10).text(s.organizationName, left, 90);
  doc
    .fontSize(9)
    .fillColor('#5b666c')
    .text(
      `${s.payeeKind === 'partner' ? 'Commission on paid recoveries' : 'Lab share of paid recoveries'} · ${s.currency} · ${statementStatusLabels[s.status]}${s.transferId ? ` · transfer ${s.transferId}` : ''}`,
      left,
      104,
      { width },
    );

  const columns = [
    { label: 'Date', x: left, w: 62, align: 'left' as const },
    { label: 'Case', x: left + 64, w: 98, align: 'left' as const },
    { label: 'Line', x: left + 164, w: 120, align: 'left' as const },
    { label: 'Base', x: left + 286, w: 80, align: 'right' as const },
    { label: 'Rate', x: left + 368, w: 52, align: 'right' as const },
    { label: 'Amount', x: left + 422, w: width - 422, align: 'right' as const },
  ];
  let y = 132;
  const rule = () => doc.moveTo(left, y).lineTo(right, y).lineWidth(0.5).strokeColor('#e3ded3').stroke();
  const headerRow = () => {
    doc.font('Helvetica-Bold').fontSize(8).fillColor('#5b666c');
    for (const c of columns) doc.text(c.label, c.x, y, { width: c.w, align: c.align });
    y += 14;
    rule();
    y += 4;
  };
  headerRow();
  doc.font('Helvetica').fontSize(9).fillColor('#1f2a30');
  for (const l of s.lines) {
    if (y > doc.page.height - 120) {
      doc.addPage();
      y = 48;
      headerRow();
      doc.font('Helvetica').fontSize(9).fillColor('#1f2a30');
    }
    const cells = [
      l.accruedAt.slice(0, 10),
      l.reference,
      earningLineKindLabels[l.kind],
      l.baseMinor === null ? '' : money(l.baseMinor),
      l.basisPoints === null ? '' : formatBasisPoints(l.basisPoints),
      money(l.amountMinor),
    ];
    columns.forEach((c, i) => {
      // The case reference links to the case in the app.
      const url = i === 1 ? caseUrl(appUrl, s, l.referralId) : null;
      const link = url ? { link: url, underline: true } : {};
      doc.fillColor(url ? '#2f6b5e' : '#1f2a30').text(cells[i]!, c.x, y, { width: c.w, align: c.align, lineBreak: false, ...link });
    });
    y += 15;
  }
  if (s.lines.length === 0) {
    doc.fillColor('#5b666c').text('No lines this period.', left, y);
    y += 15;
  }
  y += 6;
  rule();
  y += 10;
  const totals: [string, number, boolean][] = [
    ['Lines', s.linesTotalMinor, false],
    ['Carried in from earlier statements', s.openingCarryMinor, false],
    ['Statement total', s.totalMinor, true],
    [s.status === 'paid' ? 'Paid out' : 'To be paid out', s.payoutMinor, true],
    ['Carried forward to the next statement', s.carryForwardMinor, false],
  ];
  for (const [label, amount, bold] of totals) {
    doc.font(bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(10).fillColor('#1f2a30');
    doc.text(label, left + 200, y, { width: 200 });
    doc.text(money(amount), left + 400, y, { width: width - 400, align: 'right' });
    y += 16;
  }
  y += 12;
  doc
    .font('Helvetica')
    .fontSize(8)
    .fillColor('#5b666c')
    .text(
      'Each line is one case; open its reference to see the case. A refund after a statement was paid appears as a negative line on the next one; a negative total pays nothing and is set against the following statement.',
      left,
      y,
      { width },
    );
  doc.end();
  return done;
}
