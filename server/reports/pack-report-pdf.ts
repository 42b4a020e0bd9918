import type { PackReportInput, ReportPhoto } from './pack-report-data.js';
import {
  CAPACITY_HEADERS,
  capacityRows,
  packSpecRows,
  PROTECTION_HEADERS,
  protectionRows,
  protectionSpecLines,
  RUN_HEADERS,
  runRows,
} from './pack-report-rows.js';
import { BODY_FONT_PT, heading, MARGIN_PT, SAFETY_NOTE, SMALL_FONT_PT, startReport, table } from './pdf-layout.js';

/** Thumbnail box in the report, PDF points (about 34 mm): small, but a weld or a swollen cell still shows. */
const THUMB_PT = 96;
const THUMB_GAP_PT = 8;
const CAPTION_PT = 12;

/** Draws a row of thumbnails, wrapping to new lines and pages; a missing file prints its name instead. */
function drawPhotos(doc: PDFKit.PDFDocument, photos: readonly ReportPhoto[]): void {
  if (photos.length === 0) return;
  const right = doc.page.width - MARGIN_PT;
  let x = MARGIN_PT;
  let y = doc.y + THUMB_GAP_PT / 2;
  const rowHeight = THUMB_PT + CAPTION_PT + THUMB_GAP_PT;
  for (const photo of photos) {
    if (x + THUMB_PT > right) {
      x = MARGIN_PT;
      y += rowHeight;
    }
    if (y + rowHeight > doc.page.height - doc.page.margins.bottom) {
      doc.addPage();
      x = MARGIN_PT;
      y = doc.y;
    }
    if (photo.jpeg) doc.image(photo.jpeg, x, y, { fit: [THUMB_PT, THUMB_PT], align: 'center', valign: 'center' });
    else doc.rect(x, y, THUMB_PT, THUMB_PT).lineWidth(0.5).stroke();
    doc.fontSize(SMALL_FONT_PT).text(photo.jpeg ? photo.fileName : `${photo.fileName} (file missing)`, x, y + THUMB_PT + 2, { width: THUMB_PT, height: CAPTION_PT, ellipsis: true, lineBreak: false });
    x += THUMB_PT + THUMB_GAP_PT;
  }
  doc.fontSize(BODY_FONT_PT);
  doc.x = MARGIN_PT;
  doc.y = y + rowHeight;
}

/** The pack report as a PDF: specs, capacity history, protection record, teardown inspection with photo thumbnails, runs, safety note, page numbers. */
export async function renderPackReportPdf(input: PackReportInput): Promise<Buffer> {
  const { battery: b, settings } = input;
  const { doc, finish } = startReport(`Pack report: ${b.label}`, settings, input.madeAt);

  heading(doc, 'Specifications');
  for (const [label, value] of packSpecRows(b, settings, input.includePrices)) doc.text(`${label}: ${value}`);

  heading(doc, 'Capacity history');
  const capacity = capacityRows(b, input.runs, settings);
  if (capacity.length === 0) doc.text('No finished capacity test yet.');
  else table(doc, CAPACITY_HEADERS, capacity, [90, '*', 55, 60, 50, 50, 50]);

  heading(doc, 'Protection record');
  const specs = protectionSpecLines(b.protectionSpecs, settings);
  if (specs.length === 0) doc.text('The pack\u2019s record states no protections.');
  else {
    doc.text('Stated by the maker:');
    for (const line of specs) doc.text(line);
  }
  doc.moveDown(0.5);
  if (input.protectionRows.length === 0) doc.text('No protection check has been run on this pack yet.');
  else table(doc, PROTECTION_HEADERS, protectionRows(input.protectionRows, settings), ['*', 100, 80, 80, 50]);

  heading(doc, 'Teardown inspection');
  if (input.inspection.length === 0 && input.otherPhotos.length === 0) doc.text('No inspection recorded.');
  for (const entry of input.inspection) {
    doc.moveDown(0.5).text(`${entry.title}: ${entry.rating ?? 'not rated'}${entry.note ? ` (${entry.note})` : ''}`, MARGIN_PT);
    drawPhotos(doc, entry.photos);
  }
  if (input.otherPhotos.length > 0) {
    doc.moveDown(0.5).text('Other photos', MARGIN_PT);
    drawPhotos(doc, input.otherPhotos);
  }

  heading(doc, 'Runs');
  if (input.runs.length === 0) doc.text('No runs yet.');
  else table(doc, RUN_HEADERS, runRows(input.runs, settings), [90, '*', 90, 55, 55]);

  doc.moveDown().fontSize(BODY_FONT_PT).text(SAFETY_NOTE, MARGIN_PT);
  return finish();
}
