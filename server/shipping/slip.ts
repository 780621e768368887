import bwipjs from 'bwip-js/node';
import PDFDocument from 'pdfkit';
import QRCode from 'qrcode';
import { DEFER_TO_CARRIER } from '@shared/domain/battery';
import { packingRules, PACKING_RULES_SOURCE } from '@shared/domain/box-presets';
import { ssccElementString } from '@shared/domain/sscc';

// The packing slip that goes on (or in) the box: 4 × 6 in like the label, with the case reference as a
// Code 128 barcode and a QR code, where the box goes, the packing rules, the battery mark text where one
// applies and the box's SSCC-18 as GS1-128. Our own layout.

export const SLIP_WIDTH_PT = 4 * 72;
export const SLIP_HEIGHT_PT = 6 * 72;

export interface SlipContent {
  reference: string;
  title: string;
  shipTo: { name: string; lines: string[] };
  from: { name: string; lines: string[] };
  device: string;
  trackingCode: string | null;
  carrierService: string | null;
  batteryMarkText: string | null;
  batteryCaution: string | null;
  sscc: string | null;
  signatureRequired: boolean;
  declaredValue: string | null;
}

/** What each barcode on the slip encodes, so that a check can draw them again with bwip-js. */
export function slipBarcodes(content: Pick<SlipContent, 'reference' | 'sscc'>) {
  return {
    reference: { bcid: 'code128', text: content.reference },
    sscc: content.sscc ? { bcid: 'gs1-128', text: ssccElementString(content.sscc) } : null,
  } as const;
}

export async function packingSlipPdf(content: SlipContent): Promise<Buffer> {
  const codes = slipBarcodes(content);
  const referencePng = await bwipjs.toBuffer({ bcid: codes.reference.bcid, text: codes.reference.text, scale: 3, height: 12, includetext: false, backgroundcolor: 'FFFFFF' });
  const ssccPng = codes.sscc
    ? await bwipjs.toBuffer({ bcid: codes.sscc.bcid, text: codes.sscc.text, scale: 2, height: 10, includetext: true, textsize: 8, backgroundcolor: 'FFFFFF' })
    : null;
  const qrPng = await QRCode.toBuffer(content.reference, { errorCorrectionLevel: 'M', margin: 1, scale: 4 });

  const doc = new PDFDocument({ size: [SLIP_WIDTH_PT, SLIP_HEIGHT_PT], margin: 12, info: { Title: `Packing slip ${content.reference}` } });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const left = 12;
  const width = SLIP_WIDTH_PT - 24;
  doc.font('Helvetica-Bold').fontSize(8).fillColor('#2f6b5e').text('PLATTERPOST', left, 12);
  doc.fillColor('black').font('Helvetica').fontSize(7).text(content.title, left, 22);
  doc.font('Helvetica-Bold').fontSize(18).text(content.reference, left, 32, { width: width - 70 });
  doc.image(referencePng, left, 56, { fit: [width - 74, 34] });
  doc.image(qrPng, SLIP_WIDTH_PT - 12 - 66, 12, { fit: [66, 66] });

  let y = 96;
  const heading = (text: string) => {
    doc.font('Helvetica-Bold').fontSize(7).text(text, left, y, { width });
    y = doc.y + 1;
  };
  const body = (text: string, size = 7.5) => {
    doc.font('Helvetica').fontSize(size).text(text, left, y, { width });
    y = doc.y + 3;
  };

  heading('SHIP TO (RECEIVING)');
  doc.font('Helvetica-Bold').fontSize(9).text([content.shipTo.name, ...content.shipTo.lines].join('\n'), left, y, { width });
  y = doc.y + 3;
  heading('FROM');
  body([content.from.name, ...content.from.lines].join(', '));
  heading('CONTENTS');
  body(content.device);
  if (content.trackingCode) body(`Tracking ${content.trackingCode}${content.carrierService ? ` (${content.carrierService})` : ''}`);
  if (content.signatureRequired || content.declaredValue) {
    body([content.signatureRequired ? 'Signature required on delivery.' : null, content.declaredValue ? `Declared value ${content.declaredValue}.` : null].filter(Boolean).join(' '));
  }

  if (content.batteryMarkText) {
    const boxTop = y + 2;
    doc.rect(left, boxTop, width, 30).lineWidth(1.2).strokeColor('#b3261e').stroke();
    doc.strokeColor('black');
    doc.font('Helvetica-Bold').fontSize(8).fillColor('#b3261e').text(content.batteryMarkText, left + 6, boxTop + 5, { width: width - 12 });
    doc.fillColor('black').font('Helvetica').fontSize(6).text('Put the lithium battery mark on the outside of the box.', left + 6, boxTop + 19, { width: width - 12 });
    y = boxTop + 34;
  }
  if (content.batteryCaution) body(content.batteryCaution, 6.5);

  heading('PACKING RULES');
  body(packingRules.map((r) => `• ${r}`).join('\n'), 6.5);
  body(`${PACKING_RULES_SOURCE} ${content.batteryMarkText ? DEFER_TO_CARRIER : ''}`.trim(), 5.5);

  if (ssccPng && content.sscc) {
    doc.image(ssccPng, left, SLIP_HEIGHT_PT - 12 - 44, { fit: [width, 44], align: 'center' });
  }
  doc.end();
  return done;
}
