import { Router, type Request, type Response } from 'express';
import {
  AnnotateRequestSchema,
  EditNoteRequestSchema,
  ImportProgressIdSchema,
  ListRunsQuerySchema,
  PatchRunRequestSchema,
  ReadingsQuerySchema,
  StartRunRequestSchema,
  StopRunRequestSchema,
} from '../../../shared/schemas/api-runs.js';
import type { Run } from '../../../shared/schemas/run.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { batteryLookup } from '../../runs/battery-facts.js';
import { exportMeta } from '../../runs/export-meta.js';
import { streamCsvExport, streamJsonExport } from '../../runs/export-stream.js';
import { ImportProgressBoard } from '../../runs/import-progress.js';
import { createImportHandler } from './import-route.js';
import { NotesRepo, type NoteChangeRecord } from '../../runs/notes-repo.js';
import { changeNote } from '../../runs/run-notes.js';
import { RunsRepo } from '../../runs/runs-repo.js';
import { recorderOf } from '../../runs/runs-services.js';
import { runReadings } from '../../runs/readings-service.js';
import { runReportPdf } from '../../reports/run-report.js';

/** /api/runs: everyone signed in reads; technicians start, stop, rename, annotate and import. */
export function createRunsRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new RunsRepo(ctx.sequelize);
  const notes = new NotesRepo(ctx.sequelize);
  // Changes reach a live run's timeline and every viewer through the recorder when it runs.
  const noteChanged = (change: NoteChangeRecord) => ctx.services.runRecorder?.noteChanged(change);
  const editNote = async (req: Request, text: string | null) => {
    const runId = parseIdParam(req.params.id);
    const eventId = parseIdParam(req.params.eventId, 'eventId');
    const user = req.user!;
    return changeNote(notes, runId, eventId, text, { id: user.id, name: user.name, role: user.role }, noteChanged);
  };
  const getBattery = batteryLookup(ctx);
  const live = (run: Run) => ctx.services.runRecorder?.withLive(run) ?? run;
  const runOr404 = async (raw: string | string[] | undefined) => {
    const id = parseIdParam(raw);
    return (await repo.get(id)) ?? Promise.reject(notFound(`Run ${id}`));
  };

  router.get('/', requireRole('viewer'), async (req, res) => {
    const { runs, total } = await repo.list(ListRunsQuerySchema.parse(req.query));
    res.json({ runs: runs.map(live), total });
  });

  router.post('/', requireRole('technician'), async (req, res) => {
    const body = parseBody(StartRunRequestSchema, req.body);
    res.status(201).json({ run: await recorderOf(ctx).start(body, req.user!.id) });
  });

  const importProgress = new ImportProgressBoard();
  router.post('/import', requireRole('technician'), createImportHandler(ctx, repo, getBattery, importProgress));

  // Polled by the importing browser while its upload is processed (the POST answers at the end).
  router.get('/import/progress/:progressId', requireRole('technician'), (req, res) => {
    const id = ImportProgressIdSchema.safeParse(req.params.progressId);
    const progress = id.success ? importProgress.get(req.user!.id, id.data) : null;
    if (!progress) throw notFound('Import');
    res.json(progress);
  });

  router.get('/:id', requireRole('viewer'), async (req, res) => {
    res.json({ run: live(await runOr404(req.params.id)) });
  });

  router.patch('/:id', requireRole('technician'), async (req, res) => {
    const change = parseBody(PatchRunRequestSchema, req.body);
    const run = await runOr404(req.params.id);
    const updated = live((await repo.patch(run.id, change))!);
    ctx.services.runRecorder?.renamed(updated);
    res.json({ run: updated });
  });

  router.post('/:id/stop', requireRole('technician'), async (req, res) => {
    const { abort } = parseBody(StopRunRequestSchema, req.body);
    res.json({ run: await recorderOf(ctx).stop(parseIdParam(req.params.id), abort) });
  });

  router.post('/:id/abort', requireRole('technician'), async (req, res) => {
    res.json({ run: await recorderOf(ctx).stop(parseIdParam(req.params.id), true) });
  });

  // A note's author or an admin edits or removes it; the history keeps what it said.
  router.patch('/:id/events/:eventId', requireRole('technician'), async (req, res) => {
    const { text } = parseBody(EditNoteRequestSchema, req.body);
    const change = await editNote(req, text);
    res.json({ event: { id: change.eventId, runId: change.runId, event: change.next } });
  });

  router.delete('/:id/events/:eventId', requireRole('technician'), async (req, res) => {
    await editNote(req, null);
    res.status(204).end();
  });

  router.get('/:id/note-history', requireRole('viewer'), async (req, res) => {
    const run = await runOr404(req.params.id);
    res.json({ revisions: await notes.revisions(run.id) });
  });

  router.get('/:id/events', requireRole('viewer'), async (req, res) => {
    const run = await runOr404(req.params.id);
    res.json({ events: await repo.events(run.id) });
  });

  router.post('/:id/events', requireRole('technician'), async (req, res) => {
    const body = parseBody(AnnotateRequestSchema, req.body);
    const run = await runOr404(req.params.id);
    const author = { id: req.user!.id, name: req.user!.name };
    const recorder = ctx.services.runRecorder;
    const stored = recorder
      ? await recorder.annotate(run.id, body.text, body.elapsedSeconds, author)
      : await repo.insertEvent(run.id, { type: 'annotation', elapsedSeconds: body.elapsedSeconds ?? 0, text: body.text, author: author.name }, author.id);
    res.status(201).json({ event: stored });
  });

  // `/samples` is the old address of the same history, kept for old clients. vocab-rename: keep
  const readings = async (req: Request<{ id: string }>, res: Response) => {
    const run = await runOr404(req.params.id);
    res.json(await runReadings(ctx.sequelize, run.id, ReadingsQuerySchema.parse(req.query), run.summary?.maxGapSeconds ?? run.maxGapSeconds ?? undefined));
  };
  router.get('/:id/readings', requireRole('viewer'), readings);
  router.get('/:id/samples', requireRole('viewer'), readings);

  router.get('/:id/report.pdf', requireRole('viewer'), async (req, res) => {
    const run = live(await runOr404(req.params.id));
    const pdf = await runReportPdf(ctx, run, new Date());
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename="run-${run.id}-report.pdf"`);
    res.end(pdf);
  });

  router.get('/:id/export.csv', requireRole('viewer'), async (req, res) => {
    const meta = await exportMeta(ctx.sequelize, await runOr404(req.params.id), getBattery);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="run-${meta.run.id}.csv"`);
    await streamCsvExport(res, ctx.sequelize, meta);
    res.end();
  });

  router.get('/:id/export.json', requireRole('viewer'), async (req, res) => {
    const meta = await exportMeta(ctx.sequelize, await runOr404(req.params.id), getBattery);
    res.setHeader('Content-Type', 'application/json; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="run-${meta.run.id}.json"`);
    await streamJsonExport(res, ctx.sequelize, meta);
    res.end();
  });

  return router;
}
