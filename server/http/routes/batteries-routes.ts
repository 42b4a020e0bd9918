import { Router } from 'express';
import type { AppContext } from '../../app-context.js';
import { BatteryInputSchema, BatteryPatchSchema } from '../../../shared/schemas/battery.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { BATTERY_OPTIONAL_DEFAULTS, toApiBattery } from '../../db/models/battery.js';
import { linkRunToBattery, RunLinkError } from '../../runs/run-battery-link.js';
import { batteriesCsv } from '../../batteries/batteries-csv.js';
import { protectionRecord } from '../../batteries/protection-record.js';
import { packReportPdf } from '../../reports/pack-report.js';
import type { Run } from '../../../shared/schemas/run.js';

/** /api/batteries: everyone signed in reads; technicians and admins write. */
export function createBatteriesRouter(ctx: AppContext): Router {
  const router = Router();
  const { Battery } = ctx.models;
  const findOr404 = async (id: number) => (await Battery.findByPk(id)) ?? Promise.reject(notFound('Battery'));

  router.get('/', requireRole('viewer'), async (_req, res) => {
    const rows = await Battery.findAll({ order: [['label', 'ASC']] });
    res.json({ batteries: rows.map(toApiBattery) });
  });

  router.get('/export.csv', requireRole('viewer'), async (_req, res) => {
    const rows = await Battery.findAll({ order: [['label', 'ASC']] });
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', 'attachment; filename="battery-register.csv"');
    res.send(batteriesCsv(rows.map(toApiBattery)));
  });

  router.get('/:id', requireRole('viewer'), async (req, res) => {
    res.json({ battery: toApiBattery(await findOr404(parseIdParam(req.params.id))) });
  });

  router.get('/:id/protections', requireRole('viewer'), async (req, res) => {
    const battery = await findOr404(parseIdParam(req.params.id));
    const live = (run: Run) => ctx.services.runRecorder?.withLive(run) ?? run;
    res.json({ batteryId: battery.id, specs: toApiBattery(battery).protectionSpecs, rows: await protectionRecord(ctx.sequelize, battery.id, live) });
  });

  // The pack's report; the price only with ?prices=1 (a report often goes to the client).
  router.get('/:id/report.pdf', requireRole('viewer'), async (req, res) => {
    const battery = await findOr404(parseIdParam(req.params.id));
    const live = (run: Run) => ctx.services.runRecorder?.withLive(run) ?? run;
    const pdf = await packReportPdf({ ...ctx, dataDir: ctx.config.dataDir, live }, battery.id, req.query.prices === '1', new Date());
    if (!pdf) throw notFound('Battery');
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename="pack-${battery.id}-report.pdf"`);
    res.end(pdf);
  });

  router.post('/', requireRole('technician'), async (req, res) => {
    const input = parseBody(BatteryInputSchema, req.body);
    const row = await Battery.create({ ...BATTERY_OPTIONAL_DEFAULTS, ...input, createdById: req.user!.id });
    res.status(201).json({ battery: toApiBattery(row) });
  });

  router.patch('/:id', requireRole('technician'), async (req, res) => {
    const change = parseBody(BatteryPatchSchema, req.body);
    const row = await findOr404(parseIdParam(req.params.id));
    await row.update(change);
    res.json({ battery: toApiBattery(row) });
  });

  // Files an already recorded or imported run under this pack (technician).
  router.put('/:id/runs/:runId', requireRole('technician'), async (req, res) => {
    const battery = await findOr404(parseIdParam(req.params.id));
    try {
      res.json({ run: await linkRunToBattery(ctx.sequelize, parseIdParam(req.params.runId, 'runId'), battery.id) });
    } catch (error) {
      if (error instanceof RunLinkError) throw new HttpError(error.reason === 'no-run' ? 404 : 409, error.message);
      throw error;
    }
  });

  router.delete('/:id', requireRole('technician'), async (req, res) => {
    const row = await findOr404(parseIdParam(req.params.id));
    await row.destroy(); // a battery with archived runs is kept: the foreign key answers 409
    res.status(204).end();
  });

  return router;
}
