import { closeSync, openSync, writeSync } from 'node:fs';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { RunsRepo } from '../../server/runs/runs-repo.js';
import { openPtyPair, type PtyPair } from '../../simulator/transport/socat.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { eventually, tempSpillDir } from './runs-kit.js';

/**
 * Absurd meter values through the real serial path and the real API: a JSON-lines meter on
 * a socat pseudo-terminal sends one frame with volts and amps of 1e200 in the middle of an
 * ordinary discharge. It must be counted as a bad frame with its reason, the run must carry
 * on with finite figures, every run list must keep answering, and stop must end the run.
 */
const LINK = `/tmp/kneepoint-huge-${process.pid}`;
const LINK_SMALL = `/tmp/kneepoint-huge-small-${process.pid}`;
const HUGE_LINE = '{"t":10,"volts":1e200,"amps":1e200}';

let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;
let viewer: SignedInAgent;
const pairs: PtyPair[] = [];
const fds: number[] = [];

beforeAll(async () => {
  t = await createTestContext({ attachments: [attachBenchManager, liveAttachment({ spillDir: tempSpillDir() })] });
  [admin, tech, viewer] = await Promise.all([signInAs(t, 'admin'), signInAs(t, 'technician'), signInAs(t, 'viewer')]);
});
afterAll(async () => {
  for (const fd of fds) closeSync(fd);
  for (const p of pairs) await p.close();
  await t?.close();
});

/** A JSON-lines bench on a fresh pseudo-terminal; returns its id and a writer for meter lines. */
async function jsonlBench(link: string, limits?: object): Promise<{ benchId: number; send: (line: string) => void }> {
  const pair = await openPtyPair(link);
  pairs.push(pair);
  const fd = openSync(pair.devicePath, 'w');
  fds.push(fd);
  const source = { kind: 'serial', path: link, format: { kind: 'jsonl' }, ...(limits && { limits }) };
  const bench = (await admin.post('/api/benches').send({ name: `JSON-lines meter ${link}`, source }).expect(201)).body.bench;
  await eventually(async () => expect(t.ctx.services.benchManager!.getStatus(bench.id).state).toMatch(/connected|receiving/));
  return { benchId: bench.id, send: (line) => void writeSync(fd, line + '\n') };
}

/** Trapezoid of V·I and I over (t, V, A) rows, in Wh and Ah: the test's own integration. */
function trapezoid(rows: readonly [number, number, number][]): { wh: number; ah: number } {
  let ws = 0;
  let as = 0;
  for (let i = 1; i < rows.length; i++) {
    const [t0, v0, a0] = rows[i - 1]!;
    const [t1, v1, a1] = rows[i]!;
    ws += ((v0 * a0 + v1 * a1) / 2) * (t1 - t0);
    as += ((a0 + a1) / 2) * (t1 - t0);
  }
  return { wh: ws / 3600, ah: as / 3600 };
}

