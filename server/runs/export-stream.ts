import { once } from 'node:events';
import type { Writable } from 'node:stream';
import type { Sequelize } from 'sequelize';
import { forEachChunk, type Columns } from '../archive/archive-reader.js';
import { EXPORT_DECIMALS, formatExportNumber } from '../../shared/units/export-number.js';
import { exportColumnName, exportDecimals, type ExportMeta } from './export-meta.js';

/** Percentages in the metadata line: 0.01 %. */
const PERCENT_DECIMALS = 2;

/** Thrown inside an export when the client has gone; the export then ends quietly. */
class ClientGone extends Error {}

/**
 * Writes text, waiting when the client reads slower than we produce (bounded memory). A
 * client that leaves while we wait would never drain: stop then, or the export would hang
 * for ever holding a chunk in memory.
 */
async function put(out: Writable, text: string): Promise<void> {
  if (out.destroyed) throw new ClientGone();
  if (out.write(text)) return;
  const ac = new AbortController();
  const gone = once(out, 'close', { signal: ac.signal }).then(() => Promise.reject(new ClientGone()));
  try {
    await Promise.race([once(out, 'drain', { signal: ac.signal }), gone]);
  } finally {
    ac.abort();
    gone.catch(() => undefined);
  }
}

/** Runs an export, ending quietly when the client went away. */
async function untilClientGone(work: Promise<void>): Promise<void> {
  try {
    await work;
  } catch (err) {
    if (!(err instanceof ClientGone)) throw err;
  }
}

function value(cols: Columns, name: string, i: number): number {
  if (name === 'watts') return cols.volts![i]! * cols.amps![i]!;
  const col = cols[name];
  return col ? col[i]! : Number.NaN;
}


/** CSV text of one field: quoted when it holds a separator, quote or line break. */
function csvField(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The metadata lines (each starting with `#`) above the CSV header. */
function metaLines(meta: ExportMeta): string[] {
  const { run, battery, bench } = meta;
  const s = run.summary;
  const lines = [
    `Kneepoint run export`,
    `run: ${run.id} ${run.name}`,
    `kind: ${run.kind}; state: ${run.state}; origin: ${run.origin}`,
    `battery: ${battery ? `${battery.brand} ${battery.label} (${battery.chemistry}, ${battery.cellsInSeries}S, rated ${battery.ratedAh} Ah)` : 'none'}`,
    `bench: ${bench ? `${bench.id} ${bench.name}` : 'none'}`,
    `started: ${run.startedAt ?? 'unknown'}; ended: ${run.endedAt ?? 'not yet'}`,
    `units: ${Object.entries(meta.units).map(([k, u]) => `${k} ${u}`).join('; ')}`,
  ];
  if (s) {
    const n = (v: number, column: string) => formatExportNumber(v, exportDecimals(column));
    lines.push(
      `summary: capacityAh ${s.capacityAh === null ? 'n/a' : n(s.capacityAh, 'dischargeAh')}; capacityWh ${s.capacityWh === null ? 'n/a' : n(s.capacityWh, 'dischargeWh')}; capacityEndedBy ${s.capacityEndedBy ?? 'n/a'}; ` +
        `whole run: dischargeWh ${n(s.dischargeWh, 'dischargeWh')}; dischargeAh ${n(s.dischargeAh, 'dischargeAh')}; chargeWh ${n(s.chargeWh, 'chargeWh')}; chargeAh ${n(s.chargeAh, 'chargeAh')}; ` +
        `durationSeconds ${n(s.durationSeconds, 't')}; cutoffVolts ${s.cutoffVolts === null ? 'none' : n(s.cutoffVolts, 'volts')}; ` +
        `recoverySeconds ${s.recoverySeconds === null ? 'none' : n(s.recoverySeconds, 't')}; protectionTrips ${s.protectionTripCount}; ` +
        `percentRatedAh ${s.percentRatedAh === null ? 'n/a' : formatExportNumber(s.percentRatedAh, PERCENT_DECIMALS)}; verdict ${s.verdict}; cRate ${s.cRate === null ? 'n/a' : formatExportNumber(s.cRate, PERCENT_DECIMALS)}`,
    );
  }
  return lines.map((l) => `# ${l.replace(/[\r\n]+/g, ' ')}`);
}

/** Streams the whole run as CSV: metadata lines, a header, then every reading in order. */
export function streamCsvExport(out: Writable, sequelize: Sequelize, meta: ExportMeta): Promise<void> {
  return untilClientGone(writeCsv(out, sequelize, meta));
}

async function writeCsv(out: Writable, sequelize: Sequelize, meta: ExportMeta): Promise<void> {
  await put(out, metaLines(meta).join('\n') + '\n' + meta.columns.map((c) => csvField(exportColumnName(c))).join(',') + '\n');
  const decimals = meta.columns.map(exportDecimals);
  await forEachChunk(sequelize, meta.run.id, async (cols) => {
    const n = cols.elapsedSeconds!.length;
    const rows: string[] = new Array(n);
    for (let i = 0; i < n; i++) {
      let line = '';
      for (let c = 0; c < meta.columns.length; c++) {
        line += (c ? ',' : '') + formatExportNumber(value(cols, meta.columns[c]!, i), decimals[c]!);
      }
      rows[i] = line;
    }
    await put(out, rows.join('\n') + '\n');
  });
}

/** The run's figures in the JSON head, rounded like the rows (4 decimals: no float noise, no exponent). */
function roundMeta(_key: string, v: unknown): unknown {
  return typeof v === 'number' && !Number.isInteger(v) ? Number(formatExportNumber(v, EXPORT_DECIMALS.other)) : v;
}

/** Streams the whole run as one JSON document: `{ meta, columns, rows: [[…], …] }`. */
export function streamJsonExport(out: Writable, sequelize: Sequelize, meta: ExportMeta): Promise<void> {
  return untilClientGone(writeJson(out, sequelize, meta));
}

async function writeJson(out: Writable, sequelize: Sequelize, meta: ExportMeta): Promise<void> {
  // The same column names as the CSV header, and the same rounding.
  const head = { meta: { run: meta.run, battery: meta.battery, bench: meta.bench, units: meta.units }, columns: meta.columns.map(exportColumnName) };
  const decimals = meta.columns.map(exportDecimals);
  await put(out, JSON.stringify(head, roundMeta).slice(0, -1) + ',"rows":[');
  let first = true;
  await forEachChunk(sequelize, meta.run.id, async (cols) => {
    const n = cols.elapsedSeconds!.length;
    const rows: string[] = new Array(n);
    for (let i = 0; i < n; i++) {
      rows[i] = '[' + meta.columns.map((name, c) => formatExportNumber(value(cols, name, i), decimals[c]!) || 'null').join(',') + ']';
    }
    if (n) {
      await put(out, (first ? '' : ',') + rows.join(','));
      first = false;
    }
  });
  await put(out, ']}');
}
