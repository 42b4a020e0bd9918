// vocab-rename: keep (rows and requests written before the rename say `t` on purpose)
import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RunEventsResponseSchema } from '../../shared/schemas/api-runs.js';
import { SignoffDetailResponseSchema, SignoffHistoryResponseSchema } from '../../shared/schemas/signoff.js';
import { canonicalJson } from '../../server/signoff/canonical-json.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { binaryBody, pdfText } from './helpers/pdf-text.js';

let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let admin: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext();
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  admin = await signInAs(t, 'admin');
});
afterAll(() => t?.close());

/** An imported run: 1 A for 1 h at 12 V (constant values), ended. */
async function importedRun(name: string): Promise<number> {
  const csv = 'time_s,voltage_v,current_a\n' + Array.from({ length: 361 }, (_, i) => `${i * 10},12,1`).join('\n') + '\n';
  const res = await tech.post('/api/runs/import').field('name', name).field('currentSign', 'discharge-positive').attach('file', Buffer.from(csv), 'run.csv').expect(201);
  return res.body.run.id as number;
}

/** Stores an event row as a server from before the rename wrote it: its JSON as given, run time in the `t` column. */
async function storeOldEvent(runId: number, data: Record<string, unknown>): Promise<void> {
  await t.ctx.sequelize.query('INSERT INTO run_events (runId, eventSeq, type, elapsedSeconds, data, createdById, createdAt) VALUES (?, NULL, ?, ?, ?, NULL, NOW(3))', {
    replacements: [runId, data.type, data.t, JSON.stringify(data)],
  });
}

const events = async (runId: number) => RunEventsResponseSchema.parse((await viewer.get(`/api/runs/${runId}/events`).expect(200)).body).events.map((e) => e.event);

