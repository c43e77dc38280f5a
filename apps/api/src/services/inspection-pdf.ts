import PDFDocument from 'pdfkit';
import { ACCESS_SAFETY_NOTE, INSPECTION_RECORD_RETENTION_MONTHS, type HandoverDto } from '@hodboard/shared';
import { formatLongDate } from './quote-pdf.js';

export interface InspectionPdfRecord {
  inspectedAt: Date;
  inspectorName: string;
  result: 'safe' | 'unsafe';
  defects: string | null;
  notes: string | null;
  recordedBy: string | null;
  photoCount: number;
}

export interface InspectionPdfData {
  firm: { name: string; email: string | null; phone: string | null; address: string | null; timeZone: string };
  siteAddress: string;
  jobs: string;
  equipment: string;
  supplier: string;
  reference: string | null;
  erectedOn: string | null;
  struckOn: string | null;
  handover: HandoverDto | null;
  keepUntil: string | null;
  retentionSource: string;
  adverseDays: string[];
  generatedAt: Date;
  records: InspectionPdfRecord[];
}

const INK = '#1d2327';
const MUTED = '#5c6770';
const ACCENT = '#a4432b';
const DANGER = '#b42318';
const RULE = '#d9d4cc';

/**
 * A4 register of one booking's inspections, laid out after the report contents the regulation lists (who it was for,
 * where, what equipment, when, what could give rise to risk, what was done, who inspected). Built-in Helvetica only.
 */
export function renderInspectionPdf(data: InspectionPdfData): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margin: 50,
    info: { Title: `Inspection records: ${data.equipment} at ${data.siteAddress}`, Author: data.firm.name, Subject: 'Access inspection records' },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const left = doc.page.margins.left;
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right;
  const when = (at: Date) =>
    at.toLocaleString('en-GB', { timeZone: data.firm.timeZone, weekday: 'short', day: 'numeric', month: 'long', year: 'numeric', hour: '2-digit', minute: '2-digit' });

  doc.fillColor(ACCENT).font('Helvetica-Bold').fontSize(18).text(data.firm.name, left, 50, { width });
  doc.fillColor(MUTED).font('Helvetica').fontSize(9);
  const contact = [data.firm.address, data.firm.phone, data.firm.email].filter(Boolean).join('  ·  ');
  if (contact) doc.text(contact, { width });
  doc.moveDown(1);

  doc.fillColor(INK).font('Helvetica-Bold').fontSize(15).text('Access inspection records', { width });
  doc.font('Helvetica').fontSize(9).fillColor(MUTED).text(`Printed ${when(data.generatedAt)}`, { width });
  doc.moveDown(0.7);

  fact(doc, 'Site', data.siteAddress, width);
  fact(doc, 'Job', data.jobs, width);
  fact(doc, 'Equipment', `${data.equipment} from ${data.supplier}${data.reference ? ` (supplier's ref ${data.reference})` : ''}`, width);
  fact(doc, 'Up', data.erectedOn ? formatLongDate(data.erectedOn) : 'not yet', width);
  fact(doc, 'Struck', data.struckOn ? formatLongDate(data.struckOn) : 'still up', width);
  fact(doc, 'Keep until', data.keepUntil ? formatLongDate(data.keepUntil) : `while the access is up, then for ${INSPECTION_RECORD_RETENTION_MONTHS} months after it is struck`, width);
  if (data.adverseDays.length > 0) fact(doc, 'Wind stops while up', data.adverseDays.map(formatLongDate).join(', '), width);
  doc.moveDown(0.8);

  heading(doc, 'Handover', width);
  if (data.handover) {
    fact(doc, 'Handed over', `${formatLongDate(data.handover.handedOverOn)} by ${data.handover.handedOverBy}`, width);
    fact(doc, "Supplier's competent person", data.handover.competentPersonName, width);
    fact(doc, 'Tag or register ref', data.handover.tagReference ?? 'none recorded', width);
    if (data.handover.notes) fact(doc, 'Notes', data.handover.notes, width);
  } else {
    doc.font('Helvetica').fontSize(10).fillColor(MUTED).text('No handover recorded.', { width });
  }
  doc.moveDown(0.8);

  heading(doc, `Inspections (${data.records.length})`, width);
  if (data.records.length === 0) doc.font('Helvetica').fontSize(10).fillColor(MUTED).text('No inspections recorded.', { width });
  for (const record of data.records) {
    if (doc.y > doc.page.height - doc.page.margins.bottom - 110) doc.addPage();
    const isSafe = record.result === 'safe';
    doc.font('Helvetica-Bold').fontSize(11).fillColor(INK).text(when(record.inspectedAt), { width, continued: true })
      .fillColor(isSafe ? INK : DANGER).text(`   ${isSafe ? 'Safe to use' : 'NOT SAFE TO USE'}`);
    fact(doc, 'Inspector', record.inspectorName, width);
    fact(doc, 'Defects', record.defects ?? 'None recorded', width);
    if (record.notes) fact(doc, 'Notes', record.notes, width);
    const footnote = [record.recordedBy ? `Recorded in Hodboard by ${record.recordedBy}` : null, record.photoCount ? `${record.photoCount} photo${record.photoCount === 1 ? '' : 's'} held with the record` : null]
      .filter(Boolean).join('  ·  ');
    if (footnote) doc.font('Helvetica').fontSize(8.5).fillColor(MUTED).text(footnote, { width });
    doc.moveDown(0.3);
    rule(doc, width);
  }

  doc.moveDown(0.6);
  if (doc.y > doc.page.height - doc.page.margins.bottom - 80) doc.addPage();
  heading(doc, 'Safety', width);
  doc.font('Helvetica').fontSize(9).fillColor(INK).text(ACCESS_SAFETY_NOTE, { width, lineGap: 1 });
  doc.moveDown(0.3).fillColor(MUTED).fontSize(8.5).text(`Retention: ${data.retentionSource}.`, { width });
  doc.end();
  return done;
}

function heading(doc: PDFKit.PDFDocument, text: string, width: number): void {
  doc.font('Helvetica-Bold').fontSize(11).fillColor(ACCENT).text(text.toUpperCase(), { width, characterSpacing: 0.5 });
  doc.moveDown(0.3);
}

function fact(doc: PDFKit.PDFDocument, label: string, value: string, width: number): void {
  doc.font('Helvetica-Bold').fontSize(10).fillColor(INK).text(`${label}: `, { width, continued: true }).font('Helvetica').text(value, { lineGap: 1 });
}

function rule(doc: PDFKit.PDFDocument, width: number): void {
  const left = doc.page.margins.left;
  doc.moveTo(left, doc.y).lineTo(left + width, doc.y).strokeColor(RULE).lineWidth(0.8).stroke();
  doc.y += 6;
}