describe('a meter value far outside sense', () => {
  it('is a bad frame with its reason; the run records on with finite figures, lists answer and stop ends it', async () => {
    const { benchId, send } = await jsonlBench(LINK);
    const battery = (await tech.post('/api/batteries').send({ label: '12.8 V 20 Ah', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 20, price: 180, massKg: 2.4 }).expect(201)).body.battery;
    const run = (await tech.post('/api/runs').send({ benchId, batteryId: battery.id, name: 'Huge value in the middle', stopWhen: 'manual' }).expect(201)).body.run;

    const good: [number, number, number][] = [];
    for (let s = 0; s <= 20; s++) {
      if (s === 10) {
        send(HUGE_LINE);
        continue;
      }
      const row: [number, number, number] = [s, 13.2 - s * 0.01, 10 + (s % 3) * 0.5];
      good.push(row);
      send(JSON.stringify({ t: row[0], volts: row[1], amps: row[2] }));
    }
    const status = await eventually(async () => {
      const b = (await viewer.get(`/api/benches/${benchId}`).expect(200)).body.bench;
      expect(b.status.framesOk).toBe(good.length);
      expect(b.status.framesRejected).toBe(1);
      return b.status;
    });
    expect(status.lastRejection).toBe('volts 1e+200 beyond ±2000 V');

    const live = await eventually(async () => {
      const r = (await viewer.get(`/api/runs/${run.id}`).expect(200)).body.run;
      expect(r.readingsCount).toBe(good.length);
      return r;
    });
    expect((await viewer.get('/api/runs').expect(200)).body.runs.map((r: { id: number }) => r.id)).toContain(run.id);
    const expected = trapezoid(good);
    expect(live.summary.dischargeWh).toBeCloseTo(expected.wh, 12);
    expect(live.summary.dischargeAh).toBeCloseTo(expected.ah, 12);

    const stopped = (await tech.post(`/api/runs/${run.id}/stop`).expect(200)).body.run;
    expect(stopped.state).toBe('finished');
    const stored = await eventually(async () => {
      const r = (await viewer.get(`/api/runs/${run.id}`).expect(200)).body.run;
      expect(r.state).toBe('finished');
      expect(r.summary).not.toBeNull();
      return r;
    });
    expect(stored.summary.dischargeWh).toBeCloseTo(expected.wh, 12);
    expect(stored.summary.readings).toBe(good.length);
  }, 60_000);

  it('takes a bench\'s own bounds from the API', async () => {
    const { benchId, send } = await jsonlBench(LINK_SMALL, { maxAbsVolts: 60, maxAbsAmps: 100, minTempCelsius: -40, maxTempCelsius: 90 });
    expect((await viewer.get(`/api/benches/${benchId}`).expect(200)).body.bench.source.limits).toEqual({ maxAbsVolts: 60, maxAbsAmps: 100, minTempCelsius: -40, maxTempCelsius: 90 });
    send('{"t":1,"volts":13.1,"amps":5}');
    send('{"t":2,"volts":61,"amps":5}');
    send('{"t":3,"volts":13.1,"amps":150}');
    send('{"t":4,"volts":13.0,"amps":5}');
    const status = await eventually(async () => {
      const s = (await viewer.get(`/api/benches/${benchId}`).expect(200)).body.bench.status;
      expect([s.framesOk, s.framesRejected]).toEqual([2, 2]);
      return s;
    });
    expect(status.lastRejection).toBe('amps 150 beyond ±100 A');
    await admin.patch(`/api/benches/${benchId}`).send({ source: { kind: 'serial', path: LINK_SMALL, format: { kind: 'jsonl' }, limits: { minTempCelsius: 50, maxTempCelsius: 20 } } }).expect(400);
  }, 30_000);

  it('keeps the lists answering and stop working when a run\'s figures are broken anyway', async () => {
    const { benchId } = await (async () => {
      const bench = (await admin.post('/api/benches').send({ name: 'No meter yet', source: { kind: 'none' } }).expect(201)).body.bench;
      return { benchId: bench.id as number };
    })();
    const battery = (await tech.post('/api/batteries').send({ label: '12.8 V 10 Ah', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 10 }).expect(201)).body.battery;
    const run = (await tech.post('/api/runs').send({ benchId, batteryId: battery.id, name: 'Broken figures', stopWhen: 'manual' }).expect(201)).body.run;
    // Figures an older server wrote with Infinity in them (JSON turns it into null) …
    const finished = (await tech.post('/api/runs').send({ benchId: (await admin.post('/api/benches').send({ name: 'Spare', source: { kind: 'none' } }).expect(201)).body.bench.id, batteryId: battery.id, name: 'Stored bad', stopWhen: 'manual' }).expect(201)).body.run;
    await tech.post(`/api/runs/${finished.id}/stop`).expect(200);
    await eventually(async () => expect((await viewer.get(`/api/runs/${finished.id}`).expect(200)).body.run.state).toBe('finished'));
    await t.ctx.sequelize.query('UPDATE runs SET summary = ? WHERE id = ?', { replacements: [JSON.stringify({ dischargeWh: null, durationSeconds: 'x' }), finished.id], type: QueryTypes.UPDATE });
    // … and a live run whose figures cannot be computed (the core refuses such frames; this forces it).
    const session = t.ctx.services.runRecorder!.session(run.id)!;
    const real = session.pipeline.snapshot.bind(session.pipeline);
    session.pipeline.snapshot = () => {
      const s = real();
      s.integrator.dischargeWs.sum = Number.POSITIVE_INFINITY;
      return s;
    };
    const list = (await viewer.get('/api/runs').expect(200)).body.runs as { id: number; summary: unknown }[];
    expect(list.find((r) => r.id === finished.id)?.summary).toBeNull();
    expect(list.map((r) => r.id)).toContain(run.id);
    await viewer.get(`/api/runs/${run.id}`).expect(200);
    await viewer.get(`/api/runs/${finished.id}`).expect(200);
    expect((await tech.post(`/api/runs/${run.id}/stop`).expect(200)).body.run.state).toBe('finished');
    await eventually(async () => expect((await viewer.get(`/api/runs/${run.id}`).expect(200)).body.run.state).toBe('finished'));
  }, 30_000);

  it('ends a run stuck "recording" without a live session (its stored state could not be resumed)', async () => {
    const battery = (await tech.post('/api/batteries').send({ label: '12.8 V 30 Ah', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 30 }).expect(201)).body.battery;
    const repo = new RunsRepo(t.ctx.sequelize);
    const config = { kind: 'capacity-discharge' as const, endVolts: null, acceptancePercent: 100, alarms: { onCutoff: true }, stopWhen: 'manual' as const, targetAh: null, targetWh: null, afterRecoverySeconds: 0 };
    const stuck = await repo.create({ name: 'Stuck', tags: [], origin: 'live', benchId: null, batteryId: battery.id, state: 'recording', config, createdById: null, startedAt: new Date() });
    const aborted = await repo.create({ name: 'Stuck too', tags: [], origin: 'live', benchId: null, batteryId: battery.id, state: 'cutoff', config, createdById: null, startedAt: new Date() });
    await t.ctx.sequelize.query('UPDATE runs SET pipelineState = ? WHERE id IN (?, ?)', { replacements: ['{"version":1,"pipeline":null}', stuck.id, aborted.id], type: QueryTypes.UPDATE });
    expect((await tech.post(`/api/runs/${stuck.id}/stop`).expect(200)).body.run.state).toBe('finished');
    expect((await tech.post(`/api/runs/${aborted.id}/abort`).expect(200)).body.run.state).toBe('aborted');
    await eventually(async () => {
      const r = (await viewer.get(`/api/runs/${stuck.id}`).expect(200)).body.run;
      expect([r.state, r.endedAt !== null]).toEqual(['finished', true]);
      expect((await viewer.get(`/api/runs/${aborted.id}`).expect(200)).body.run.state).toBe('aborted');
    });
    // Ended runs are no longer live: a second stop is refused as before.
    await tech.post(`/api/runs/${stuck.id}/stop`).expect(409);
  }, 30_000);
});
