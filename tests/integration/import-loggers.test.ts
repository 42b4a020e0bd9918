import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ImportResponseSchema } from '../../shared/schemas/api-runs.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

let t: TestContext;
let tech: SignedInAgent;
let admin: SignedInAgent;
let dir: string;
beforeAll(async () => {
  t = await createTestContext();
  tech = await signInAs(t, 'technician');
  admin = await signInAs(t, 'admin');
  dir = await mkdtemp(join(tmpdir(), 'kp-import-loggers-'));
});
afterAll(async () => {
  await t?.close();
  await rm(dir, { recursive: true, force: true });
});

let n = 0;
async function upload(content: string | Buffer, fields: Record<string, string> = {}) {
  const path = join(dir, `log-${++n}.csv`);
  await writeFile(path, content);
  let req = tech.post('/api/runs/import').field('name', `log ${n}`);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach('file', path);
}
const total = async () => (await tech.get('/api/runs').expect(200)).body.total as number;
/** Constant-current rows: volts falling slowly (so the sign is plain), amps fixed. */
const lines = (count: number, time: (i: number) => string, amps = '5', sep = ',') =>
  Array.from({ length: count }, (_, i) => [time(i), (13.2 - (i * 0.5) / count).toFixed(4), amps].join(sep)).join('\n') + '\n';
async function withLabSettings<T>(patch: Record<string, unknown>, body: () => Promise<T>): Promise<T> {
  const before = (await admin.get('/api/settings').expect(200)).body;
  await admin.patch('/api/settings').send(patch).expect(200);
  try {
    return await body();
  } finally {
    const restore = Object.fromEntries(Object.keys(patch).map((k) => [k, (before.settings ?? before)[k]]));
    await admin.patch('/api/settings').send(restore).expect(200);
  }
}

describe('import: bad files answer 400 naming the line, never 500 (issue 8 item 8)', () => {
  it('a stray quote inside a field (1,1"3,5) and a binary file', async () => {
    const before = await total();
    const quote = await upload('time_s,volts,amps\n0,13,5\n1,1"3,5\n');
    expect(quote.status).toBe(400);
    expect(quote.body.error.message).toMatch(/^line 3: a quote inside an unquoted field/);
    const binary = await upload(Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00, 0x22, 0x0a, 0xff, 0xfe, 0x00, 0x22]));
    expect(binary.status).toBe(400);
    expect(binary.body.error.message).toMatch(/^line 1: binary data/);
    expect(await total()).toBe(before);
  });

  it('times of -1e300 and 1e300 are refused with a clear message', async () => {
    const far = await upload('time_s,volts,amps\n0,13,5\n1e300,12.9,5\n');
    expect(far.status).toBe(400);
    expect(far.body.error.message).toMatch(/^line 3: time "1e300" read as seconds is beyond the year 2100/);
    const before = await upload('time_s,volts,amps\n-1e300,13,5\n0,12.9,5\n');
    expect(before.status).toBe(400);
    expect(before.body.error.message).toMatch(/^line 2: time "-1e300"/);
  });
});

