import { once } from 'node:events';
import type { Writable } from 'node:stream';
import type { Sequelize } from 'sequelize';
import { forEachChunk } from '../archive/chunk-store.js';
import type { Columns } from '../archive/column-block.js';
import type { ExportMeta } from './export-meta.js';

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

const csvHeaderName = (name: string): string =>
  name.startsWith('temp:') ? `temp_${name.slice(5)}_c` : name.startsWith('aux:') ? `aux_${name.slice(4)}` : name;

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
    lines.push(
      `summary: capacityAh ${s.capacityAh ?? 'n/a'}; capacityWh ${s.capacityWh ?? 'n/a'}; capacityEndedBy ${s.capacityEndedBy ?? 'n/a'}; ` +
        `whole run: dischargeWh ${s.dischargeWh}; dischargeAh ${s.dischargeAh}; chargeWh ${s.chargeWh}; chargeAh ${s.chargeAh}; durationSeconds ${s.durationSeconds}; ` +
        `cutoffVolts ${s.cutoffVolts ?? 'none'}; recoverySeconds ${s.recoverySeconds ?? 'none'}; protectionTrips ${s.protectionTripCount}; ` +
        `percentRatedAh ${s.percentRatedAh ?? 'n/a'}; verdict ${s.verdict}; cRate ${s.cRate ?? 'n/a'}`,
    );
  }
  return lines.map((l) => `# ${l.replace(/[\r\n]+/g, ' ')}`);
}

/** Streams the whole run as CSV: metadata lines, a header, then every reading in order. */
export function streamCsvExport(out: Writable, sequelize: Sequelize, meta: ExportMeta): Promise<void> {
  return untilClientGone(writeCsv(out, sequelize, meta));
}

async function writeCsv(out: Writable, sequelize: Sequelize, meta: ExportMeta): Promise<void> {
  await put(out, metaLines(meta).join('\n') + '\n' + meta.columns.map((c) => csvField(csvHeaderName(c))).join(',') + '\n');
  await forEachChunk(sequelize, meta.run.id, async (cols) => {
    const n = cols.elapsed!.length;
    const rows: string[] = new Array(n);
    for (let i = 0; i < n; i++) {
      let line = '';
      for (let c = 0; c < meta.columns.length; c++) {
        const v = value(cols, meta.columns[c]!, i);
        line += (c ? ',' : '') + (Number.isNaN(v) ? '' : String(v));
      }
      rows[i] = line;
    }
    await put(out, rows.join('\n') + '\n');
  });
}

/** Streams the whole run as one JSON document: `{ meta, columns, rows: [[…], …] }`. */
export function streamJsonExport(out: Writable, sequelize: Sequelize, meta: ExportMeta): Promise<void> {
  return untilClientGone(writeJson(out, sequelize, meta));
}

async function writeJson(out: Writable, sequelize: Sequelize, meta: ExportMeta): Promise<void> {
  const head = { meta: { run: meta.run, battery: meta.battery, bench: meta.bench, units: meta.units }, columns: meta.columns };
  await put(out, JSON.stringify(head).slice(0, -1) + ',"rows":[');
  let first = true;
  await forEachChunk(sequelize, meta.run.id, async (cols) => {
    const n = cols.elapsed!.length;
    const rows: string[] = new Array(n);
    for (let i = 0; i < n; i++) {
      rows[i] = '[' + meta.columns.map((name) => {
        const v = value(cols, name, i);
        return Number.isFinite(v) ? String(v) : 'null';
      }).join(',') + ']';
    }
    if (n) {
      await put(out, (first ? '' : ',') + rows.join(','));
      first = false;
    }
  });
  await put(out, ']}');
}
