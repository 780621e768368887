import bwipjs from 'bwip-js/node';
import PDFDocument from 'pdfkit';

export interface LabelAddress {
  name?: string | null;
  company?: string | null;
  street1?: string | null;
  street2?: string | null;
  city?: string | null;
  state?: string | null;
  zip?: string | null;
}

export interface LabelContent {
  carrier: string;
  service: string;
  trackingCode: string;
  from: LabelAddress;
  to: LabelAddress;
  billableLb: number;
  zone: number;
  shipDate: string;
  reference?: string | null;
}

/** A 4 × 6 in label: 72 PDF points per inch. */
export const LABEL_WIDTH_PT = 4 * 72;
export const LABEL_HEIGHT_PT = 6 * 72;

/** Code 128 barcode of the tracking code with the code printed under it, as a PNG. */
export function trackingBarcodePng(trackingCode: string): Promise<Buffer> {
  return bwipjs.toBuffer({
    bcid: 'code128',
    text: trackingCode,
    scale: 3,
    height: 18,
    includetext: true,
    textxalign: 'center',
    paddingwidth: 8,
    paddingheight: 6,
    backgroundcolor: 'FFFFFF',
  });
}

function addressLines(a: LabelAddress): string[] {
  const cityLine = [a.city, [a.state, a.zip].filter(Boolean).join(' ')].filter(Boolean).join(', ');
  return [a.name, a.company, a.street1, a.street2, cityLine].filter((line): line is string => Boolean(line && line.trim()));
}

export async function labelPdf(content: LabelContent): Promise<Buffer> {
  const barcode = await trackingBarcodePng(content.trackingCode);
  const doc = new PDFDocument({ size: [LABEL_WIDTH_PT, LABEL_HEIGHT_PT], margin: 14, info: { Title: `Label ${content.trackingCode}` } });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const left = 14;
  const width = LABEL_WIDTH_PT - 28;

  doc.rect(6, 6, LABEL_WIDTH_PT - 12, LABEL_HEIGHT_PT - 12).lineWidth(1.5).stroke();
  doc.font('Helvetica-Bold').fontSize(20).text(content.carrier.toUpperCase(), left, 16, { width: width - 60 });
  doc.font('Helvetica').fontSize(10).text(content.service, left, 40, { width: width - 60 });
  doc.rect(LABEL_WIDTH_PT - 64, 14, 50, 38).fill('black');
  doc.fillColor('white').font('Helvetica-Bold').fontSize(22).text(String(content.zone), LABEL_WIDTH_PT - 64, 22, { width: 50, align: 'center' });
  doc.fillColor('black');
  doc.moveTo(left, 58).lineTo(left + width, 58).stroke();

  doc.font('Helvetica-Bold').fontSize(7).text('FROM', left, 64);
  doc.font('Helvetica').fontSize(8).text(addressLines(content.from).join('\n'), left, 73, { width });

  doc.font('Helvetica-Bold').fontSize(8).text('SHIP TO', left, 136);
  doc.font('Helvetica-Bold').fontSize(12).text(addressLines(content.to).join('\n'), left + 10, 148, { width: width - 10 });

  doc.moveTo(left, 232).lineTo(left + width, 232).stroke();
  doc.font('Helvetica').fontSize(8).text(
    `Ship date ${content.shipDate}   Billable weight ${content.billableLb} lb   Zone ${content.zone}`,
    left,
    238,
    { width },
  );
  if (content.reference) doc.text(`Ref ${content.reference}`, left, 250, { width });

  doc.image(barcode, left + 10, 266, { fit: [width - 20, 110], align: 'center' });
  doc.font('Helvetica-Bold').fontSize(11).text(`TRACKING # ${content.trackingCode}`, left, 382, { width, align: 'center' });
  doc.font('Helvetica').fontSize(6.5).text('TEST LABEL from the local shipping fake. Not valid postage.', left, 404, { width, align: 'center' });

  doc.end();
  return done;
}
