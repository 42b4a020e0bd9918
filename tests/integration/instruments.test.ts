import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { attachInstruments } from '../../server/instruments/attach-instruments.js';
import { localToday } from '../../server/instruments/instruments-repo.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, tempSpillDir } from './runs-kit.js';

let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;
let viewer: SignedInAgent;

/** A day relative to today, YYYY-MM-DD on the server's calendar. */
const day = (offsetDays: number) => localToday(new Date(Date.now() + offsetDays * 86_400_000));
const meter = (benchId: number | null, extra: Record<string, unknown> = {}) => ({
  kind: 'meter', make: 'Ostwind Labs', model: 'DM-6 bench meter', serialNumber: 'OW-20931', benchId,
  calibratedOn: day(-400), calibrationDueOn: day(-35), channels: { volts: { gain: 1.01, offset: 0.02 }, amps: { gain: 0.98, offset: -0.1 } },
  ...extra,
});
/** The smallest file that starts like a PDF (ISO 32000-1, 7.5.2: the header `%PDF-1.n`). */
const PDF = Buffer.from('%PDF-1.4\n%fictional calibration certificate\n%%EOF\n');

beforeAll(async () => {
  t = await createTestContext({ attachments: [attachBenchManager, liveAttachment({ spillDir: tempSpillDir() }), attachInstruments] });
  admin = await signInAs(t, 'admin');
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
});
afterAll(async () => {
  await t?.close();
});

describe('instrument records', () => {
  it('admins create, edit and delete; the calibration state follows the due date', async () => {
    const created = (await admin.post('/api/instruments').send(meter(null)).expect(201)).body.instrument;
    expect(created).toMatchObject({ kind: 'meter', serialNumber: 'OW-20931', calibration: 'overdue', certificate: null, benchId: null });
    const edited = (await admin.put(`/api/instruments/${created.id}`).send(meter(null, { calibrationDueOn: day(0) })).expect(200)).body.instrument;
    expect(edited.calibration).toBe('in-date');
    const none = (await admin.put(`/api/instruments/${created.id}`).send(meter(null, { calibrationDueOn: null })).expect(200)).body.instrument;
    expect(none.calibration).toBe('not-recorded');
    await admin.delete(`/api/instruments/${created.id}`).expect(204);
    await viewer.get(`/api/instruments/${created.id}`).expect(404);
  });

  it('refuses bad input with the fields named', async () => {
    const res = await admin
      .post('/api/instruments')
      .send(meter(null, { make: '', channels: { volts: { gain: 50, offset: 0 } }, calibratedOn: '2026-13-40' }))
      .expect(400);
    expect(JSON.stringify(res.body)).toMatch(/make/);
    expect(JSON.stringify(res.body)).toMatch(/channels/);
    expect(JSON.stringify(res.body)).toMatch(/calibratedOn/);
    await viewer.get('/api/runs/99999/instruments').expect(404);
    const noBench = await admin.post('/api/instruments').send(meter(99_999)).expect(400);
    expect(noBench.body.error.fields).toEqual({ benchId: ['no such bench'] });
  });

  it('a viewer (and a technician) reads but cannot create, edit, delete or upload', async () => {
    const { id } = (await admin.post('/api/instruments').send(meter(null)).expect(201)).body.instrument;
    await viewer.get('/api/instruments').expect(200);
    await viewer.get(`/api/instruments/${id}`).expect(200);
    for (const agent of [viewer, tech]) {
      await agent.post('/api/instruments').send(meter(null)).expect(403);
      await agent.put(`/api/instruments/${id}`).send(meter(null, { serialNumber: 'changed' })).expect(403);
      await agent.delete(`/api/instruments/${id}`).expect(403);
      await agent.post(`/api/instruments/${id}/certificate`).attach('file', PDF, 'cert.pdf').expect(403);
    }
    expect((await viewer.get(`/api/instruments/${id}`).expect(200)).body.instrument.serialNumber).toBe('OW-20931');
  });

  it('stores the certificate file and gives it back; refuses what is not a PDF or image', async () => {
    const { id } = (await admin.post('/api/instruments').send(meter(null)).expect(201)).body.instrument;
    const stored = (await admin.post(`/api/instruments/${id}/certificate`).attach('file', PDF, 'DM-6 cert 2025.pdf').expect(200)).body.instrument;
    expect(stored.certificate).toMatchObject({ fileName: 'DM-6 cert 2025.pdf', contentType: 'application/pdf', sizeBytes: PDF.length });
    const back = await viewer.get(`/api/instruments/${id}/certificate`).buffer(true).parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    }).expect(200);
    expect(Buffer.compare(back.body as Buffer, PDF)).toBe(0);
    const refused = await admin.post(`/api/instruments/${id}/certificate`).attach('file', Buffer.from('MZ\x90\x00 not a certificate'), 'cert.exe').expect(400);
    expect(refused.body.error.fields).toEqual({ file: ['not a PDF, PNG or JPEG'] });
  });
});

