import type { Run } from '../../shared/schemas/run.js';
import type { ReadingsResponse, StoredRunEvent } from '../../shared/schemas/api-runs.js';
import type { LabSettings } from '../../shared/schemas/lab-settings.js';
import type { RunProgramme } from '../../shared/schemas/programme-run.js';
import { programmeReportLines } from './programme-lines.js';
import type { RunInstrument } from '../../shared/schemas/instrument.js';
import { instrumentsLine } from './instruments-line.js';
import { formatCharge, formatDuration, formatElapsedClock, formatEnergy, formatPercent, formatTemperature, formatVolts, formatAmps } from '../../shared/units/format.js';
import { BODY_FONT_PT, HEADING_FONT_PT, labTime, MARGIN_PT, SAFETY_NOTE, heading, startReport } from './pdf-layout.js';
import { protectionResultLine } from './pack-report-rows.js';
import { signoffLines, type ReportReview } from './signoff-lines.js';

const CHART_HEIGHT_PT = 180;
const CHART_LINE_PT = 0.6;

/** What a run report shows. */
export interface RunReportInput {
  run: Run;
  readings: ReadingsResponse;
  events: readonly StoredRunEvent[];
  settings: LabSettings;
  /** The run's review history (sign-offs), judged against the run as it is now. */
  review: ReportReview;
  /** When the report is made (printed in the lab's time zone). */
  madeAt: Date;
  /** The test programme the run followed, with each step's figures (absent when none). */
  programme?: RunProgramme | null;
  /** The instruments the run used and their calibration state when it started (server/instruments). */
  instruments?: readonly RunInstrument[];
}

/** The summary figures as the report prints them, in the lab's units (the same formatting as the API's consumers). */
export function runReportFigures(run: Run, settings: LabSettings): Array<[string, string]> {
  const s = run.summary;
  if (!s) return [];
  const t = settings.temperatureUnit;
  return [
    ['Capacity', formatCharge(s.capacityAh)],
    ['Capacity energy', formatEnergy(s.capacityWh, settings.energyUnit)],
    ['Of rated Ah', formatPercent(s.percentRatedAh)],
    ['Of rated Wh', formatPercent(s.percentRatedWh)],
    ['Acceptance', formatPercent(s.acceptancePercent, 0)],
    ['Duration', formatDuration(s.durationSeconds)],
    ['Mean volts under load', formatVolts(s.meanVolts)],
    ['Mean amps under load', formatAmps(s.meanAmps)],
    ['Whole-run discharge', `${formatCharge(s.dischargeAh)} / ${formatEnergy(s.dischargeWh, settings.energyUnit)}`],
    ['Temperature range', `${formatTemperature(s.minTempCelsius, t)} to ${formatTemperature(s.maxTempCelsius, t)}`],
  ];
}

/** The verdict line with its uncertainty (JCGM 100, k = 2) when the bench stated its meter's accuracy. */
export function verdictText(run: Run, settings: LabSettings): string {
  const s = run.summary;
  if (!s) return 'Verdict: none yet (no figures).';
  const u = s.uncertainty;
  const base = `Verdict: ${s.verdict}`;
  if (!u) return `${base}. No meter accuracy stated: no uncertainty given.`;
  const wh = u.expandedWh === null ? '' : ` / ± ${formatEnergy(u.expandedWh, settings.energyUnit)}`;
  return `${base}. Capacity ± ${formatCharge(u.expandedAh)}${wh} (expanded, k = ${u.coverageFactor}, about 95 %), method: ${u.method}.`;
}

