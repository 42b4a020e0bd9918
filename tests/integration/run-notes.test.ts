import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { liveAttachment } from '../../server/live/attach-live.js';
import { NoteHistoryResponseSchema, RunEventsResponseSchema } from '../../shared/schemas/api-runs.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, ManualFeed, sessionCookie, tempSpillDir, WsProbe } from './runs-kit.js';

const feed = new ManualFeed();
let t: TestContext;
let tech: SignedInAgent;
let otherTech: SignedInAgent;
let viewer: SignedInAgent;
let admin: SignedInAgent;
let ids: { batteryId: number; benchId: number };
const probes: WsProbe[] = [];

beforeAll(async () => {
  t = await createTestContext({ attachments: [liveAttachment({ feed, spillDir: tempSpillDir() })] });
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  admin = await signInAs(t, 'admin');
  ids = await batteryAndBench(admin);
  const other = { email: 'second.tech@test.lab', name: 'Second Technician', role: 'technician', password: 'second-tech-password' };
  await admin.post('/api/users').send(other).expect(201);
  otherTech = await signInAs(t, 'technician', { email: other.email, password: other.password });
});
afterAll(async () => {
  for (const p of probes) p.close();
  await t?.close();
});

const events = async (runId: number) => RunEventsResponseSchema.parse((await viewer.get(`/api/runs/${runId}/events`).expect(200)).body).events;
const history = async (runId: number) => NoteHistoryResponseSchema.parse((await viewer.get(`/api/runs/${runId}/note-history`).expect(200)).body).revisions;

describe('notes on a run: edited or removed by their author or an admin, history kept, viewers told live', () => {
  it('lets the author edit, refuses others, keeps the history and tells a live viewer', async () => {
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Notes run', stopWhen: 'manual' }).expect(201)).body.run;
    for (let s = 0; s < 5; s++) feed.emit(ids.benchId, { t: s, volts: 12.9, amps: 4, clock: 'device' });
    const note = (await tech.post(`/api/runs/${run.id}/events`).send({ text: 'fan on the pack' }).expect(201)).body.event;
    const p = await WsProbe.open(t, await sessionCookie(t, 'viewer'));
    probes.push(p);
    await p.next('hello');
    p.send({ type: 'subscribe', topic: { kind: 'run', id: run.id } });
    await p.next('snapshot');

    await viewer.patch(`/api/runs/${run.id}/events/${note.id}`).send({ text: 'not mine' }).expect(403);
    await otherTech.patch(`/api/runs/${run.id}/events/${note.id}`).send({ text: 'not mine either' }).expect(403);
    await tech.patch(`/api/runs/${run.id}/events/${note.id}`).send({ text: '' }).expect(400);
    await tech.patch(`/api/runs/${run.id}/events/${note.id}`).send({ text: 'fan on the pack, 30 cm away' }).expect(200);

    const told = await p.next('note');
    expect(told).toMatchObject({ eventId: note.id, previous: { text: 'fan on the pack' }, event: { text: 'fan on the pack, 30 cm away' } });
    expect((await events(run.id)).find((e) => e.id === note.id)?.event).toMatchObject({ type: 'annotation', text: 'fan on the pack, 30 cm away' });
    expect(await history(run.id)).toEqual([
      expect.objectContaining({ eventId: note.id, action: 'edited', previousText: 'fan on the pack', newText: 'fan on the pack, 30 cm away', changedByName: 'Test Technician' }),
    ]);
    // A viewer who opens the run later sees the note as it now reads.
    const late = await WsProbe.open(t, await sessionCookie(t, 'viewer'));
    probes.push(late);
    await late.next('hello');
    late.send({ type: 'subscribe', topic: { kind: 'run', id: run.id } });
    const snap = await late.next('snapshot');
    expect(snap.events.filter((e) => e.type === 'annotation').map((e) => (e.type === 'annotation' ? e.text : ''))).toEqual(['fan on the pack, 30 cm away']);

    // An admin removes it: gone from the timeline, kept in the history, viewers told.
    await admin.delete(`/api/runs/${run.id}/events/${note.id}`).expect(204);
    expect(await p.next('note', (m) => m.event === null)).toMatchObject({ eventId: note.id, previous: { text: 'fan on the pack, 30 cm away' } });
    expect((await events(run.id)).some((e) => e.id === note.id)).toBe(false);
    expect((await history(run.id)).map((r) => [r.action, r.previousText, r.newText])).toEqual([
      ['edited', 'fan on the pack', 'fan on the pack, 30 cm away'],
      ['removed', 'fan on the pack, 30 cm away', null],
    ]);
    await tech.delete(`/api/runs/${run.id}/events/${note.id}`).expect(404);
    await tech.post(`/api/runs/${run.id}/stop`).send({ abort: false }).expect(200);
  });

  it('never changes the detector’s events, nor an event of another run', async () => {
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Second notes run', stopWhen: 'manual' }).expect(201)).body.run;
    await tech.post(`/api/runs/${run.id}/stop`).send({ abort: false }).expect(200);
    const stored = await events(run.id);
    const start = stored.find((e) => e.event.type === 'run-start');
    expect(start).toBeDefined();
    await admin.patch(`/api/runs/${run.id}/events/${start!.id}`).send({ text: 'rewritten' }).expect(409);
    const note = (await tech.post(`/api/runs/${run.id}/events`).send({ text: 'opened the pack' }).expect(201)).body.event;
    await tech.patch(`/api/runs/${run.id + 1000}/events/${note.id}`).send({ text: 'elsewhere' }).expect(404);
    await tech.patch(`/api/runs/${run.id}/events/abc`).send({ text: 'bad id' }).expect(400);
    expect((await events(run.id)).find((e) => e.id === note.id)?.event).toMatchObject({ text: 'opened the pack' });
  });
});
