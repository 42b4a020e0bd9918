import { formatCharge, formatEnergy, formatPercent, formatTemperature } from '../../shared/units/format.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { liveAttachment } from '../../server/live/attach-live.js';
import { ListRunsResponseSchema, RunEventsResponseSchema, RunResponseSchema, ReadingsResponseSchema } from '../../shared/schemas/api-runs.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';

const feed = new ManualFeed();
let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let ids: { batteryId: number; benchId: number };

beforeAll(async () => {
  t = await createTestContext({ attachments: [liveAttachment({ feed, spillDir: tempSpillDir() })] });
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  ids = await batteryAndBench(await signInAs(t, 'admin'));
});
afterAll(() => t?.close());

// A linear voltage ramp at constant current: the trapezoidal rule is exact for a linear
// integrand, so Wh and Ah have closed forms (any calculus text: ∫(a − b·t)·I dt).
const AMPS = 5;
const V0 = 13.2;
const SLOPE_V_PER_S = 0.001;
const END_VOLTS = 10.4;
const volts = (t: number) => V0 - SLOPE_V_PER_S * t;

describe('a live run', () => {
  let runId: number;

  it('starts armed on a bench for a registered battery (technician)', async () => {
    const res = await tech
      .post('/api/runs')
      .send({ ...ids, name: 'Capacity check Voltara A-12', tags: ['acceptance', 'lfp'], endVolts: { mode: 'absolute', volts: END_VOLTS }, stopWhen: 'after-recovery' })
      .expect(201);
    runId = res.body.run.id;
    expect(res.body.run).toMatchObject({ state: 'armed', benchId: ids.benchId, kind: 'capacity-discharge', tags: ['acceptance', 'lfp'] });
    await tech.post('/api/runs').send({ ...ids, name: 'second' }).expect(409);
  });

  it('refuses a viewer, and a start for a battery that does not exist', async () => {
    await viewer.post('/api/runs').send({ ...ids, name: 'x' }).expect(403);
    const res = await tech.post('/api/runs').send({ benchId: ids.benchId + 1000, batteryId: 999_999, name: 'x' }).expect(400);
    expect(res.body.error.fields.benchId).toBeDefined();
    const res2 = await tech.post('/api/runs').send({ benchId: ids.benchId, batteryId: 999_999, name: 'x' }).expect(409);
    expect(res2.body.error.message).toMatch(/already recording/);
  });

  it('integrates every frame on the server, cuts off at the end voltage and finishes by itself', async () => {
    for (let s = 0; s <= 3000; s++) feed.emit(ids.benchId, { t: 5000 + s, volts: volts(s), amps: AMPS, temps: { cell: 25 }, clock: 'device' });
    const run = await eventually(async () => {
      const r = await viewer.get(`/api/runs/${runId}`).expect(200);
      expect(r.body.run.state).toBe('finished');
      return r.body.run;
    });
    const eventsBody = (await viewer.get(`/api/runs/${runId}/events`).expect(200)).body;
    RunEventsResponseSchema.parse(eventsBody); // the shape the client validates with
    RunResponseSchema.parse({ run });
    const events = eventsBody.events.map((e: { event: { type: string } }) => e.event);
    const cutoffs = events.filter((e: { type: string }) => e.type === 'cutoff');
    expect(cutoffs).toHaveLength(1);
    const cut = cutoffs[0];
    expect(cut.cause).toBe('end-voltage');
    // Closed form up to the cutoff time: Ah = I·T/3600, Wh = I·(V0·T − b·T²/2)/3600.
    const T = cut.elapsedSeconds;
    expect(cut.dischargeAh).toBeCloseTo((AMPS * T) / 3600, 9);
    expect(cut.dischargeWh).toBeCloseTo((AMPS * (V0 * T - (SLOPE_V_PER_S * T * T) / 2)) / 3600, 9);
    expect(volts(T)).toBeCloseTo(END_VOLTS, 9); // the crossing, interpolated between readings
    expect(run.summary.dischargeAh).toBeCloseTo((AMPS * run.summary.durationSeconds) / 3600, 9);
    expect(run.readingsCount).toBe(run.summary.readings);
    expect(events.map((e: { type: string }) => e.type)).toEqual(expect.arrayContaining(['run-start', 'cutoff', 'alarm', 'run-stop']));
    // Frames after the end are not recorded.
    feed.emit(ids.benchId, { t: 9000, volts: 12, amps: 1, clock: 'device' });
    await tech.post(`/api/runs/${runId}/stop`).send({}).expect(409);
  });

  it('serves the history reduced to min/max buckets, and in full for a small window', async () => {
    const reduced = ReadingsResponseSchema.parse((await viewer.get(`/api/runs/${runId}/readings?maxPoints=100`).expect(200)).body);
    expect(reduced.reduced).toBe(true);
    expect(reduced.x).toHaveLength(100);
    expect(reduced.volts.max[0]).toBeCloseTo(V0, 9);
    expect(Math.min(...reduced.volts.min.filter((v: number | null) => v !== null))).toBeLessThan(END_VOLTS);
    expect(reduced.temps.cell.max[50]).toBe(25);
    const full = (await viewer.get(`/api/runs/${runId}/readings?from=100&to=109&maxPoints=50`).expect(200)).body;
    expect(full.reduced).toBe(false);
    expect(full.x).toEqual([100, 101, 102, 103, 104, 105, 106, 107, 108, 109]);
    expect(full.volts.min[0]).toBeCloseTo(volts(100), 12);
    await viewer.get(`/api/runs/${runId}/readings?from=10&to=5`).expect(400);
    // Ten buckets over ~3,000 readings: served from the stored 64-reading min/max groups.
    const coarse = (await viewer.get(`/api/runs/${runId}/readings?maxPoints=10`).expect(200)).body;
    const run = (await viewer.get(`/api/runs/${runId}`)).body.run;
    expect(coarse.readingsInWindow).toBe(run.readingsCount);
    expect(coarse.volts.max[0]).toBeCloseTo(V0, 9);
    expect(Math.min(...coarse.volts.min)).toBe(Math.min(...reduced.volts.min.filter((v: number | null) => v !== null)));
  });

  it('answers the old history address /samples exactly as /readings, for clients written before the rename', async () => {
    const path = `/api/runs/${runId}/readings?from=100&to=109&maxPoints=50`;
    const current = (await viewer.get(path).expect(200)).body;
    const old = (await viewer.get(path.replace('/readings', '/samples')).expect(200)).body; // vocab-rename: keep
    expect(old).toEqual(current);
    expect(current.x).toHaveLength(10);
    await viewer.get(`/api/runs/${runId}/samples?from=10&to=5`).expect(400); // vocab-rename: keep
  });

  it('exports every reading as CSV after a metadata block, and as JSON', async () => {
    const run = (await viewer.get(`/api/runs/${runId}`)).body.run;
    const csv = await viewer.get(`/api/runs/${runId}/export.csv`).expect(200).expect('content-type', /text\/csv/);
    const lines = csv.text.trim().split('\n');
    const meta = lines.filter((l) => l.startsWith('#'));
    expect(meta.join('\n')).toMatch(/battery: Voltara Pack A-12 \(lfp, 4S, rated 10 Ah\)/);
    expect(meta.join('\n')).toMatch(/units: .*amps A \(positive = discharge\)/);
    const header = lines[meta.length]!.split(',');
    expect(header).toEqual(['elapsedSeconds', 't', 'volts', 'amps', 'watts', 'dischargeWh', 'dischargeAh', 'chargeWh', 'chargeAh', 'temp_cell_c']);
    const rows = lines.slice(meta.length + 1);
    expect(rows).toHaveLength(run.readingsCount);
    expect(Number(rows[10]!.split(',')[2])).toBe(volts(10));
    const json = await viewer.get(`/api/runs/${runId}/export.json`).expect(200);
    const doc = JSON.parse(json.text);
    expect(doc.rows).toHaveLength(run.readingsCount);
    expect(doc.meta.run.id).toBe(runId);
    // One name per column in both formats, and numbers without float noise or exponents
    // (watts = V × A would otherwise carry binary tails such as 595.3199999999999).
    expect(doc.columns).toEqual(header);
    // Only the readings' numbers: the metadata holds free text and hashes whose letters are no exponent.
    const numbers = [...rows.join(',').split(','), ...(json.text.slice(json.text.indexOf('"rows":')).match(/-?\d[\d.eE+-]*/g) ?? [])].filter((x) => x !== '');
    expect(numbers.filter((x) => /e/i.test(x))).toEqual([]);
    const decimalsOf = (x: string) => (x.includes('.') ? x.split('.')[1]!.length : 0);
    expect(Math.max(...rows.map((r) => decimalsOf(r.split(',')[4]!)))).toBeLessThanOrEqual(3);
    expect(Math.max(...numbers.map(decimalsOf))).toBeLessThanOrEqual(4);
  });

  it('lets a technician annotate and rename, never a viewer; list filters by name, tag, battery and state', async () => {
    await viewer.post(`/api/runs/${runId}/events`).send({ text: 'smell of hot plastic' }).expect(403);
    const note = await tech.post(`/api/runs/${runId}/events`).send({ elapsedSeconds: 120, text: 'fan moved closer' }).expect(201);
    expect(note.body.event.event).toMatchObject({ type: 'annotation', elapsedSeconds: 120, text: 'fan moved closer' });
    await tech.post(`/api/runs/${runId}/events`).send({ text: '' }).expect(400);
    await tech.post(`/api/runs/${runId}/events`).send({ text: '\u0000\u0000' }).expect(400);
    // A note far beyond the run's end is refused with its length; one at the very end is kept.
    const { durationSeconds } = (await viewer.get(`/api/runs/${runId}`)).body.run.summary;
    const late = await tech.post(`/api/runs/${runId}/events`).send({ elapsedSeconds: durationSeconds + 1e6, text: 'far beyond the end' }).expect(400);
    expect(late.body.error.message).toMatch(/after the end of the run/);
    expect(late.body.error.fields.elapsedSeconds).toBeDefined();
    await tech.post(`/api/runs/${runId}/events`).send({ elapsedSeconds: durationSeconds, text: 'at the very end' }).expect(201);
    await viewer.patch(`/api/runs/${runId}`).send({ name: 'nope' }).expect(403);
    await tech.patch(`/api/runs/${runId}`).send({ name: 'Capacity Voltara A-12 (repeat)', tags: ['repeat'] }).expect(200);
    const byName = ListRunsResponseSchema.parse((await viewer.get('/api/runs?q=repeat').expect(200)).body);
    expect(byName.runs.map((r: { id: number }) => r.id)).toEqual([runId]);
    expect((await viewer.get('/api/runs?tag=repeat')).body.total).toBe(1);
    expect((await viewer.get('/api/runs?tag=acceptance')).body.total).toBe(0);
    expect((await viewer.get(`/api/runs?batteryId=${ids.batteryId}&state=finished`)).body.total).toBe(1);
    expect((await viewer.get('/api/runs?state=recording')).body.total).toBe(0);
    await viewer.get('/api/runs?state=boiling').expect(400);
  });

  it('times a temperature protection on a protection-check run and raises the temperature alarm once', async () => {
    const res = await tech
      .post('/api/runs')
      .send({
        ...ids, name: 'Hot cutoff check', kind: 'protection-check', stopWhen: 'manual', alarms: { highTempCelsius: 55 },
        tempProtections: [{ kind: 'high-temp-discharge', channel: 'cell', limitCelsius: 60, direction: 'above', current: 'discharge' }],
      })
      .expect(201);
    expect(res.body.run.tempProtections).toHaveLength(1);
    // Cell warms 0.5 °C/s from 50 °C, crosses 60 °C at s = 20; the pack opens 12 s later (a made-up delay for the check).
    const TRIP_DELAY_S = 12;
    for (let s = 0; s < 60; s++) {
      const tempCelsius = 50 + s * 0.5;
      feed.emit(ids.benchId, { t: 30_000 + s, volts: 13, amps: s < 20 + TRIP_DELAY_S ? 5 : 0, temps: { cell: tempCelsius }, clock: 'device' });
    }
    await tech.post(`/api/runs/${res.body.run.id}/stop`).send({}).expect(200);
    const events = await eventually(async () => {
      const e = (await viewer.get(`/api/runs/${res.body.run.id}/events`)).body.events.map((x: { event: { type: string } }) => x.event);
      expect(e.map((x: { type: string }) => x.type)).toContain('run-stop');
      return e;
    });
    const trip = events.find((e: { type: string }) => e.type === 'protection-trip');
    expect(trip).toMatchObject({ kind: 'high-temp-discharge', channel: 'cell', limitCelsius: 60 });
    expect(Math.abs(trip.delaySeconds - TRIP_DELAY_S)).toBeLessThanOrEqual(1); // within one sample period
    expect(events.filter((e: { type: string; code?: string }) => e.type === 'alarm' && e.code === 'over-temperature')).toHaveLength(1);
  });

  it('aborts a run by hand and keeps what was recorded', async () => {
    const res = await tech.post('/api/runs').send({ ...ids, name: 'Manual stop', stopWhen: 'manual' }).expect(201);
    for (let s = 0; s < 50; s++) feed.emit(ids.benchId, { t: 20_000 + s, volts: 13, amps: 2, clock: 'device' });
    const stopped = await tech.post(`/api/runs/${res.body.run.id}/abort`).send({}).expect(200);
    expect(stopped.body.run.state).toBe('aborted');
    const run = await eventually(async () => {
      const r = (await viewer.get(`/api/runs/${res.body.run.id}`)).body.run;
      expect(r.readingsCount).toBe(50);
      return r;
    });
    // 49 s at 2 A = 98/3600 Ah (constant current, exact).
    expect(run.summary.dischargeAh).toBeCloseTo(98 / 3600, 12);
  });
});

