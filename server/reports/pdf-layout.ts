import PDFDocument from 'pdfkit';
import type { LabSettings } from '../../shared/schemas/lab-settings.js';

/** Page layout, PDF points (72 per inch); A4. */
export const MARGIN_PT = 50;
export const BODY_FONT_PT = 10;
export const SMALL_FONT_PT = 8;
export const TITLE_FONT_PT = 16;
export const HEADING_FONT_PT = 12;
const FOOTER_OFFSET_PT = 30;

/** The usual cautions printed on every report (common practice; defer to local codes and the makers). */
export const SAFETY_NOTE =
  'Safety: lithium packs can burn and lead-acid batteries give off hydrogen. Never leave a load or charger unattended, never charge lithium below 0 °C without a heater, ' +
  'guard against short circuits, and follow local codes, the makers\u2019 instructions and licensed practice.';

/** A date and time in the lab's time zone, e.g. "2026-12-02 08:15 (Europe/Berlin)". */
export function labTime(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(at);
  return `${parts.replace(',', '')} (${timeZone})`;
}

/** A report being written: the document and the bytes it will end as. */
export interface ReportDocument {
  doc: PDFKit.PDFDocument;
  /** Prints the page footers, ends the document and gives its bytes. */
  finish(): Promise<Buffer>;
}

/** Starts an A4 report with the lab's name and the time made (lab's zone) on top, "lab · page n of N" at the foot of each page. */
export function startReport(title: string, settings: LabSettings, madeAt: Date): ReportDocument {
  const doc = new PDFDocument({ size: 'A4', margin: MARGIN_PT, bufferPages: true, info: { Title: title, Producer: 'Kneepoint' } });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const ended = new Promise<void>((resolve, reject) => {
    doc.on('end', () => resolve());
    doc.on('error', reject);
  });
  doc.fontSize(BODY_FONT_PT).text(settings.labName);
  doc.text(`Made ${labTime(madeAt, settings.timeZone)}`);
  doc.moveDown().fontSize(TITLE_FONT_PT).text(title);
  const finish = async () => {
    const range = doc.bufferedPageRange();
    for (let i = range.start; i < range.start + range.count; i++) {
      doc.switchToPage(i);
      // The footer sits in the bottom margin: without this pdfkit would start a new page for it.
      doc.page.margins.bottom = 0;
      doc.fontSize(SMALL_FONT_PT).text(`${settings.labName} · page ${i + 1} of ${range.count}`, MARGIN_PT, doc.page.height - FOOTER_OFFSET_PT, { lineBreak: false });
    }
    doc.end();
    await ended;
    return Buffer.concat(chunks);
  };
  return { doc, finish };
}

/** A section heading at body left, then body-size text. */
export function heading(doc: PDFKit.PDFDocument, text: string): void {
  doc.moveDown().fontSize(HEADING_FONT_PT).text(text, MARGIN_PT);
  doc.fontSize(BODY_FONT_PT);
}

/** A table with a header row, columns sized as given (points or "*"), starting at the left margin. */
export function table(doc: PDFKit.PDFDocument, headers: readonly string[], rows: readonly string[][], columnWidths: Array<number | string>): void {
  doc.fontSize(SMALL_FONT_PT);
  doc.table({
    position: { x: MARGIN_PT },
    columnStyles: columnWidths,
    defaultStyle: { border: 0.5, padding: 2 },
    data: [headers.map((text) => ({ text, type: 'TH' as const, font: { src: 'Helvetica-Bold' } })), ...rows.map((r) => [...r])],
  });
  doc.fontSize(BODY_FONT_PT);
  doc.x = MARGIN_PT;
}
