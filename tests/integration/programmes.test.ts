import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { liveAttachment } from '../../server/live/attach-live.js';
import { attachProgrammes } from '../../server/programmes/attach-programmes.js';
import { FakeBench, type FakePackSpec } from '../../server/control/testing/fake-bench.js';
import { FakeInstrument } from '../../server/control/testing/fake-instrument.js';
import { RunProgrammeSchema } from '../../shared/schemas/programme-run.js';
import type { ProgrammeInput } from '../../shared/schemas/programme.js';
import { formatCharge, formatEnergy } from '../../shared/units/format.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';

const feed = new ManualFeed();
let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let ids: { batteryId: number; benchId: number };
const load = new FakeInstrument('load-1', 'load', () => Date.now());
const supply = new FakeInstrument('supply-1', 'supply', () => Date.now(), false);

// A made-up 8-cell LFP pack (demo values): 24 V empty to 28 V full, 2 Ah, 20 mΩ; its protection 50 A.
const PACK: FakePackSpec = { emptyVolts: 24, fullVolts: 28, capacityAh: 2, resistanceOhms: 0.02, startSoc: 0.9, tempCelsius: 25 };
const PROGRAMME: ProgrammeInput = {
  name: 'Capacity, 8s LFP, 1 A',
  chemistry: 'lfp',
  cellsInSeries: 8,
  maxCurrentAmps: 50,
  steps: [
    { kind: 'charge', volts: 28, currentAmps: 1, taperAmps: 0.1 },
    { kind: 'rest', maxSeconds: 1 },
    { kind: 'discharge', mode: 'cc', value: 1, endVolts: 24.5 },
    { kind: 'rest', maxSeconds: 1 },
  ],
};
/** Meter seconds per frame, and real ms between frames: the meter's time runs fast so the test takes seconds. */
const METER_STEP_S = 20;
const FRAME_EVERY_MS = 40;

beforeAll(async () => {
  t = await createTestContext({
    attachments: [
      liveAttachment({ feed, spillDir: tempSpillDir() }),
      async (server, ctx) => {
        ctx.services.benchInstruments = { forBench: async () => ({ load, supply }) };
        return attachProgrammes(server, ctx);
      },
    ],
  });
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  ids = await batteryAndBench(await signInAs(t, 'admin'), { chemistry: 'lfp', cellsInSeries: 8, ratedAh: 2, bmsRatedAmps: 50 });
});
afterAll(() => t?.close());

/** Feeds the bench's frames in real time until `until` says stop; returns the bench. */
async function feedBench(bench: FakeBench, until: () => boolean, maxFrames = 5000): Promise<void> {
  for (let i = 0; i < maxFrames && !until(); i++) {
    const r = bench.step(METER_STEP_S);
    feed.emit(ids.benchId, { t: 1000 + r.elapsedSeconds, volts: r.volts, amps: r.amps, temps: r.temps, clock: 'device' });
    await new Promise((resolve) => setTimeout(resolve, FRAME_EVERY_MS));
  }
}

/** The text of a PDF the API serves (pdfjs-dist, as the runs test reads the report). */
async function pdfText(path: string): Promise<string> {
  const res = await viewer.get(path).buffer(true).parse((r, cb) => {
    const parts: Buffer[] = [];
    r.on('data', (c: Buffer) => parts.push(c));
    r.on('end', () => cb(null, Buffer.concat(parts)));
  }).expect(200);
  const { getDocument } = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const pdf = await getDocument({ data: new Uint8Array(res.body as Buffer), verbosity: 0 }).promise;
  const texts: string[] = [];
  for (let i = 1; i <= pdf.numPages; i++) {
    const content = await (await pdf.getPage(i)).getTextContent();
    texts.push(content.items.map((it) => ('str' in it ? it.str : '')).join(''));
  }
  return texts.join('\n');
}

async function startRun(name: string): Promise<number> {
  const res = await tech.post('/api/runs').send({ ...ids, name, stopWhen: 'manual', kind: 'capacity-discharge' }).expect(201);
  return res.body.run.id as number;
}