describe('what a run takes from its bench', () => {
  it('a polled meter\'s period sets the gap limit and the bench\'s load threshold starts a small test', async () => {
    const admin = await signInAs(t, 'admin');
    const battery = (await admin.post('/api/batteries').send({ label: 'Cell N-1', brand: 'Voltara', chemistry: 'nimh', cellsInSeries: 1, ratedAh: 2.5 }).expect(201)).body.battery;
    // A SCPI meter polled once a minute (the most a bench allows); the port need not exist, frames come from the feed.
    const source = { kind: 'serial', path: '/tmp/kneepoint-h4-absent-port', format: { kind: 'scpi', pollMs: 60_000 } };
    const bench = (await admin.post('/api/benches').send({ name: 'Bench slow meter', source, loadOnAmps: 0.1 }).expect(201)).body.bench;
    expect(bench.loadOnAmps).toBe(0.1);
    const patched = (await admin.patch(`/api/benches/${bench.id}`).send({ loadOnAmps: 0.12 }).expect(200)).body.bench;
    expect(patched.loadOnAmps).toBe(0.12);
    await admin.patch(`/api/benches/${bench.id}`).send({ loadOnAmps: -1 }).expect(400);
    const run = (await tech.post('/api/runs').send({ benchId: bench.id, batteryId: battery.id, name: 'Slow meter', endVolts: { mode: 'absolute', volts: 1 }, stopWhen: 'manual' }).expect(201)).body.run;
    // 0.15 A for 1 h, one reading a minute, volts above the end voltage: 0.15 Ah (analytic), no gaps.
    for (let s = 0; s <= 3600; s += 60) feed.emit(bench.id, { t: s, volts: 1.25, amps: 0.15, clock: 'device' });
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    const done = await eventually(async () => {
      const r = (await viewer.get(`/api/runs/${run.id}`)).body.run;
      expect(r.readingsCount).toBe(61);
      return r;
    });
    expect(done.summary).toMatchObject({ gaps: 0, maxGapSeconds: 180, gapLimitBasis: 'cadence', cadenceSeconds: 60, loadOnAmps: 0.12 });
    expect(done.summary.dischargeAh).toBeCloseTo(0.15, 12);
    expect(done.summary.meanAmps).toBeCloseTo(0.15, 12); // under load: above the bench's threshold
    // Stopped by hand before the end voltage: incomplete, not a fail.
    expect(done.summary).toMatchObject({ capacityEndedBy: 'stopped-before-end-voltage', verdict: 'incomplete' });
  });

  it('the bench meter\'s stated accuracy is kept with the run and a margin inside the uncertainty is borderline', async () => {
    const admin = await signInAs(t, 'admin');
    const battery = (await admin.post('/api/batteries').send({ label: 'Pack U-1', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 10 }).expect(201)).body.battery;
    const source = { kind: 'serial', path: '/tmp/kneepoint-w2-absent-port', format: { kind: 'scpi', pollMs: 60_000 } };
    const meterAccuracy = { voltsGainPercent: 0.1, voltsOffsetVolts: 0.01, ampsGainPercent: 0.2, ampsOffsetAmps: 0.2 };
    await admin.post('/api/benches').send({ name: 'Bench bad accuracy', source, meterAccuracy: { ...meterAccuracy, ampsGainPercent: -1 } }).expect(400);
    const bench = (await admin.post('/api/benches').send({ name: 'Bench stated accuracy', source, meterAccuracy }).expect(201)).body.bench;
    expect(bench.meterAccuracy).toEqual(meterAccuracy);
    const run = (await tech.post('/api/runs').send({ benchId: bench.id, batteryId: battery.id, name: 'Accuracy', endVolts: { mode: 'absolute', volts: 12 }, stopWhen: 'manual' }).expect(201)).body.run;
    // A later change to the bench does not move this run's uncertainty.
    await admin.patch(`/api/benches/${bench.id}`).send({ meterAccuracy: null }).expect(200);
    // 10 A at 13 V for 1 h, then 11.5 V: the 12 V crossing interpolates to 3640 s, 10 × 3640 / 3600 = 10.111 Ah (101.1 %).
    for (let s = 0; s <= 3600; s += 60) feed.emit(bench.id, { t: s, volts: 13, amps: 10, clock: 'device' });
    for (let s = 3660; s <= 3900; s += 60) feed.emit(bench.id, { t: s, volts: 11.5, amps: 10, clock: 'device' });
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    const done = await eventually(async () => {
      const r = (await viewer.get(`/api/runs/${run.id}`)).body.run;
      expect(r.state).toBe('finished');
      expect(r.summary?.capacityEndedBy).toBe('end-voltage');
      return r;
    });
    expect(done.meterAccuracy).toEqual(meterAccuracy);
    expect(done.summary.capacityAh).toBeCloseTo(10 * 3640 / 3600, 6);
    // By hand (JCGM 100 4.3.7, 5.1.2): the offset term alone is 0.2 A × ≥ 1.01 h / √3 ≥ 0.117 Ah, so U = 2u ≥ 0.23 Ah,
    // more than the 0.111 Ah margin over the 10 Ah threshold: borderline, not pass.
    expect(done.summary.uncertainty.expandedAh).toBeGreaterThan(0.23);
    expect(done.summary.uncertainty.method).toMatch(/JCGM 100/);
    expect(done.summary.verdict).toBe('borderline');
  });

  it('the run report PDF holds the summary figures as the API gives them, in the lab\'s units (a °F lab sees °F)', async () => {
    const admin = await signInAs(t, 'admin');
    const battery = (await admin.post('/api/batteries').send({ label: 'Pack R-1', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 10 }).expect(201)).body.battery;
    const source = { kind: 'serial', path: '/tmp/kneepoint-w2-report-port', format: { kind: 'scpi', pollMs: 60_000 } };
    const bench = (await admin.post('/api/benches').send({ name: 'Bench report', source }).expect(201)).body.bench;
    const run = (await tech.post('/api/runs').send({ benchId: bench.id, batteryId: battery.id, name: 'Report run', endVolts: { mode: 'absolute', volts: 12 }, stopWhen: 'manual' }).expect(201)).body.run;
    for (let s = 0; s <= 3600; s += 60) feed.emit(bench.id, { t: s, volts: 13, amps: 10, temps: { cell: 25 }, clock: 'device' });
    for (let s = 3660; s <= 3900; s += 60) feed.emit(bench.id, { t: s, volts: 11.5, amps: 10, temps: { cell: 30 }, clock: 'device' });
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    const done = await eventually(async () => {
      const r = (await viewer.get(`/api/runs/${run.id}`)).body.run;
      expect(r.state).toBe('finished');
      return r;
    });
    const pdfText = async () => {
      const res = await viewer.get(`/api/runs/${run.id}/report.pdf`).buffer(true).parse((r, cb) => {
        const parts: Buffer[] = [];
        r.on('data', (c: Buffer) => parts.push(c));
        r.on('end', () => cb(null, Buffer.concat(parts)));
      }).expect(200);
      expect(res.headers['content-type']).toBe('application/pdf');
      const { getDocument } = await import('pdfjs-dist/legacy/build/pdf.mjs');
      const pdf = await getDocument({ data: new Uint8Array(res.body as Buffer), verbosity: 0 }).promise;
      const texts: string[] = [];
      for (let i = 1; i <= pdf.numPages; i++) {
        const content = await (await pdf.getPage(i)).getTextContent();
        texts.push(content.items.map((it) => ('str' in it ? it.str : '')).join(''));
      }
      return texts.join('\n');
    };
    const celsius = await pdfText();
    // The figures exactly as the client formats the API's numbers (shared/units/format.ts).
    expect(celsius).toContain(`Capacity: ${formatCharge(done.summary.capacityAh)}`);
    expect(celsius).toContain(`Capacity energy: ${formatEnergy(done.summary.capacityWh, 'Wh')}`);
    expect(celsius).toContain(`Of rated Ah: ${formatPercent(done.summary.percentRatedAh)}`);
    expect(celsius).toContain(formatTemperature(done.summary.maxTempCelsius, 'C'));
    expect(celsius).toMatch(/page 1 of \d/);
    expect(celsius).toContain('Not signed off');
    await admin.patch('/api/settings').send({ temperatureUnit: 'F', energyUnit: 'kWh' }).expect(200);
    try {
      const fahrenheit = await pdfText();
      expect(fahrenheit).toContain(formatTemperature(done.summary.maxTempCelsius, 'F')); // 30 °C = 86.0 °F
      expect(fahrenheit).toContain('86.0 °F');
      expect(fahrenheit).not.toContain('°C to');
      expect(fahrenheit).toContain(`Capacity energy: ${formatEnergy(done.summary.capacityWh, 'kWh')}`);
    } finally {
      await admin.patch('/api/settings').send({ temperatureUnit: 'C', energyUnit: 'Wh' }).expect(200);
    }
  });
});