describe('import: time in any common format, in the lab zone (issue 11 item 11)', () => {
  it('dd.mm.yyyy is day-first in the lab zone: 03.04.2026 10:00 Berlin starts 3 April 08:00 UTC, not 4 March', async () => {
    await withLabSettings({ timeZone: 'Europe/Berlin' }, async () => {
      const csv = 'Datum;Spannung (V);Strom (A)\n' + lines(11, (i) => `03.04.2026 10:00:${String(i).padStart(2, '0')}`, '5,0', ';').replace(/(\d)\.(\d{4});/g, '$1,$2;');
      const auto = await upload(csv);
      expect(auto.status).toBe(400);
      expect(auto.body.error.message).toMatch(/day-first or month-first; choose the time format/);
      expect(auto.body.error.fields).toHaveProperty('timeFormat');
      const res = await upload(csv, { timeFormat: 'dmy' });
      expect(res.status).toBe(201);
      const body = ImportResponseSchema.parse(res.body);
      // Berlin keeps UTC+2 from the last Sunday of March (EU summer time, from memory): 10:00 local is 08:00 UTC.
      expect(body.run.startedAt).toBe('2026-04-03T08:00:00.000Z');
      expect(body.summary.durationSeconds).toBe(10);
      expect(body.summary.dischargeAh).toBeCloseTo((5 * 10) / 3600, 12); // 5 A for 10 s
    });
  });

  it('h:mm:ss elapsed times and decimal-comma seconds', async () => {
    const hms = await upload('Elapsed,Voltage (V),Current (A)\n' + lines(3601, (i) => `${Math.floor(i / 3600)}:${String(Math.floor(i / 60) % 60).padStart(2, '0')}:${String(i % 60).padStart(2, '0')}`));
    expect(hms.status).toBe(201);
    expect(hms.body.summary.dischargeAh).toBeCloseTo(5, 9); // 5 A for 1 h
    const comma = await upload('Zeit (s);Spannung (V);Strom (A)\n' + lines(21, (i) => String(i / 2).replace('.', ','), '3,6', ';').replace(/(\d)\.(\d{4});/g, '$1,$2;'));
    expect(comma.status).toBe(201);
    expect(comma.body.summary.dischargeAh).toBeCloseTo((3.6 * 10) / 3600, 12); // 3.6 A for 10 s
  });

  it('epoch ms under "timestamp" integrate right, and start the run at the first reading', async () => {
    const t0 = Date.UTC(2026, 6, 15, 10); // 15 Jul 2026 10:00 UTC
    const res = await upload('timestamp,volts,amps\n' + lines(3601, (i) => String(t0 + i * 1000)));
    expect(res.status).toBe(201);
    expect(res.body.summary.dischargeAh).toBeCloseTo(5, 9); // 5 A for 1 h
    expect(res.body.run.startedAt).toBe('2026-07-15T10:00:00.000Z');
    expect(res.body.summary.medianIntervalSeconds).toBe(1);
  });

  it('a bare Time in ms is refused with a question, not read as seconds; choosing ms reads it right', async () => {
    const csv = 'Time,volts,amps\n' + lines(3601, (i) => String(i * 1000));
    const res = await upload(csv);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/"Time" has no unit and steps of 1000 \(median\): seconds .* or milliseconds \(1 s apart\)\? Choose the time format/);
    const ms = await upload(csv, { timeFormat: 'ms' });
    expect(ms.status).toBe(201);
    expect(ms.body.summary.dischargeAh).toBeCloseTo(5, 9);
  });

  it('a bare Time in minutes read as seconds is said aloud, and choosing minutes gives the 60x larger Ah', async () => {
    const csv = 'Time,volts,amps\n' + lines(61, (i) => String(i));
    const assumed = await upload(csv);
    expect(assumed.status).toBe(201);
    expect(assumed.body.summary.notices.join(' ')).toMatch(/names no unit: if it counts minutes or milliseconds, import again/);
    const minutes = await upload(csv, { timeFormat: 'min' });
    expect(minutes.body.summary.dischargeAh).toBeCloseTo(5, 9); // 5 A for 60 min
    expect(minutes.body.summary.dischargeAh / assumed.body.summary.dischargeAh).toBeCloseTo(60, 9);
  });

  it('spreadsheet serial days in the lab zone', async () => {
    const csv = 'Date,volts,amps\n' + lines(61, (i) => (46218.5 + i / 86400).toFixed(9));
    const res = await upload(csv, { timeFormat: 'serial-days' });
    expect(res.status).toBe(201);
    expect(res.body.run.startedAt).toBe('2026-07-15T12:00:00.000Z'); // serial 46218.5 is noon, 15 Jul 2026 (see import-time.test.ts)
    expect(res.body.summary.dischargeAh).toBeCloseTo((5 * 60) / 3600, 6);
  });

  it('a ; file whose headers hold commas is read as ;-separated', async () => {
    const csv = 'Time, s;Voltage, V;Current, A\n' + lines(11, String, '2,5', ';').replace(/(\d)\.(\d{4});/g, '$1,$2;');
    const res = await upload(csv);
    expect(res.status).toBe(201);
    expect(res.body.summary.dischargeAh).toBeCloseTo((2.5 * 10) / 3600, 12);
  });
});

