import { loadPackReport, type PackReportDeps } from './pack-report-data.js';
import { renderPackReportPdf } from './pack-report-pdf.js';

/** The pack's report as PDF bytes, read now; null when the pack does not exist. */
export async function packReportPdf(deps: PackReportDeps, batteryId: number, includePrices: boolean, madeAt: Date): Promise<Buffer | null> {
  const input = await loadPackReport(deps, batteryId, includePrices, madeAt);
  return input ? renderPackReportPdf(input) : null;
}