describe('deleting a bench', () => {
  it('is refused (409, naming the run) while a run records on it, and allowed once the run ends; the run keeps its readings', async () => {
    const admin = await signInAs(t, 'admin');
    const own = await batteryAndBench(admin);
    const run = (await tech.post('/api/runs').send({ ...own, name: 'Bench delete guard', stopWhen: 'manual' }).expect(201)).body.run;
    for (let s = 0; s < 5; s++) feed.emit(own.benchId, { t: s, volts: 13, amps: 2, clock: 'device' });
    const refused = await admin.delete(`/api/benches/${own.benchId}`).expect(409);
    expect(refused.body.error.message).toMatch(new RegExp(`recording run ${run.id}`));
    await admin.get(`/api/benches/${own.benchId}`).expect(200);
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    await admin.delete(`/api/benches/${own.benchId}`).expect(204);
    await eventually(async () => {
      const got = RunResponseSchema.parse((await viewer.get(`/api/runs/${run.id}`).expect(200)).body);
      expect(got.run).toMatchObject({ state: 'finished', readingsCount: 5 });
    });
  });
});

describe('malformed frames mid-run', () => {
  it('drops a frame with a non-finite value; the run stays readable and keeps every good reading', async () => {
    const admin = await signInAs(t, 'admin');
    const own = await batteryAndBench(admin);
    const run = (await tech.post('/api/runs').send({ ...own, name: 'NaN probe', stopWhen: 'manual' }).expect(201)).body.run;
    feed.emit(own.benchId, { t: 0, volts: 13, amps: 2, temps: { cell: Number.NaN }, clock: 'device' });
    for (let s = 1; s <= 10; s++) feed.emit(own.benchId, { t: s, volts: 13, amps: 2, temps: { cell: 21 }, clock: 'device' });
    feed.emit(own.benchId, { t: 11, volts: 13, amps: 2, aux: { heaterAmps: Number.POSITIVE_INFINITY }, clock: 'device' });
    const live = RunResponseSchema.parse((await viewer.get(`/api/runs/${run.id}`).expect(200)).body).run;
    expect(live.readingsCount).toBe(10);
    expect(live.summary?.minTempCelsius).toBe(21);
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    await eventually(async () => {
      const done = RunResponseSchema.parse((await viewer.get(`/api/runs/${run.id}`).expect(200)).body).run;
      expect(done).toMatchObject({ state: 'finished', readingsCount: 10 });
    });
  });
});

