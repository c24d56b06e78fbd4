// PDFs drawn with pdfkit's built-in Helvetica (no font files): receipts, yearly summaries, close reports.
import PDFDocument from 'pdfkit';
import { formatMoney } from '../../../shared/money';

export const RECEIPT_CAUTION =
  'This receipt records a payment; it is not tax advice. Whether a pledge or any part of it can be deducted depends on the rules where you live and on what you received in return. Check your local rules or ask a licensed tax adviser.';

export type Organisation = { organisationName: string; address: string; registrationNumber: string };

function collect(doc: PDFKit.PDFDocument): Promise<Buffer> {
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  return new Promise((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

function newDoc(title: string) {
  return new PDFDocument({ size: 'A4', margin: 56, info: { Title: title, Producer: 'Lightkeel', Creator: 'Lightkeel' } });
}

function header(doc: PDFKit.PDFDocument, org: Organisation, title: string, number: string | null) {
  doc
    .font('Helvetica-Bold')
    .fontSize(16)
    .fillColor('#0b2540')
    .text(org.organisationName || 'Organisation name not set');
  doc
    .font('Helvetica')
    .fontSize(9)
    .fillColor('#333333')
    .text(org.address || 'Address not set');
  doc.text(`Registration number: ${org.registrationNumber || 'not set'}`);
  doc.moveDown(1.5);
  doc.font('Helvetica-Bold').fontSize(20).fillColor('#000000').text(title);
  if (number) doc.font('Helvetica').fontSize(11).text(number);
  doc.moveDown();
}

function facts(doc: PDFKit.PDFDocument, rows: [string, string][]) {
  doc.fontSize(11);
  for (const [label, value] of rows) {
    const y = doc.y;
    doc.font('Helvetica-Bold').text(label, 56, y, { width: 170 });
    doc.font('Helvetica').text(value, 236, y, { width: 300 });
    doc.moveDown(0.3);
  }
  doc.x = 56;
}

function caution(doc: PDFKit.PDFDocument) {
  doc.moveDown(2);
  doc.font('Helvetica-Oblique').fontSize(9).fillColor('#444444').text(RECEIPT_CAUTION, 56, doc.y, { width: 483 });
  doc.fillColor('#000000');
}

export type ReceiptPdfInput = {
  org: Organisation;
  number: number;
  kind: 'payment' | 'correction';
  issuedAt: Date;
  paidAt: Date;
  backerName: string;
  campaignTitle: string;
  tierTitle: string | null;
  chargedMinor: number;
  amountMinor: number;
  currency: string;
  processorChargeId: string;
  voided: boolean;
  replacesNumber: number | null;
  replacedByNumber: number | null;
};

export const receiptNumberLabel = (n: number) => `Receipt no. ${String(n).padStart(6, '0')}`;

export async function renderReceiptPdf(r: ReceiptPdfInput): Promise<Buffer> {
  const doc = newDoc(receiptNumberLabel(r.number));
  header(doc, r.org, r.kind === 'correction' ? 'Corrected receipt' : 'Receipt for your support', receiptNumberLabel(r.number));
  if (r.voided) {
    doc.save();
    doc
      .font('Helvetica-Bold')
      .fontSize(72)
      .fillColor('#b00020')
      .opacity(0.25)
      .rotate(-30, { origin: [300, 420] })
      .text('VOID', 160, 380);
    doc.restore();
    doc
      .font('Helvetica-Bold')
      .fontSize(12)
      .fillColor('#b00020')
      .text(`VOID: this receipt was replaced after a refund${r.replacedByNumber ? ` by ${receiptNumberLabel(r.replacedByNumber)}` : ''}.`);
    doc.fillColor('#000000').moveDown();
  }
  const dateFmt = new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeZone: 'UTC' });
  facts(doc, [
    ['Received from', r.backerName],
    ['For', r.tierTitle ? `${r.campaignTitle} (${r.tierTitle})` : r.campaignTitle],
    ['Payment date', dateFmt.format(r.paidAt)],
    ['Amount paid', formatMoney(r.chargedMinor, r.currency)],
    ...(r.kind === 'correction' ? ([['Amount after refunds', formatMoney(r.amountMinor, r.currency)]] as [string, string][]) : []),
    ['Payment reference', r.processorChargeId],
    ['Issued', dateFmt.format(r.issuedAt)],
    ...(r.replacesNumber ? ([['Replaces', receiptNumberLabel(r.replacesNumber)]] as [string, string][]) : []),
  ]);
  caution(doc);
  return collect(doc);
}

export type YearlyPdfInput = {
  org: Organisation;
  year: number;
  backerName: string;
  lines: { date: Date; campaignTitle: string; number: number; amountMinor: number; currency: string }[];
  totals: { currency: string; amountMinor: number }[];
};

export async function renderYearlySummaryPdf(y: YearlyPdfInput): Promise<Buffer> {
  const doc = newDoc(`Yearly summary ${y.year}`);
  header(doc, y.org, `Yearly summary ${y.year}`, y.backerName);
  const dateFmt = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeZone: 'UTC' });
  doc.fontSize(10);
  if (y.lines.length === 0) doc.font('Helvetica').text('No payments in this year.');
  for (const l of y.lines) {
    const top = doc.y;
    doc.font('Helvetica').text(dateFmt.format(l.date), 56, top, { width: 90 });
    doc.text(l.campaignTitle, 150, top, { width: 200 });
    doc.text(receiptNumberLabel(l.number), 355, top, { width: 100 });
    doc.text(formatMoney(l.amountMinor, l.currency), 460, top, { width: 80, align: 'right' });
    doc.moveDown(0.2);
  }
  doc.x = 56;
  doc.moveDown();
  for (const t of y.totals) doc.font('Helvetica-Bold').text(`Total ${t.currency}: ${formatMoney(t.amountMinor, t.currency)}`);
  caution(doc);
  return collect(doc);
}

export type ReportPdfInput = { title: string; org: Organisation; sections: { heading: string; rows: [string, string][] }[] };

export async function renderReportPdf(r: ReportPdfInput): Promise<Buffer> {
  const doc = newDoc(r.title);
  header(doc, r.org, r.title, null);
  for (const s of r.sections) {
    doc.font('Helvetica-Bold').fontSize(13).text(s.heading);
    doc.moveDown(0.3);
    facts(doc, s.rows.length ? s.rows : [['—', 'nothing']]);
    doc.moveDown();
  }
  return collect(doc);
}
