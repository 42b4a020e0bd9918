import type { Sequelize } from 'sequelize';
import { ReadingsQuerySchema } from '../../shared/schemas/api-runs.js';
import type { Run } from '../../shared/schemas/run.js';
import type { CoreModels } from '../db/models/index.js';
import { RunsRepo } from '../runs/runs-repo.js';
import { runReadings } from '../runs/readings-service.js';
import { getLabSettings } from '../settings/settings-service.js';
import { SignoffService } from '../signoff/signoff-service.js';
import { renderRunReportPdf } from './run-report-pdf.js';
import { RunProgrammesRepo } from '../programmes/run-programmes-repo.js';
import { InstrumentsRepo } from '../instruments/instruments-repo.js';

/** Points the report's chart is drawn from (min/max buckets of the readings service). */
export const REPORT_CHART_BUCKETS = 600;

/** What a report reads. */
export interface ReportDeps {
  sequelize: Sequelize;
  models: CoreModels;
}

/** The run's report as PDF bytes: its chart buckets, events and notes, review history, test programme, instruments and the lab's settings, read now. */
export async function runReportPdf(deps: ReportDeps, run: Run, madeAt: Date): Promise<Buffer> {
  const [readings, events, settings, review, programme, instruments] = await Promise.all([
    runReadings(deps.sequelize, run.id, ReadingsQuerySchema.parse({ maxPoints: REPORT_CHART_BUCKETS })),
    new RunsRepo(deps.sequelize).events(run.id),
    getLabSettings(deps.models),
    new SignoffService(deps.sequelize).review(run.id),
    new RunProgrammesRepo(deps.sequelize).get(run.id, madeAt.getTime()),
    new InstrumentsRepo(deps.sequelize).ofRun(run.id),
  ]);
  return renderRunReportPdf({ run, readings, events, settings, review, madeAt, programme, instruments });
}