describe('a meter misbehaving mid-run', () => {
  it('survives a glitched timestamp, garbage, an unplugged minute and a restarted meter clock, losing no good reading', async () => {
    const admin = await signInAs(t, 'admin');
    const own = await batteryAndBench(admin);
    const run = (await tech.post('/api/runs').send({ ...own, name: 'Misbehaving meter', stopWhen: 'manual' }).expect(201)).body.run;
    const emit = (t: number) => feed.emit(own.benchId, { t, volts: 13, amps: 2, clock: 'device' });
    for (let s = 0; s < 10; s++) emit(s); // 10 good
    emit(1e12); // a corrupted digit: far ahead, dropped
    feed.emit(own.benchId, { t: 10, volts: Number.NaN, amps: 2, clock: 'device' }); // garbage, dropped
    for (let s = 10; s < 20; s++) emit(s); // 10 good
    feed.status(own.benchId, { state: 'reconnecting', message: 'unplugged', framesOk: 20, framesRejected: 1 });
    feed.status(own.benchId, { state: 'receiving', framesOk: 20, framesRejected: 1 });
    for (let s = 80; s < 90; s++) emit(s); // 10 good after a minute away: a gap
    for (let s = 0; s < 10; s++) emit(s); // 10 good from a meter whose clock restarted
    const live = RunResponseSchema.parse((await viewer.get(`/api/runs/${run.id}`).expect(200)).body).run;
    expect(live.state).toBe('recording');
    expect(live.readingsCount).toBe(40);
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    await eventually(async () => {
      const events = RunEventsResponseSchema.parse((await viewer.get(`/api/runs/${run.id}/events`).expect(200)).body).events.map((e) => e.event);
      expect(events.map((e) => e.type)).toEqual(expect.arrayContaining(['source-lost', 'source-restored', 'gap', 'run-stop']));
      const samples = ReadingsResponseSchema.parse((await viewer.get(`/api/runs/${run.id}/readings?maxPoints=1000`).expect(200)).body);
      expect(samples.readingsInWindow).toBe(40);
      // The restarted clock carries on after the last reading: run time only moves forward.
      expect(samples.x).toEqual([...samples.x].sort((a, b) => a - b));
      expect(samples.x.at(-1)).toBeGreaterThan(89);
    });
  });
});

