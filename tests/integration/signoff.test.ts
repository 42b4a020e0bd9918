import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SignoffDetailResponseSchema, SignoffHistoryResponseSchema } from '../../shared/schemas/signoff.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

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

const review = async (runId: number) => SignoffHistoryResponseSchema.parse((await viewer.get(`/api/runs/${runId}/signoffs`).expect(200)).body);
const readyAndSign = async (runId: number, comment: string) => {
  await tech.post(`/api/runs/${runId}/signoffs/ready`).send({ comment: 'for review' }).expect(201);
  const { currentHash } = await review(runId);
  return (await admin.post(`/api/runs/${runId}/signoffs`).send({ comment, contentHash: currentHash }).expect(201)).body;
};

describe('sign-off of a run', () => {
  it('enforces roles: a viewer cannot mark or sign, a technician only marks, an admin signs', async () => {
    const runId = await importedRun('roles');
    await viewer.post(`/api/runs/${runId}/signoffs/ready`).send({}).expect(403);
    await tech.post(`/api/runs/${runId}/signoffs/ready`).send({}).expect(201);
    await tech.post(`/api/runs/${runId}/signoffs`).send({ comment: 'I sign my own' }).expect(403);
    await viewer.post(`/api/runs/${runId}/signoffs`).send({ comment: 'no' }).expect(403);
    await admin.post(`/api/runs/${runId}/signoffs`).send({ comment: '' }).expect(400);
    const signed = await admin.post(`/api/runs/${runId}/signoffs`).send({ comment: 'Checked against the rating' }).expect(201);
    expect(signed.body.status).toBe('signed');
    expect(signed.body.entries[0]).toMatchObject({ action: 'signed', byName: 'Test Admin', byRole: 'admin', comment: 'Checked against the rating', state: 'current' });
  });

  it('refuses to sign a run not marked ready, a run that changed since it was looked at, and an unknown run', async () => {
    const runId = await importedRun('not ready');
    const none = await admin.post(`/api/runs/${runId}/signoffs`).send({ comment: 'too early' }).expect(409);
    expect(none.body.error.message).toMatch(/not marked ready/);
    await tech.post(`/api/runs/${runId}/signoffs/ready`).send({}).expect(201);
    await tech.post(`/api/runs/${runId}/signoffs/ready`).send({}).expect(409);
    const { currentHash } = await review(runId);
    await tech.patch(`/api/runs/${runId}`).send({ name: 'renamed meanwhile' }).expect(200);
    const changed = await admin.post(`/api/runs/${runId}/signoffs`).send({ comment: 'ok', contentHash: currentHash }).expect(409);
    expect(changed.body.error.message).toMatch(/changed since/);
    await admin.post('/api/runs/999999/signoffs').send({ comment: 'ok' }).expect(404);
    await viewer.get('/api/runs/999999/signoffs').expect(404);
  });

  it('freezes the signed result; a later note, rename, tag or pack link supersedes it until a new sign-off, and the history shows both', async () => {
    const runId = await importedRun('frozen');
    const note = (await tech.post(`/api/runs/${runId}/events`).send({ text: 'terminals torqued' }).expect(201)).body.event;
    await readyAndSign(runId, 'First sign-off');
    const first = await review(runId);
    expect(first.status).toBe('signed');
    const firstId = first.entries[0]!.id;
    const frozen = SignoffDetailResponseSchema.parse((await viewer.get(`/api/runs/${runId}/signoffs/${firstId}`).expect(200)).body);
    expect(frozen.snapshot.notes).toEqual([expect.objectContaining({ eventId: note.id, text: 'terminals torqued' })]);
    // 1 A for 1 h: 1 Ah (constant values, exact) as summarised at the moment of signing.
    expect(frozen.snapshot.summary?.dischargeAh).toBeCloseTo(1, 6);

    // Editing the note supersedes the sign-off; the frozen snapshot keeps the old text.
    await tech.patch(`/api/runs/${runId}/events/${note.id}`).send({ text: 'terminals torqued to 5 N·m' }).expect(200);
    const afterEdit = await review(runId);
    expect(afterEdit.status).toBe('superseded');
    expect(afterEdit.entries.every((e) => e.state === 'superseded')).toBe(true);
    const still = SignoffDetailResponseSchema.parse((await viewer.get(`/api/runs/${runId}/signoffs/${firstId}`).expect(200)).body);
    expect(still.snapshot.notes[0]!.text).toBe('terminals torqued');
    expect(still.entry.state).toBe('superseded');

    await readyAndSign(runId, 'Second sign-off');
    const second = await review(runId);
    expect(second.status).toBe('signed');
    const signed = second.entries.filter((e) => e.action === 'signed');
    expect(signed.map((e) => [e.comment, e.state])).toEqual([['Second sign-off', 'current'], ['First sign-off', 'superseded']]);
    expect(signed[0]!.contentHash).not.toBe(signed[1]!.contentHash);

    // Each other kind of change supersedes again.
    const changes: Array<() => Promise<unknown>> = [
      () => tech.post(`/api/runs/${runId}/events`).send({ text: 'a later note' }).expect(201),
      () => tech.patch(`/api/runs/${runId}`).send({ tags: ['retest'] }).expect(200),
      () => tech.patch(`/api/runs/${runId}`).send({ name: 'frozen (renamed)' }).expect(200),
      async () => {
        const b = await admin.post('/api/batteries').send({ label: 'Pack S-1', brand: 'Corvane', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 1 }).expect(201);
        await tech.put(`/api/batteries/${b.body.battery.id}/runs/${runId}`).expect(200);
      },
      () => tech.delete(`/api/runs/${runId}/events/${note.id}`).expect(204),
    ];
    for (const change of changes) {
      await change();
      expect((await review(runId)).status).toBe('superseded');
      await readyAndSign(runId, 'again');
      expect((await review(runId)).status).toBe('signed');
    }
    expect((await review(runId)).entries.filter((e) => e.action === 'signed')).toHaveLength(2 + changes.length);
  });

  it('keeps the history when a run is renamed back: the change itself needs a new sign-off', async () => {
    const runId = await importedRun('round trip');
    await readyAndSign(runId, 'signed');
    await tech.patch(`/api/runs/${runId}`).send({ name: 'other' }).expect(200);
    await tech.patch(`/api/runs/${runId}`).send({ name: 'round trip' }).expect(200);
    expect((await review(runId)).status).toBe('superseded');
  });
});