/** Volts against run time as vector lines from the min/max buckets (a bucket draws its min–max span). */
function drawVoltsChart(doc: PDFKit.PDFDocument, readings: ReadingsResponse): void {
  const x0 = MARGIN_PT;
  const y0 = doc.y;
  const width = doc.page.width - 2 * MARGIN_PT;
  doc.rect(x0, y0, width, CHART_HEIGHT_PT).lineWidth(CHART_LINE_PT).stroke();
  const vals = [...readings.volts.min, ...readings.volts.max].filter((v): v is number => v !== null);
  if (vals.length > 0 && readings.x.length > 0) {
    const [vMin, vMax] = [Math.min(...vals), Math.max(...vals)];
    const span = vMax - vMin || 1;
    const tMin = readings.from;
    const tSpan = readings.to - readings.from || 1;
    const px = (t: number) => x0 + ((t - tMin) / tSpan) * width;
    const py = (v: number) => y0 + CHART_HEIGHT_PT - ((v - vMin) / span) * CHART_HEIGHT_PT;
    let pen = false;
    readings.x.forEach((t, i) => {
      const lo = readings.volts.min[i];
      const hi = readings.volts.max[i];
      if (lo == null || hi == null) return void (pen = false);
      if (pen) doc.lineTo(px(t), py(lo));
      else doc.moveTo(px(t), py(lo));
      doc.lineTo(px(t), py(hi));
      pen = true;
    });
    doc.lineWidth(CHART_LINE_PT).stroke();
    doc.fontSize(BODY_FONT_PT - 2).text(`${formatVolts(vMax)} top, ${formatVolts(vMin)} bottom; ${formatElapsedClock(readings.from)} to ${formatElapsedClock(readings.to)}`, x0, y0 + CHART_HEIGHT_PT + 4);
  }
  doc.x = MARGIN_PT;
  doc.y = y0 + CHART_HEIGHT_PT + 20;
}

function eventLine(e: StoredRunEvent): string {
  const ev = e.event;
  const detail = ev.type === 'annotation' ? `note: ${ev.text}` : ev.type;
  return `${formatElapsedClock(ev.elapsedSeconds)}  ${detail}`;
}

/** Prints the sign-off block: the frozen figures' state, the sign-off that holds, the earlier ones. */
function printSignoff(doc: PDFKit.PDFDocument, review: ReportReview, timeZone: string): void {
  const lines = signoffLines(review, timeZone);
  heading(doc, 'Sign-off');
  doc.text(lines.state);
  for (const line of lines.signed) doc.text(line);
  if (lines.earlier.length > 0) {
    doc.moveDown(0.5).text('Earlier sign-offs:');
    for (const line of lines.earlier) doc.text(line);
  }
}

/** The run report as a PDF: header, verdict with uncertainty, figures, chart, protections, events and notes, sign-off, safety note, page numbers. */
export async function renderRunReportPdf(input: RunReportInput): Promise<Buffer> {
  const { run, settings } = input;
  const { doc, finish } = startReport(`Run report: ${run.name}`, settings, input.madeAt);
  doc.fontSize(BODY_FONT_PT).text(`Run ${run.id} · ${run.kind} · started ${run.startedAt ? labTime(new Date(run.startedAt), settings.timeZone) : '—'}`);
  if (input.instruments) doc.text(instrumentsLine(input.instruments));
  doc.moveDown().fontSize(HEADING_FONT_PT).text(verdictText(run, settings));
  heading(doc, 'Figures');
  for (const [label, value] of runReportFigures(run, settings)) doc.text(`${label}: ${value}`);
  if (input.programme) {
    heading(doc, 'Test programme');
    for (const line of programmeReportLines(input.programme)) doc.text(line);
  }
  heading(doc, 'Volts over the run');
  drawVoltsChart(doc, input.readings);
  const protections = run.summary?.protections ?? [];
  if (protections.length > 0) {
    heading(doc, 'Protection results');
    for (const p of protections) doc.text(protectionResultLine(p, settings));
  }
  heading(doc, 'Events and notes');
  if (input.events.length === 0) doc.text('None.');
  for (const e of input.events) doc.text(eventLine(e));
  printSignoff(doc, input.review, settings.timeZone);
  doc.moveDown().fontSize(BODY_FONT_PT).text(SAFETY_NOTE);
  return finish();
}
