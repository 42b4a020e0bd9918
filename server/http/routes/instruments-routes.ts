import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { QueryTypes } from 'sequelize';
import { InstrumentInputSchema } from '../../../shared/schemas/instrument.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { displayFileName } from '../../photos/photo-name.js';
import { CERTIFICATE_MAX_BYTES, CertificateFiles, certificateType } from '../../instruments/certificate-files.js';
import '../../instruments/instruments-services.js';
import { InstrumentsRepo } from '../../instruments/instruments-repo.js';

const MAX_FIELDS = 2;

/** Maps multer's refusal to a status: too large → 413, anything else malformed → 400. */
function uploadRefusal(error: unknown): HttpError {
  const e = error as { code?: string; message?: string };
  if (e.code === 'LIMIT_FILE_SIZE') return new HttpError(413, `Certificate too large: at most ${CERTIFICATE_MAX_BYTES / 1024 / 1024} MB`);
  return new HttpError(400, `Upload refused: ${e.message ?? 'bad multipart body'}`);
}

/**
 * Instrument records (/api/instruments): everyone signed in reads; admins create, edit, delete
 * and upload the calibration certificate (PDF, PNG or JPEG). /api/runs/:id/instruments gives
 * the instruments a run used, as they were when it started.
 */
export function createInstrumentsRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new InstrumentsRepo(ctx.sequelize);
  const files = new CertificateFiles(ctx.config.dataDir);
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: CERTIFICATE_MAX_BYTES, files: 1, fields: MAX_FIELDS } }).single('file');
  const receive: RequestHandler = (req, res, next) => upload(req, res, (error: unknown) => next(error ? uploadRefusal(error) : undefined));
  const reload = () => ctx.services.instruments?.reload() ?? Promise.resolve();
  const exists = async (table: 'benches' | 'runs', id: number) =>
    (await ctx.sequelize.query(`SELECT id FROM ${table} WHERE id = :id`, { type: QueryTypes.SELECT, replacements: { id } })).length > 0;
  const benchMustExist = async (benchId: number | null) => {
    if (benchId !== null && !(await exists('benches', benchId))) throw new HttpError(400, `Bench ${benchId} does not exist`, { benchId: ['no such bench'] });
  };
  const instrumentOr404 = async (raw: string | string[] | undefined) => {
    const id = parseIdParam(raw);
    return (await repo.get(id)) ?? Promise.reject(notFound(`Instrument ${id}`));
  };

  router.get('/instruments', requireRole('viewer'), async (req, res) => {
    const benchId = req.query.benchId === undefined ? undefined : parseIdParam(String(req.query.benchId), 'benchId');
    res.json({ instruments: await repo.list(benchId) });
  });

  router.get('/instruments/:id', requireRole('viewer'), async (req, res) => {
    res.json({ instrument: await instrumentOr404(req.params.id) });
  });

  router.post('/instruments', requireRole('admin'), async (req, res) => {
    const input = parseBody(InstrumentInputSchema, req.body);
    await benchMustExist(input.benchId);
    const instrument = await repo.create(input);
    await reload();
    res.status(201).json({ instrument });
  });

  router.put('/instruments/:id', requireRole('admin'), async (req, res) => {
    const input = parseBody(InstrumentInputSchema, req.body);
    const { id } = await instrumentOr404(req.params.id);
    await benchMustExist(input.benchId);
    const instrument = await repo.update(id, input);
    await reload();
    res.json({ instrument });
  });

  router.delete('/instruments/:id', requireRole('admin'), async (req, res) => {
    const { id } = await instrumentOr404(req.params.id);
    const removed = await repo.remove(id);
    if (removed?.certificateFile) await files.remove(removed.certificateFile);
    await reload();
    res.status(204).end();
  });

  router.post('/instruments/:id/certificate', requireRole('admin'), receive, async (req, res) => {
    const { id } = await instrumentOr404(req.params.id);
    if (!req.file) throw new HttpError(400, 'No file: send the certificate as the multipart field "file"', { file: ['required'] });
    const type = certificateType(req.file.buffer);
    if (!type) throw new HttpError(400, 'A certificate must be a PDF, PNG or JPEG file', { file: ['not a PDF, PNG or JPEG'] });
    const stored = await files.save(req.file.buffer);
    let replaced: string | null;
    try {
      replaced = await repo.setCertificate(id, stored, displayFileName(req.file.originalname), type, req.file.size);
    } catch (error) {
      await files.remove(stored);
      throw error;
    }
    if (replaced) await files.remove(replaced);
    res.json({ instrument: await repo.get(id) });
  });

  router.get('/instruments/:id/certificate', requireRole('viewer'), async (req, res) => {
    const { id } = await instrumentOr404(req.params.id);
    const certificate = await repo.certificate(id);
    if (!certificate) throw notFound(`Certificate of instrument ${id}`);
    res.setHeader('Content-Type', certificate.contentType);
    res.setHeader('Content-Disposition', `attachment; filename="${certificate.name.replace(/[^\x20-\x7e]|"/g, '_')}"`);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.send(await files.read(certificate.file));
  });

  router.get('/runs/:id/instruments', requireRole('viewer'), async (req, res) => {
    const runId = parseIdParam(req.params.id);
    if (!(await exists('runs', runId))) throw notFound(`Run ${runId}`);
    res.json({ instruments: await repo.ofRun(runId) });
  });

  return router;
}
