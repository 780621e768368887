import PDFDocument from 'pdfkit';
import { custodyActionLabels } from '@shared/domain/custody-chain';
import type { CustodyEntryDto, CustodyStatement } from '@shared/schemas/custody';
import { mediaTypeLabels, type MediaType } from '@shared/vocabulary';

// The printed custody log of a legal-evidence case: every entry with its hashes, then the signed
// statement (head hash, entry count, time) with the signature and the public key to check it.

const INK = '#1f2a30';
const MUTED = '#5b666c';
const BRAND = '#2f6b5e';

/**
 * The PDF's built-in fonts speak WinAnsi only: typographic marks our labels use are written in their
 * plain forms, and anything else that font cannot show becomes "?" rather than a wrong glyph.
 */
export function pdfSafe(text: string): string {
  return text
    .replace(/[\u2032\u2033\u201c\u201d]/g, (c) => (c === '\u2032' ? "'" : '"'))
    .replace(/[\u2018\u2019]/g, "'")
    .replace(/[\u2013\u2014]/g, '-')
    .replace(/\u00a0|\u202f/g, ' ')
    .replace(/[^\u0020-\u007e\u00a1-\u00ff\n]/g, '?');
}

/** Collects a pdfkit document into one buffer. */
export function pdfBuffer(doc: PDFKit.PDFDocument): Promise<Buffer> {
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  return new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
}

/** "2026-03-04 14:05:12.345 UTC": custody times are written in UTC, with the milliseconds that were hashed. */
export function utcStamp(iso: string): string {
  return `${iso.replace('T', ' ').replace('Z', '')} UTC`;
}

function detailText(details: Record<string, unknown>): string {
  const parts = Object.entries(details).map(([key, value]) => `${key}: ${typeof value === 'string' ? value : JSON.stringify(value)}`);
  return parts.join('; ');
}

export interface CustodyPdfCase {
  reference: string;
  mediaType: string;
  device: string | null;
  serial: string | null;
  shop: string;
  lab: string | null;
}

export interface CustodyPdfInput {
  case: CustodyPdfCase;
  entries: readonly CustodyEntryDto[];
  statement: CustodyStatement;
  statementText: string;
  signature: string;
  keyId: string;
  publicKeyPem: string;
  developmentKey: boolean;
  exportedBy: string;
}

export async function custodyLogPdf(input: CustodyPdfInput): Promise<Buffer> {
  const { statement } = input;
  const doc = new PDFDocument({
    size: 'LETTER',
    margin: 48,
    info: { Title: `Custody log ${input.case.reference}`, Author: 'Platterpost', Subject: `Head SHA-256 ${statement.headHash}` },
  });
  const done = pdfBuffer(doc);
  const left = 48;
  const width = doc.page.width - 96;
  const bottom = doc.page.height - 60;
  const ensure = (height: number) => {
    if (doc.y + height > bottom) doc.addPage();
  };

  doc.font('Helvetica-Bold').fontSize(9).fillColor(BRAND).text('PLATTERPOST', left, 48);
  doc.fillColor(INK).font('Helvetica-Bold').fontSize(18).text(pdfSafe(`Chain of custody: case ${input.case.reference}`), left, 64);
  doc.moveDown(0.4);
  doc.font('Helvetica').fontSize(9).fillColor(MUTED);
  const mediaLabel = mediaTypeLabels[input.case.mediaType as MediaType] ?? input.case.mediaType;
  const facts: [string, string][] = [
    ['Device', [mediaLabel, input.case.device, input.case.serial ? `serial ${input.case.serial}` : null].filter(Boolean).join(', ')],
    ['Shop', input.case.shop],
    ['Lab holding the case', input.case.lab ?? 'none'],
    ['Exported', `${utcStamp(statement.exportedAt)} by ${input.exportedBy}`],
    ['Entries', String(statement.entryCount)],
  ];
  for (const [label, value] of facts) {
    doc.font('Helvetica-Bold').fillColor(INK).text(`${label}: `, { continued: true }).font('Helvetica').fillColor(INK).text(pdfSafe(value));
  }
  doc.moveDown(0.6);
  doc
    .fontSize(8)
    .fillColor(MUTED)
    .text(
      'Each entry\u2019s hash is the SHA-256 (FIPS 180-4) of the previous entry\u2019s hash followed by the entry\u2019s canonical JSON ' +
        '(sorted keys). Changing, removing or reordering any entry changes every hash after it, and the head hash below.',
      { width },
    );
  doc.moveDown(0.8);

  for (const entry of input.entries) {
    ensure(70);
    const top = doc.y;
    doc.moveTo(left, top - 4).lineTo(left + width, top - 4).strokeColor('#e3ded3').lineWidth(0.5).stroke();
    doc.font('Helvetica-Bold').fontSize(10).fillColor(INK).text(`${entry.sequence}. ${custodyActionLabels[entry.action]}`, left, top, { width: width * 0.55 });
    doc.font('Helvetica').fontSize(9).fillColor(MUTED).text(utcStamp(entry.at), left + width * 0.55, top, { width: width * 0.45, align: 'right' });
    doc.x = left;
    doc.fillColor(INK).fontSize(9);
    const who = entry.actor.id ? `${entry.actor.name} (${entry.actor.type} ${entry.actor.id})` : `${entry.actor.name} (${entry.actor.type})`;
    doc.text(pdfSafe(`By: ${who}`), left, doc.y, { width });
    doc.text(pdfSafe(`Where: ${entry.location ?? 'not recorded'}`), { width });
    const details = detailText(entry.details);
    if (details) doc.text(pdfSafe(`Details: ${details}`), { width });
    doc.font('Courier').fontSize(7).fillColor(MUTED);
    doc.text(`previous ${entry.previousHash ?? '(none: first entry)'}`, { width });
    doc.text(`hash     ${entry.hash}`, { width });
    doc.moveDown(0.9);
  }

  ensure(260);
  doc.moveDown(0.5);
  doc.font('Helvetica-Bold').fontSize(12).fillColor(INK).text('Signed statement', left, doc.y);
  doc.moveDown(0.3);
  doc
    .font('Helvetica')
    .fontSize(8.5)
    .fillColor(MUTED)
    .text(
      'Platterpost signs the lines below (UTF-8, each ending in a line feed) with Ed25519 (RFC 8032). Anyone holding the public key ' +
        'can check that this head hash and entry count were issued by Platterpost at the time shown.',
      { width },
    );
  doc.moveDown(0.4);
  doc.font('Courier').fontSize(8).fillColor(INK).text(input.statementText.trimEnd(), { width });
  doc.moveDown(0.6);
  doc.font('Helvetica-Bold').fontSize(9).text('Head hash (SHA-256)');
  doc.font('Courier').fontSize(8).text(statement.headHash, { width });
  doc.moveDown(0.3);
  doc.font('Helvetica-Bold').fontSize(9).text('Signature (Ed25519, base64)');
  doc.font('Courier').fontSize(8).text(input.signature, { width });
  doc.moveDown(0.3);
  doc.font('Helvetica-Bold').fontSize(9).text(`Public key (id ${input.keyId})`);
  doc.font('Courier').fontSize(7).text(input.publicKeyPem.trim(), { width });
  if (input.developmentKey) {
    doc.moveDown(0.4);
    doc.font('Helvetica-Bold').fontSize(8.5).fillColor('#b3261e').text('Signed with a development key: not valid as evidence.', { width });
  }
  doc.end();
  return done;
}
