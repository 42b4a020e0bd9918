import type { Battery } from '../../shared/schemas/battery.js';

/** One column of the register export: its header (unit in brackets) and how to read it. */
interface CsvColumn {
  header: string;
  value: (b: Battery) => string | number | null;
}

/** The register's columns; every number's unit is in its header. */
export const BATTERY_CSV_COLUMNS: readonly CsvColumn[] = [
  { header: 'id', value: (b) => b.id },
  { header: 'label', value: (b) => b.label },
  { header: 'brand', value: (b) => b.brand },
  { header: 'model', value: (b) => b.model },
  { header: 'chemistry', value: (b) => b.chemistry },
  { header: 'cells in series', value: (b) => b.cellsInSeries },
  { header: 'cells in parallel', value: (b) => b.cellsInParallel },
  { header: 'rated capacity [Ah]', value: (b) => b.ratedAh },
  { header: 'rated energy [Wh]', value: (b) => b.ratedWh },
  { header: 'protection current [A]', value: (b) => b.bmsRatedAmps },
  { header: 'mass [kg]', value: (b) => b.massKg },
  { header: 'length [mm]', value: (b) => b.lengthMm },
  { header: 'width [mm]', value: (b) => b.widthMm },
  { header: 'height [mm]', value: (b) => b.heightMm },
  { header: 'terminal type', value: (b) => b.terminalType },
  { header: 'stated cycle life [cycles]', value: (b) => b.statedCycleLife },
  { header: 'warranty [months]', value: (b) => b.warrantyMonths },
  { header: 'price', value: (b) => b.price },
  { header: 'price currency', value: (b) => b.priceCurrency },
  { header: 'serial number', value: (b) => b.serialNumber },
  { header: 'sent by', value: (b) => b.sender },
  { header: 'owner or client', value: (b) => b.owner },
  { header: 'received on [YYYY-MM-DD]', value: (b) => b.receivedOn },
  { header: 'notes', value: (b) => b.notes },
];

/** Text a spreadsheet would run as a formula (OWASP "CSV injection"): prefixed with '. */
const FORMULA_START = /^[=+\-@\t\r]/;

/** One CSV field (RFC 4180 quoting); empty for null. */
export function csvField(value: string | number | null): string {
  if (value === null) return '';
  if (typeof value === 'number') return String(value);
  const text = FORMULA_START.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The register as CSV: a header row with units, then one row per pack, CRLF line ends (RFC 4180). */
export function batteriesCsv(batteries: readonly Battery[]): string {
  const lines = [BATTERY_CSV_COLUMNS.map((c) => csvField(c.header)).join(',')];
  for (const b of batteries) lines.push(BATTERY_CSV_COLUMNS.map((c) => csvField(c.value(b))).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