describe('import: temperatures by unit mark, never °F read as °C (issue 11 item 12)', () => {
  it("reads T[°C], TempF and a bare Temperature in the lab's unit", async () => {
    const csv = (header: string, value: string) => `time_s,volts,amps,${header}\n0,13.2,5,${value}\n1,13.1,5,${value}\n2,13.0,5,${value}\n`;
    const celsius = await upload(csv('T[°C]', '25'));
    expect(celsius.body.fullSummary.maxTempCelsius).toBeCloseTo(25, 12);
    const fahrenheit = await upload(csv('TempF', '77'));
    expect(fahrenheit.body.fullSummary.maxTempCelsius).toBeCloseTo(25, 12); // 77 °F = 25 °C (scale definitions)
    const degF = await upload(csv('Temperature (degF)', '77'));
    expect(degF.status).toBe(201);
    expect(degF.body.fullSummary.maxTempCelsius).toBeCloseTo(25, 12);
    // A bare Temperature of a °F log under a lab set to °C is not read as 77 °C: the importer asks.
    const asked = await upload(csv('Temperature', '77'));
    expect(asked.status).toBe(400);
    expect(asked.body.error.message).toMatch(/fits °F better; choose the temperature unit/);
    expect(asked.body.error.fields).toHaveProperty('tempUnit');
    await withLabSettings({ temperatureUnit: 'F' }, async () => {
      const bare = await upload(csv('Temperature', '77'));
      expect(bare.body.fullSummary.maxTempCelsius).toBeCloseTo(25, 12);
      expect(bare.body.summary.notices.join(' ')).toMatch(/Temperature column "Temperature" read in °F \(the lab's unit/);
      const chosen = await upload(csv('Temperature', '25'), { tempUnit: 'C' });
      expect(chosen.body.fullSummary.maxTempCelsius).toBeCloseTo(25, 12);
    });
  });
});

describe('import: duplicate timestamps are reported (issue 11 item 15)', () => {
  it('counts and names them in the result', async () => {
    const res = await upload('time_s,volts,amps\n0,13.2,5\n1,13.1,5\n1,13.1,5\n2,13.0,5\n3,12.9,5\n3,12.9,5\n4,12.8,5\n');
    expect(res.status).toBe(201);
    expect(res.body.summary.duplicateTimes).toEqual({ count: 2, lines: [4, 7] });
    expect(res.body.summary.rows).toBe(7);
    expect(res.body.run.readingsCount).toBe(5);
    expect(res.body.summary.notices.join(' ')).toMatch(/2 row\(s\) repeat the time of the row before \(line 4, 7\)/);
  });
});

describe('import: current sign (issue 11 item 2)', () => {
  it('2 h out at 10 A then 3.5 h CC-CV in: auto gives the discharge as "out" (20 Ah), round trip below 100 %', async () => {
    // A 12 V lithium iron phosphate pack logged every 10 s, discharge negative; charge CC at 10 A to 14.4 V, then CV (common practice, 3.6 V a cell).
    const rows: string[] = [];
    for (let s = 0; s <= 7200; s += 10) rows.push(`${s},${(13.2 - (1.2 * s) / 7200).toFixed(4)},-10`);
    for (let s = 7210; s <= 7200 + 3.5 * 3600; s += 10) {
      const cc = s <= 7200 + 7200;
      rows.push(`${s},${(cc ? 13 + (1.4 * (s - 7200)) / 7200 : 14.4).toFixed(4)},${(cc ? 10 : 10 * Math.exp(-(s - 14400) / 1800)).toFixed(4)}`);
    }
    const res = await upload(`time_s,volts,amps\n${rows.join('\n')}\n`);
    expect(res.status).toBe(201);
    // The discharge: 10 A for 2 h is 20 Ah (constant-current arithmetic).
    // The panel from -10 A at 7,200 s to +10 A at 7,210 s crosses zero at 7,205 s and adds 10 A × 5 s ÷ 2 (trapezoidal rule).
    expect(res.body.fullSummary.dischargeAh).toBeCloseTo(20 + (10 * 5) / 2 / 3600, 9);
    expect(res.body.fullSummary.chargeAh).toBeGreaterThan(20);
    expect(res.body.fullSummary.roundTripEfficiency).toBeLessThan(1);
    expect(res.body.summary.notices.join(' ')).toMatch(/Current sign: negative amps are discharge/);
  });

  it('asks for the sign when the file cannot tell', async () => {
    const res = await upload('time_s,volts,amps\n' + Array.from({ length: 20 }, (_, i) => `${i},12.000,${i < 10 ? 5 : -5}`).join('\n') + '\n');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('currentSign');
    const chosen = await upload('time_s,volts,amps\n' + Array.from({ length: 20 }, (_, i) => `${i},12.000,${i < 10 ? 5 : -5}`).join('\n') + '\n', { currentSign: 'discharge-positive' });
    expect(chosen.status).toBe(201);
  });
});

describe('import: cadence, acceptance and electrolyte temperature (issue 11 Deliver 2, 6, 7)', () => {
  it.each([1, 60, 300])('a %i s log of a constant 5 A integrates to the analytic Ah', async (stepSeconds) => {
    const count = Math.round((6 * 3600) / stepSeconds) + 1;
    const res = await upload('time_s,volts,amps\n' + lines(count, (i) => String(i * stepSeconds)));
    expect(res.status).toBe(201);
    // 5 A for 6 h is 30 Ah (constant-current arithmetic).
    expect(Math.abs(res.body.fullSummary.dischargeAh - 30) / 30).toBeLessThan(1e-9);
    expect(res.body.fullSummary.gaps).toBe(0);
    expect(res.body.summary.medianIntervalSeconds).toBe(stepSeconds);
  });

  it('a 60 s log with a real 30-minute hole still reports the gap', async () => {
    const times = Array.from({ length: 121 }, (_, i) => i * 60).filter((s) => s <= 1800 || s >= 3600);
    const res = await upload('time_s,volts,amps\n' + lines(times.length, (i) => String(times[i])));
    expect(res.body.fullSummary.gaps).toBe(1);
    expect(res.body.fullSummary.gapSeconds).toBe(1800);
    // 5 A over the 30 + 60 min integrated, not the hole (constant-current arithmetic).
    expect(res.body.fullSummary.dischargeAh).toBeCloseTo((5 * (1800 + 3600)) / 3600, 9);
  });

  it("takes the acceptance from the form, else the lab's setting", async () => {
    const csv = 'time_s,volts,amps\n0,13.2,5\n1,13.1,5\n2,13.0,5\n';
    await withLabSettings({ acceptancePercent: 80 }, async () => {
      expect((await upload(csv)).body.fullSummary.acceptancePercent).toBe(80);
      expect((await upload(csv, { acceptancePercent: '90' })).body.fullSummary.acceptancePercent).toBe(90);
    });
  });

  it('corrects a cold lead-acid run up, by its electrolyte temperature', async () => {
    const battery = (await tech.post('/api/batteries').send({ label: 'LA-10', brand: 'Northgate Cell Lab', chemistry: 'lead-acid', cellsInSeries: 6, ratedAh: 100 }).expect(201)).body.battery;
    const csv = 'time_s,volts,amps\n' + lines(3601, String, '25');
    const res = await upload(csv, { batteryId: String(battery.id), electrolyteTempCelsius: '10' });
    expect(res.status).toBe(201);
    expect(res.body.run.electrolyteTempCelsius).toBe(10);
    expect(res.body.fullSummary.dischargeAh).toBeCloseTo(25, 9); // 25 A for 1 h
    // A cold battery is credited: 25 Ah × 1.19 at 50 °F (factor table from memory).
    expect(res.body.fullSummary.correctedAh25C).toBeCloseTo(25 * 1.19, 9);
    const outside = await upload(csv, { batteryId: String(battery.id), electrolyteTempCelsius: '-20' });
    expect(outside.status).toBe(400);
    expect(outside.body.error.message).toMatch(/outside the correction table/);
  });
});