describe('calibration on the bench', () => {
  it('corrects readings as they arrive, keeps the raw values in the export, and records the instruments a run used', async () => {
    const { batteryId } = await batteryAndBench(admin);
    const bench = (
      await admin.post('/api/benches').send({ name: 'Bench cal', source: { kind: 'simulator', scenario: 'lfp-12v-100ah-cp-cutoff', speed: 20, seed: 5 } }).expect(201)
    ).body.bench;
    const instrument = (await admin.post('/api/instruments').send(meter(bench.id)).expect(201)).body.instrument;
    const run = (await tech.post('/api/runs').send({ benchId: bench.id, batteryId, name: 'Calibrated run' }).expect(201)).body.run;
    await eventually(async () => expect((await tech.get(`/api/runs/${run.id}`)).body.run.readingsCount).toBeGreaterThan(30));
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);

    const csv = (await viewer.get(`/api/runs/${run.id}/export.csv`).expect(200)).text.trim().split('\n').filter((l) => !l.startsWith('#'));
    const header = csv[0]!.split(',');
    const col = (name: string) => header.indexOf(name);
    expect(col('aux_raw_volts')).toBeGreaterThan(0);
    expect(col('aux_raw_amps')).toBeGreaterThan(0);
    const rows = csv.slice(1).map((l) => l.split(',').map(Number));
    expect(rows.length).toBeGreaterThan(30);
    for (const row of rows) {
      // corrected = raw × gain + offset; the export rounds to the meter's digits (1 mV, 1 mA here).
      expect(row[col('volts')]).toBeCloseTo(row[col('aux_raw_volts')]! * 1.01 + 0.02, 2);
      expect(row[col('amps')]).toBeCloseTo(row[col('aux_raw_amps')]! * 0.98 - 0.1, 2);
    }
    const used = (await viewer.get(`/api/runs/${run.id}/instruments`).expect(200)).body.instruments;
    expect(used).toEqual([expect.objectContaining({ instrumentId: instrument.id, serialNumber: 'OW-20931', calibration: 'overdue', calibrationDueOn: day(-35) })]);
    // The report names the instrument and flags its overdue calibration.
    const report = await viewer.get(`/api/runs/${run.id}/report.pdf`).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = [];
      r.on('data', (c: Buffer) => parts.push(c));
      r.on('end', () => cb(null, Buffer.concat(parts)));
    }).expect(200);
    const { getDocument } = await import('pdfjs-dist/legacy/build/pdf.mjs');
    const pdf = await getDocument({ data: new Uint8Array(report.body as Buffer), verbosity: 0 }).promise;
    const firstPage = (await (await pdf.getPage(1)).getTextContent()).items.map((it) => ('str' in it ? it.str : '')).join('');
    // pdf.js drops the space where the line wraps: compare without spaces.
    const squeeze = (text: string) => text.replace(/\s+/g, '');
    expect(squeeze(firstPage)).toContain(squeeze(`meter Ostwind Labs DM-6 bench meter (serial OW-20931), CALIBRATION OVERDUE (was due ${day(-35)})`));
    // A later change to the record does not rewrite what the run used.
    await admin.put(`/api/instruments/${instrument.id}`).send(meter(bench.id, { calibrationDueOn: day(300) })).expect(200);
    expect((await viewer.get(`/api/runs/${run.id}/instruments`).expect(200)).body.instruments[0].calibration).toBe('overdue');
  });
});