describe('history windows a client should not ask for', () => {
  it('answers 400 for a window too wide to cut into buckets, and a valid reduced answer just inside it', async () => {
    const admin = await signInAs(t, 'admin');
    const own = await batteryAndBench(admin);
    const run = (await tech.post('/api/runs').send({ ...own, name: 'Wide window', stopWhen: 'manual' }).expect(201)).body.run;
    for (let s = 0; s < 100; s++) feed.emit(own.benchId, { t: s, volts: 13, amps: 2, clock: 'device' });
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    await eventually(async () => expect((await viewer.get(`/api/runs/${run.id}`)).body.run.readingsCount).toBe(100));
    const wide = await viewer.get(`/api/runs/${run.id}/readings?maxPoints=10&from=-1e308&to=1e308`).expect(400);
    expect(wide.body.error.fields).toHaveProperty('to');
    const inside = ReadingsResponseSchema.parse((await viewer.get(`/api/runs/${run.id}/readings?maxPoints=10&from=-1e307&to=1e307`).expect(200)).body);
    expect(inside.readingsInWindow).toBe(100);
  });
});

describe('starting a run twice at once (a double-clicked Start)', () => {
  it('records one run: the other requests get 409', async () => {
    const admin = await signInAs(t, 'admin');
    const own = await batteryAndBench(admin);
    const answers = await Promise.all([1, 2, 3].map((i) => tech.post('/api/runs').send({ ...own, name: `Double start ${i}`, stopWhen: 'manual' })));
    expect(answers.map((r) => r.status).sort()).toEqual([201, 409, 409]);
    const runs = ListRunsResponseSchema.parse((await viewer.get(`/api/runs?benchId=${own.benchId}`).expect(200)).body).runs;
    expect(runs).toHaveLength(1);
    const started = answers.find((r) => r.status === 201)!.body.run.id;
    await tech.post(`/api/runs/${started}/stop`).send({}).expect(200);
  });
});