describe('run time is elapsedSeconds on the API', () => {
  it('reads event rows stored with the old t, endT and cutoffT under the new names', async () => {
    const runId = await importedRun('old event rows');
    await storeOldEvent(runId, { type: 'gap', t: 100, endT: 160, gapSeconds: 60 });
    await storeOldEvent(runId, { type: 'recovery', t: 620, cutoffT: 500, recoverySeconds: 120, volts: 12.9 });
    await storeOldEvent(runId, { type: 'annotation', t: 60, text: 'kept from before the rename', author: 'Northgate technician' });
    const read = await events(runId);
    expect(read).toContainEqual({ type: 'gap', elapsedSeconds: 100, endElapsedSeconds: 160, gapSeconds: 60 });
    expect(read).toContainEqual({ type: 'recovery', elapsedSeconds: 620, cutoffElapsedSeconds: 500, recoverySeconds: 120, volts: 12.9 });
    expect(read).toContainEqual({ type: 'annotation', elapsedSeconds: 60, text: 'kept from before the rename', author: 'Northgate technician' });
    expect(read.some((e) => 't' in e || 'endT' in e || 'cutoffT' in e)).toBe(false);
    // Nothing stored was rewritten by reading it.
    const [row] = await t.ctx.sequelize.query<{ data: string }>("SELECT data FROM run_events WHERE runId = ? AND type = 'gap'", { replacements: [runId], type: QueryTypes.SELECT });
    expect(JSON.parse(row!.data)).toEqual({ type: 'gap', t: 100, endT: 160, gapSeconds: 60 });
  });

  it('takes a note at elapsedSeconds, and at the deprecated t from old clients', async () => {
    const runId = await importedRun('annotate both spellings');
    const now = await tech.post(`/api/runs/${runId}/events`).send({ text: 'new client', elapsedSeconds: 30 }).expect(201);
    expect(now.body.event.event).toEqual({ type: 'annotation', elapsedSeconds: 30, text: 'new client', author: 'Test Technician' });
    const old = await tech.post(`/api/runs/${runId}/events`).send({ text: 'old client', t: 40 }).expect(201);
    expect(old.body.event.event).toEqual({ type: 'annotation', elapsedSeconds: 40, text: 'old client', author: 'Test Technician' });
    // A run time before the run's origin is refused under the current name, whichever spelling was sent.
    for (const body of [{ text: 'before the start', t: -1 }, { text: 'before the start', elapsedSeconds: -1 }]) {
      const refused = await tech.post(`/api/runs/${runId}/events`).send(body).expect(400);
      expect(refused.body.error.fields).toHaveProperty('elapsedSeconds');
    }
    expect((await events(runId)).filter((e) => e.type === 'annotation').map((e) => e.elapsedSeconds)).toEqual([30, 40]);
  });

  it('a sign-off frozen before the rename still verifies over its stored bytes, still holds, and renders', async () => {
    const runId = await importedRun('signed before the rename');
    await storeOldEvent(runId, { type: 'annotation', t: 60, text: 'kept from before the rename', author: 'Northgate technician' });
    await tech.post(`/api/runs/${runId}/signoffs/ready`).send({ comment: 'for review' }).expect(201);
    await admin.post(`/api/runs/${runId}/signoffs`).send({ comment: 'Meets the rating' }).expect(201);
    // Rewrite the entry as the server before the rename froze it: notes said `t`, hashed over that text.
    const [entry] = await t.ctx.sequelize.query<{ id: number; snapshot: string }>(
      "SELECT id, snapshot FROM run_signoffs WHERE runId = ? AND action = 'signed'",
      { replacements: [runId], type: QueryTypes.SELECT },
    );
    const frozen = JSON.parse(entry!.snapshot) as { notes: { eventId: number; elapsedSeconds: number; text: string; author: string | null }[] };
    const oldText = canonicalJson({ ...frozen, notes: frozen.notes.map(({ elapsedSeconds, ...note }) => ({ ...note, t: elapsedSeconds })) });
    expect(oldText).toContain('"t":60');
    const oldHash = createHash('sha256').update(oldText, 'utf8').digest('hex');
    await t.ctx.sequelize.query('UPDATE run_signoffs SET snapshot = ?, contentHash = ? WHERE id = ?', { replacements: [oldText, oldHash, entry!.id] });

    const history = SignoffHistoryResponseSchema.parse((await viewer.get(`/api/runs/${runId}/signoffs`).expect(200)).body);
    expect(history.status).toBe('signed');
    expect(history.entries[0]).toMatchObject({ id: entry!.id, contentHash: oldHash, state: 'current' });
    const detail = SignoffDetailResponseSchema.parse((await viewer.get(`/api/runs/${runId}/signoffs/${entry!.id}`).expect(200)).body);
    expect(detail.verified).toBe(true);
    expect(detail.snapshot.notes).toEqual([expect.objectContaining({ elapsedSeconds: 60, text: 'kept from before the rename' })]);

    const pdf = await viewer.get(`/api/runs/${runId}/report.pdf`).buffer(true).parse(binaryBody).expect(200);
    const text = await pdfText(pdf.body as Buffer);
    expect(text).toContain('kept from before the rename');
    expect(text).toContain(oldHash);
    expect(text).not.toContain('NaN');
    // The stored bytes are as written: display read them with new keys, the hash was checked over them.
    const [after] = await t.ctx.sequelize.query<{ snapshot: string }>('SELECT snapshot FROM run_signoffs WHERE id = ?', { replacements: [entry!.id], type: QueryTypes.SELECT });
    expect(after!.snapshot).toBe(oldText);

    // A stored snapshot whose bytes no longer match its hash is reported as not verified.
    await t.ctx.sequelize.query('UPDATE run_signoffs SET snapshot = ? WHERE id = ?', { replacements: [oldText.replace('"t":60', '"t":61'), entry!.id] });
    const tampered = SignoffDetailResponseSchema.parse((await viewer.get(`/api/runs/${runId}/signoffs/${entry!.id}`).expect(200)).body);
    expect(tampered.verified).toBe(false);
  });
});
