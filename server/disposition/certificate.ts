import PDFDocument from 'pdfkit';
import { equipmentHazardDeferral, sanitizationLevelLabels, sanitizationTechniqueLabels } from '@shared/domain/sanitization';
import { dispositionItemLabels, verificationMethodLabels } from '@shared/schemas/disposition';
import { mediaTypeLabels } from '@shared/vocabulary';
import { pdfBuffer, pdfSafe, utcStamp } from '../custody';
import type { MediaDisposition } from './entities';

// The certificate of sanitization, laid out after the sample certificate in NIST SP 800-88 Rev. 1
// Appendix G (from memory): who sanitized, the media, the method and tool, how it was verified, where
// the media went. Our own wording and look.

const INK = '#1f2a30';
const MUTED = '#5b666c';
const BRAND = '#2f6b5e';

export interface CertificateContent {
  number: string;
  issuedAt: Date;
  disposition: MediaDisposition;
  caseReference: string;
  shopName: string;
  lab: { name: string; place: string; phone: string | null; email: string | null };
  technician: { name: string; roleLabel: string };
  custody: { sequence: number; hash: string };
}

export async function certificatePdf(c: CertificateContent): Promise<Buffer> {
  const d = c.disposition;
  const doc = new PDFDocument({ size: 'LETTER', margin: 54, info: { Title: `Certificate of sanitization ${c.number}`, Author: c.lab.name } });
  const done = pdfBuffer(doc);
  const left = 54;
  const width = doc.page.width - 108;

  doc.font('Helvetica-Bold').fontSize(9).fillColor(BRAND).text('PLATTERPOST', left, 54);
  doc.fillColor(INK).font('Helvetica-Bold').fontSize(20).text('Certificate of Sanitization', left, 70);
  doc.font('Helvetica').fontSize(10).fillColor(MUTED).text(pdfSafe(`Certificate ${c.number} \u00b7 issued ${utcStamp(c.issuedAt.toISOString())}`));
  doc.moveDown(1);

  const section = (title: string, rows: [string, string | null | undefined][]) => {
    if (doc.y > doc.page.height - 160) doc.addPage();
    doc.font('Helvetica-Bold').fontSize(11).fillColor(BRAND).text(title.toUpperCase(), left, doc.y, { characterSpacing: 0.6 });
    doc.moveTo(left, doc.y + 2).lineTo(left + width, doc.y + 2).strokeColor('#e3ded3').lineWidth(0.6).stroke();
    doc.moveDown(0.5);
    for (const [label, value] of rows) {
      if (value === null || value === undefined || value === '') continue;
      const y = doc.y;
      doc.font('Helvetica-Bold').fontSize(9).fillColor(MUTED).text(label, left, y, { width: 150 });
      const labelBottom = doc.y;
      doc.font('Helvetica').fontSize(9.5).fillColor(INK).text(pdfSafe(value), left + 160, y, { width: width - 160 });
      doc.y = Math.max(doc.y, labelBottom) + 3;
    }
    doc.moveDown(0.8);
  };

  section('Person performing sanitization', [
    ['Name', c.technician.name],
    ['Role', c.technician.roleLabel],
    ['Organisation', c.lab.name],
    ['Location', c.lab.place],
    ['Contact', [c.lab.phone, c.lab.email].filter(Boolean).join(' \u00b7 ') || null],
  ]);
  section('Media', [
    ['Item', dispositionItemLabels[d.item]],
    ['Description', d.description],
    ['Media type', mediaTypeLabels[d.mediaType]],
    ['Serial number', d.serialNumber ?? 'not recorded'],
    ['Source', `Case ${c.caseReference}, referred by ${c.shopName}`],
  ]);
  section('Sanitization', [
    ['Level (NIST SP 800-88)', d.level ? sanitizationLevelLabels[d.level] : null],
    ['Technique', d.technique ? sanitizationTechniqueLabels[d.technique] : null],
    ['Technique details', d.techniqueDetails],
    [
      'Conditions confirmed',
      [d.selfEncrypting ? 'the device encrypts all stored data itself' : null, d.driveCommand ? "run as the drive's own sanitize command" : null]
        .filter(Boolean)
        .join('; ') || null,
    ],
    ['Tool', [d.toolName, d.toolVersion ? `version ${d.toolVersion}` : null, d.toolSerialNumber ? `serial ${d.toolSerialNumber}` : null].filter(Boolean).join(', ')],
    ['Basis', d.basis],
    ['Performed', utcStamp(d.performedAt.toISOString())],
  ]);
  section('Verification', [
    ['Method', d.verificationMethod ? verificationMethodLabels[d.verificationMethod] : null],
    ['Result', 'Passed'],
    ['Notes', d.verificationNote],
  ]);
  section('Afterwards', [
    ['Media destination', d.destination ?? 'not recorded'],
    ['Notes', d.note],
    ['Custody log', `Entry ${c.custody.sequence}, SHA-256 ${c.custody.hash}`],
  ]);

  doc.moveDown(0.5);
  doc.font('Helvetica').fontSize(9.5).fillColor(INK).text(pdfSafe(`Recorded by ${c.technician.name} for ${c.lab.name}.`), left, doc.y, { width });
  doc.moveDown(1.2);
  doc
    .fontSize(7.5)
    .fillColor(MUTED)
    .text(
      pdfSafe(
        'Levels and techniques follow NIST SP 800-88 Rev. 1, Guidelines for Media Sanitization (2014), Appendix A, as Platterpost\u2019s ' +
          'rules restate it per media type. The custody entry above is part of the case\u2019s SHA-256 hash chain; the case page shows whether ' +
          `the chain is intact. ${equipmentHazardDeferral}`,
      ),
      { width },
    );
  doc.end();
  return done;
}
