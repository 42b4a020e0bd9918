import { Router } from 'express';
import { z } from 'zod';
import { programmeProblems } from '../../../shared/measure/programme-limits.js';
import { ProgrammeInputSchema, type ProgrammeInput } from '../../../shared/schemas/programme.js';
import { ProgrammeControlRequestSchema, StartProgrammeRequestSchema } from '../../../shared/schemas/programme-run.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { BenchInstrumentsSchema } from '../../../shared/schemas/bench-instruments.js';
import { BenchInstrumentsRepo } from '../../programmes/bench-instruments-repo.js';
import { ProgrammesRepo } from '../../programmes/programmes-repo.js';
import type { ProgrammeRunner } from '../../programmes/programme-runner.js';

/** Most command-log rows one request returns. */
const COMMAND_PAGE_MAX = 1000;
const CommandPageQuerySchema = z.object({
  afterId: z.coerce.number().int().nonnegative().default(0),
  limit: z.coerce.number().int().min(1).max(COMMAND_PAGE_MAX).default(COMMAND_PAGE_MAX),
});

/** Refuses a programme whose values are unsafe for the pack it is written for (400, each field named). */
function checkSafe(input: ProgrammeInput): ProgrammeInput {
  const problems = programmeProblems(input.steps, input);
  if (problems.length > 0) throw new HttpError(400, `Unsafe programme: ${problems.map((p) => p.message).join('; ')}`, Object.fromEntries(problems.map((p) => [p.path, [p.message]])));
  return input;
}

function runnerOf(ctx: AppContext): ProgrammeRunner {
  const runner = ctx.services.programmeRunner;
  if (!runner) throw new HttpError(503, 'Programmes are not running on this server');
  return runner;
}

/**
 * A bench's controllable instruments under /api/benches/:id/instruments (admins set them),
 * /api/programmes (everyone signed in reads; technicians save, change and remove) and a run's
 * programme under /api/runs/:id (technicians start, pause, resume, skip and abort it; everyone
 * signed in reads its progress and its command log).
 */
export function createProgrammesRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new ProgrammesRepo(ctx.sequelize);
  const benchInstruments = new BenchInstrumentsRepo(ctx.sequelize);
  const benchOr404 = async (raw: string | string[] | undefined) => {
    const id = parseIdParam(raw);
    const [found] = await ctx.sequelize.query('SELECT id FROM benches WHERE id = ?', { replacements: [id] });
    if ((found as unknown[]).length === 0) throw notFound(`Bench ${id}`);
    return id;
  };

  router.get('/benches/:id/instruments', requireRole('viewer'), async (req, res) => {
    res.json({ instruments: await benchInstruments.get(await benchOr404(req.params.id)) });
  });

  // Setting up a bench is an admin's job, as for its meter.
  router.put('/benches/:id/instruments', requireRole('admin'), async (req, res) => {
    const benchId = await benchOr404(req.params.id);
    const config = parseBody(BenchInstrumentsSchema, req.body);
    if (ctx.services.programmeRunner?.busyOnBench(benchId)) throw new HttpError(409, `A programme is running on bench ${benchId}: its instruments cannot change now`);
    await benchInstruments.put(benchId, config);
    await ctx.services.benchInstruments?.forget?.(benchId);
    res.json({ instruments: await benchInstruments.get(benchId) });
  });

  router.get('/programmes', requireRole('viewer'), async (_req, res) => {
    res.json({ programmes: await repo.list() });
  });

  router.get('/programmes/:id', requireRole('viewer'), async (req, res) => {
    const id = parseIdParam(req.params.id);
    const programme = await repo.get(id);
    if (!programme) throw notFound(`Programme ${id}`);
    res.json({ programme });
  });

  router.post('/programmes', requireRole('technician'), async (req, res) => {
    const input = checkSafe(parseBody(ProgrammeInputSchema, req.body));
    res.status(201).json({ programme: await repo.create(input, req.user!.id) });
  });

  router.put('/programmes/:id', requireRole('technician'), async (req, res) => {
    const id = parseIdParam(req.params.id);
    const input = checkSafe(parseBody(ProgrammeInputSchema, req.body));
    const programme = await repo.replace(id, input);
    if (!programme) throw notFound(`Programme ${id}`);
    res.json({ programme });
  });

  router.delete('/programmes/:id', requireRole('technician'), async (req, res) => {
    const id = parseIdParam(req.params.id);
    if (!(await repo.remove(id))) throw notFound(`Programme ${id}`);
    res.status(204).end();
  });

  router.get('/runs/:id/programme', requireRole('viewer'), async (req, res) => {
    const runId = parseIdParam(req.params.id);
    const programme = await runnerOf(ctx).get(runId);
    if (!programme) throw notFound(`A programme on run ${runId}`);
    res.json({ programme });
  });

  router.post('/runs/:id/programme', requireRole('technician'), async (req, res) => {
    const runId = parseIdParam(req.params.id);
    const { programmeId } = parseBody(StartProgrammeRequestSchema, req.body);
    await runnerOf(ctx).start(runId, programmeId, { id: req.user!.id, name: req.user!.name });
    res.status(201).json({ programme: await runnerOf(ctx).get(runId) });
  });

  router.post('/runs/:id/programme/control', requireRole('technician'), async (req, res) => {
    const runId = parseIdParam(req.params.id);
    const { action } = parseBody(ProgrammeControlRequestSchema, req.body);
    runnerOf(ctx).control(runId, action);
    res.json({ programme: await runnerOf(ctx).get(runId) });
  });

  router.get('/runs/:id/command-log', requireRole('viewer'), async (req, res) => {
    const runId = parseIdParam(req.params.id);
    const { afterId, limit } = CommandPageQuerySchema.parse(req.query);
    res.json({ commands: await runnerOf(ctx).commands(runId, afterId, limit) });
  });

  return router;
}
