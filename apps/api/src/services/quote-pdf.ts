import PDFDocument from 'pdfkit';
import { clientLines, formatPence, type BreakdownLevel, type PriceBreakdown, type QuoteContent } from '@hodboard/shared';

export interface QuotePdfData {
  firm: { name: string; email: string | null; phone: string | null; address: string | null };
  reference: string;
  versionNumber: number;
  issuedOn: string;
  validUntil: string | null;
  clientName: string;
  siteAddress: string;
  jobTitle: string;
  content: QuoteContent;
  breakdown: PriceBreakdown;
  vatRegistered: boolean;
  depositPence: number;
  paymentTerms: string;
  isDraft: boolean;
}

const INK = '#1d2327';
const MUTED = '#5c6770';
const ACCENT = '#a4432b';
const RULE = '#d9d4cc';

/** Words shown wherever access equipment is priced: the firm does not sign off scaffolds itself. */
export const ACCESS_CAUTION =
  'Scaffolds and towers are put up, altered and taken down by a competent scaffolding contractor and inspected ' +
  'as local regulations require. Work at height stops in high wind, and brickwork pauses in frost or heavy rain.';

export function formatLongDate(isoDate: string): string {
  const [y, m, d] = isoDate.split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d!)).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

/** A4 quote with pdfkit's built-in Helvetica, so no font file has to ship with the app. */
export function renderQuotePdf(data: QuotePdfData): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margin: 50,
    info: { Title: `Quote ${data.reference}`, Author: data.firm.name, Subject: data.jobTitle },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const left = doc.page.margins.left;
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right;

  doc.fillColor(ACCENT).font('Helvetica-Bold').fontSize(20).text(data.firm.name, left, 50, { width });
  doc.fillColor(MUTED).font('Helvetica').fontSize(9);
  const contact = [data.firm.address, data.firm.phone, data.firm.email].filter(Boolean).join('  ·  ');
  if (contact) doc.text(contact, { width });
  doc.moveDown(1.2);

  doc.fillColor(INK).font('Helvetica-Bold').fontSize(16).text(`${data.isDraft ? 'Draft quote' : 'Quote'} ${data.reference}`, { width });
  doc.font('Helvetica').fontSize(10).fillColor(MUTED);
  doc.text(`Version ${data.versionNumber}  ·  Issued ${formatLongDate(data.issuedOn)}${data.validUntil ? `  ·  Valid until ${formatLongDate(data.validUntil)}` : ''}`);
  doc.moveDown(0.8);

  doc.fillColor(INK).fontSize(10);
  doc.font('Helvetica-Bold').text('For ', { continued: true }).font('Helvetica').text(data.clientName);
  doc.font('Helvetica-Bold').text('Site ', { continued: true }).font('Helvetica').text(data.siteAddress);
  doc.font('Helvetica-Bold').text('Job ', { continued: true }).font('Helvetica').text(data.jobTitle);
  doc.moveDown(1);

  heading(doc, 'Scope of work', width);
  doc.font('Helvetica').fontSize(10).fillColor(INK).text(data.content.scope, { width, lineGap: 2 });
  doc.moveDown(1);

  heading(doc, 'Price', width);
  const level: BreakdownLevel = data.content.breakdownLevel;
  for (const line of clientLines(data.breakdown, level)) row(doc, line.description, formatPence(line.pence), width, false);
  rule(doc, width);
  const totals = data.breakdown.totals;
  if (data.vatRegistered) {
    row(doc, 'Price before VAT', formatPence(totals.netPence), width, false);
    const vatLine = data.breakdown.lines.find((l) => l.kind === 'vat');
    row(doc, vatLine?.description ?? 'VAT', formatPence(totals.vatPence), width, false);
    row(doc, 'Total to pay', formatPence(totals.grossPence), width, true);
  } else {
    row(doc, 'Total to pay (no VAT is charged)', formatPence(totals.grossPence), width, true);
  }
  if (data.depositPence > 0) row(doc, 'Deposit on acceptance', formatPence(data.depositPence), width, false);
  doc.moveDown(1);

  if (data.content.exclusions) {
    heading(doc, 'Not included', width);
    doc.font('Helvetica').fontSize(10).fillColor(INK).text(data.content.exclusions, { width, lineGap: 2 });
    doc.moveDown(1);
  }

  heading(doc, 'Terms', width);
  doc.font('Helvetica').fontSize(10).fillColor(INK);
  if (data.validUntil) doc.text(`This quote is valid until ${formatLongDate(data.validUntil)}.`, { width });
  doc.text(data.paymentTerms, { width, lineGap: 2 });
  if (data.content.accessHire.length > 0) {
    doc.moveDown(0.5).fillColor(MUTED).fontSize(9).text(ACCESS_CAUTION, { width, lineGap: 1 });
  }
  doc.end();
  return done;
}

function heading(doc: PDFKit.PDFDocument, text: string, width: number): void {
  doc.font('Helvetica-Bold').fontSize(11).fillColor(ACCENT).text(text.toUpperCase(), { width, characterSpacing: 0.5 });
  doc.moveDown(0.3);
}

function row(doc: PDFKit.PDFDocument, label: string, amount: string, width: number, isStrong: boolean): void {
  const left = doc.page.margins.left;
  const amountWidth = 110;
  const y = doc.y;
  doc.font(isStrong ? 'Helvetica-Bold' : 'Helvetica').fontSize(isStrong ? 11 : 10).fillColor(INK);
  doc.text(label, left, y, { width: width - amountWidth - 10 });
  const after = doc.y;
  doc.text(amount, left + width - amountWidth, y, { width: amountWidth, align: 'right' });
  doc.x = left;
  doc.y = Math.max(after, doc.y) + 3;
}

function rule(doc: PDFKit.PDFDocument, width: number): void {
  const left = doc.page.margins.left;
  doc.moveTo(left, doc.y).lineTo(left + width, doc.y).strokeColor(RULE).lineWidth(0.8).stroke();
  doc.y += 5;
}