describe('test programmes: saved, reused, refused when unsafe', () => {
  let programmeId: number;

  it('a technician saves a programme; everyone signed in reads it', async () => {
    const res = await tech.post('/api/programmes').send(PROGRAMME).expect(201);
    programmeId = res.body.programme.id;
    expect(res.body.programme).toMatchObject({ name: PROGRAMME.name, steps: PROGRAMME.steps });
    const list = await viewer.get('/api/programmes').expect(200);
    expect(list.body.programmes.map((p: { id: number }) => p.id)).toContain(programmeId);
  });

  it('refuses an end voltage below the chemistry floor and a current above the protection rating, naming each', async () => {
    const unsafe = { ...PROGRAMME, steps: [{ kind: 'discharge', mode: 'cc', value: 60, endVolts: 19 }] };
    const res = await tech.post('/api/programmes').send(unsafe).expect(400);
    // LFP floor 2.5 V a cell × 8 = 20 V (makers' data sheets typical, from memory).
    expect(res.body.error.fields['steps.0.endVolts'][0]).toMatch(/19 V is below this pack's floor of 20 V/);
    expect(res.body.error.fields['steps.0.value'][0]).toMatch(/60 A, above the pack's protection rating of 50 A/);
  });

  it('a viewer cannot save, edit, remove, start, pause or abort a programme', async () => {
    await viewer.post('/api/programmes').send(PROGRAMME).expect(403);
    await viewer.put(`/api/programmes/${programmeId}`).send(PROGRAMME).expect(403);
    await viewer.delete(`/api/programmes/${programmeId}`).expect(403);
    const runId = await startRun('viewer check');
    await viewer.post(`/api/runs/${runId}/programme`).send({ programmeId, acknowledgeCautions: true }).expect(403);
    for (const action of ['pause', 'resume', 'skip', 'abort']) await viewer.post(`/api/runs/${runId}/programme/control`).send({ action }).expect(403);
    await tech.post(`/api/runs/${runId}/abort`).send({}).expect(200);
  });

  it("only an admin sets a bench's instruments; a driver with the wrong role or no port is refused", async () => {
    const admin = await signInAs(t, 'admin');
    const load = { protocol: 'scpi', id: 'l', role: 'load', port: { path: '/tmp/kp-nothing-here' }, commands: { mode: {}, setValue: {}, outputOn: 'INP ON', outputOff: 'INP OFF', readOutput: 'INP?' } };
    await tech.put(`/api/benches/${ids.benchId}/instruments`).send({ load }).expect(403);
    const wrong = await admin.put(`/api/benches/${ids.benchId}/instruments`).send({ supply: load }).expect(400);
    expect(JSON.stringify(wrong.body.error)).toMatch(/role supply/);
    await admin.put(`/api/benches/${ids.benchId}/instruments`).send({ load: { ...load, port: {} } }).expect(400);
    await admin.put('/api/benches/999999/instruments').send({}).expect(404);
    expect((await viewer.get(`/api/benches/${ids.benchId}/instruments`).expect(200)).body.instruments).toEqual({ load: null, supply: null });
  });

  it('will not start before the cautions are acknowledged', async () => {
    const runId = await startRun('cautions check');
    const res = await tech.post(`/api/runs/${runId}/programme`).send({ programmeId }).expect(400);
    expect(JSON.stringify(res.body.error)).toMatch(/acknowledge the cautions/);
    await tech.post(`/api/runs/${runId}/abort`).send({}).expect(200);
  });

  it('a run follows charge, rest, discharge, rest to the end, with each step\u2019s figures, and stops itself', async () => {
    const runId = await startRun('programme run');
    const bench = new FakeBench(PACK, load, supply);
    await tech.post(`/api/runs/${runId}/programme`).send({ programmeId, acknowledgeCautions: true }).expect(201);
    let state = 'starting';
    const watcher = setInterval(async () => {
      const r = await viewer.get(`/api/runs/${runId}/programme`);
      state = r.body.programme?.state ?? state;
    }, 200);
    await feedBench(bench, () => ['finished', 'failed', 'aborted'].includes(state));
    clearInterval(watcher);
    const { programme } = (await viewer.get(`/api/runs/${runId}/programme`).expect(200)).body;
    RunProgrammeSchema.parse(programme);
    expect(programme.state).toBe('finished');
    expect(programme.results.map((r: { cause: string }) => r.cause)).toEqual(['taper', 'time', 'end-voltage', 'time']);
    const discharge = programme.results[2];
    // Check value: the model's own Coulomb count (1 Ah = 3600 C, SI Brochure 9th ed. table 8), within 0.5 %.
    expect(Math.abs(discharge.dischargeAh - bench.truthDischargeAh) / bench.truthDischargeAh).toBeLessThan(0.005);
    expect(load.outputOn).toBe(false);
    expect(supply.outputOn).toBe(false);
    await eventually(async () => expect((await viewer.get(`/api/runs/${runId}`).expect(200)).body.run.state).toBe('finished'));
    const events = (await viewer.get(`/api/runs/${runId}/events`).expect(200)).body.events.map((e: { event: { type: string; phase?: string } }) => e.event);
    expect(events.filter((e: { type: string; phase?: string }) => e.type === 'programme-step' && e.phase === 'start')).toHaveLength(4);
    const log = await eventually(async () => {
      const body = (await viewer.get(`/api/runs/${runId}/command-log`).expect(200)).body;
      expect(body.commands.some((c: { sent: string }) => c.sent === 'output off')).toBe(true);
      return body.commands as Array<{ instrumentId: string; sent: string }>;
    });
    expect(log.some((c) => c.instrumentId === 'load-1' && c.sent === 'set cc 1')).toBe(true);
    // The report carries each step's figures, in the words and units the run page uses.
    const text = await pdfText(`/api/runs/${runId}/report.pdf`);
    expect(text).toContain('Test programme');
    expect(text).toContain(`3 discharge: done, ${discharge.reason}`);
    expect(text).toContain(`out ${formatCharge(discharge.dischargeAh)}, ${formatEnergy(discharge.dischargeWh)}`);
  });

  it('a technician pauses and resumes at the API; stopping the run by hand aborts the programme, outputs off', async () => {
    const runId = await startRun('paused then stopped');
    const bench = new FakeBench({ ...PACK, startSoc: 0.8 }, load, supply);
    const discharge = await tech.post('/api/programmes').send({ ...PROGRAMME, name: 'discharge to pause', steps: [PROGRAMME.steps[2]] }).expect(201);
    await tech.post(`/api/runs/${runId}/programme`).send({ programmeId: discharge.body.programme.id, acknowledgeCautions: true }).expect(201);
    let stop = false;
    const feeding = feedBench(bench, () => stop);
    await eventually(async () => expect(load.outputOn).toBe(true), 5000, 20);
    const paused = await tech.post(`/api/runs/${runId}/programme/control`).send({ action: 'pause' }).expect(200);
    expect(paused.body.programme.state).toBe('paused');
    await eventually(async () => expect(load.outputOn).toBe(false), 2000, 20);
    await tech.post(`/api/runs/${runId}/programme/control`).send({ action: 'resume' }).expect(200);
    await eventually(async () => expect(load.outputOn).toBe(true), 2000, 20);
    await tech.post(`/api/runs/${runId}/stop`).send({}).expect(200);
    await eventually(async () => expect(load.outputOn).toBe(false), 2000, 20);
    stop = true;
    await feeding;
    const { programme } = (await viewer.get(`/api/runs/${runId}/programme`).expect(200)).body;
    expect(programme).toMatchObject({ state: 'aborted', failReason: 'aborted by a technician' });
    await tech.post(`/api/runs/${runId}/programme/control`).send({ action: 'skip' }).expect(409);
    await eventually(async () => {
      const events = (await viewer.get(`/api/runs/${runId}/events`).expect(200)).body.events as Array<{ event: { type: string; phase?: string } }>;
      expect(events.filter((e) => e.event.type === 'programme-step').map((e) => e.event.phase)).toEqual(['start', 'pause', 'resume', 'abort']);
    });
  });

  it('meter silent: the load is off within 2 s, and the run says why', async () => {
    const runId = await startRun('silent meter');
    const bench = new FakeBench({ ...PACK, startSoc: 0.8 }, load, supply);
    const discharge = await tech.post('/api/programmes').send({ ...PROGRAMME, name: 'discharge only', steps: [PROGRAMME.steps[2]] }).expect(201);
    await tech.post(`/api/runs/${runId}/programme`).send({ programmeId: discharge.body.programme.id, acknowledgeCautions: true }).expect(201);
    await feedBench(bench, () => false, 30);
    expect(load.outputOn).toBe(true);
    const silentSince = Date.now();
    await eventually(async () => expect(load.outputOn).toBe(false), 5000, 20);
    expect(Date.now() - silentSince).toBeLessThanOrEqual(2000);
    const { programme } = (await viewer.get(`/api/runs/${runId}/programme`).expect(200)).body;
    expect(programme).toMatchObject({ state: 'failed', failReason: expect.stringMatching(/meter silent/) });
    await eventually(async () => expect((await viewer.get(`/api/runs/${runId}`).expect(200)).body.run.state).toBe('aborted'));
  });
});
