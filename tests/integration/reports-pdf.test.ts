import { mkdtempSync, rmSync, unlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ListRunsResponseSchema } from '../../shared/schemas/api-runs.js';
import { ProtectionRecordResponseSchema } from '../../shared/schemas/protection-check.js';
import { CreateShareLinkResponseSchema, ShareOpeningsResponseSchema } from '../../shared/schemas/share.js';
import { SignoffHistoryResponseSchema } from '../../shared/schemas/signoff.js';
import { formatCharge, formatEnergy, formatPercent, formatTemperature } from '../../shared/units/format.js';
import { PhotoFiles } from '../../server/photos/photo-files.js';
import { PhotosRepo } from '../../server/photos/photos-repo.js';
import { RunsRepo } from '../../server/runs/runs-repo.js';
import { createTestContext, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';
import { binaryBody, pdfImageCount, pdfText } from './helpers/pdf-text.js';

let dataDir: string;
let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let admin: SignedInAgent;

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), '.kneepoint-reports-'));
  t = await createTestContext({ config: { dataDir } });
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  admin = await signInAs(t, 'admin');
});
afterAll(async () => {
  await t?.close();
  rmSync(dataDir, { recursive: true, force: true });
});

/** A client with no account and no cookie. */
const stranger = () => request(t.url);

async function pdfOf(agent: SignedInAgent | ReturnType<typeof stranger>, path: string): Promise<Buffer> {
  const res = await agent.get(path).buffer(true).parse(binaryBody).expect(200);
  expect(res.headers['content-type']).toBe('application/pdf');
  const bytes = res.body as Buffer;
  expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
  return bytes;
}

/**
 * An imported capacity run: 1 A for `seconds`, the voltage falling linearly from 13.0 V by
 * `voltsPerHour`, end voltage 12 V; filed under `batteryId`.
 */
async function importedRun(name: string, batteryId: number, seconds: number, voltsPerHour = 1): Promise<number> {
  const rows = Array.from({ length: seconds / 10 + 1 }, (_, i) => `${i * 10},${(13 - (i * 10 * voltsPerHour) / 3600).toFixed(4)},1`);
  const csv = `time_s,voltage_v,current_a\n${rows.join('\n')}\n`;
  const res = await tech
    .post('/api/runs/import')
    .field('name', name)
    .field('batteryId', String(batteryId))
    .field('endVolts', '12')
    .field('currentSign', 'discharge-positive')
    .attach('file', Buffer.from(csv), 'run.csv')
    .expect(201);
  return res.body.run.id as number;
}

async function pack(label: string, extra: Record<string, unknown> = {}): Promise<number> {
  const b = await admin.post('/api/batteries').send({ label, brand: 'Corvane', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 1, ratedWh: 12.8, price: 420, priceCurrency: 'EUR', ...extra }).expect(201);
  return b.body.battery.id as number;
}

async function share(kind: 'run' | 'battery', targetId: number, extra: Record<string, unknown> = {}) {
  return CreateShareLinkResponseSchema.parse((await tech.post('/api/share-links').send({ kind, targetId, ...extra }).expect(201)).body);
}

/** "YYYY-MM-DD HH:MM" of an instant shifted by a fixed offset from UTC. */
const shifted = (iso: string, offsetMinutes: number) => new Date(Date.parse(iso) + offsetMinutes * 60_000).toISOString().slice(0, 16).replace('T', ' ');

describe('the run report PDF\'s sign-off block', () => {
  it('says who signed, when in the lab\'s zone, the comment and the frozen figures\' state, and lists earlier sign-offs', async () => {
    // Asia/Kolkata is UTC+05:30 all year, no daylight saving (IANA tz database): the shift is checked by hand below.
    await admin.patch('/api/settings').send({ timeZone: 'Asia/Kolkata' }).expect(200);
    try {
      const batteryId = await pack('Pack RP-1');
      const runId = await importedRun('Signed capacity run', batteryId, 3600, 0.5);
      const text = async () => pdfText(await pdfOf(viewer, `/api/runs/${runId}/report.pdf`));
      const review = async () => SignoffHistoryResponseSchema.parse((await viewer.get(`/api/runs/${runId}/signoffs`).expect(200)).body);

      const unsigned = await text();
      expect(unsigned).toContain('Not signed off.');
      expect(unsigned).not.toContain('Signed by');

      await tech.post(`/api/runs/${runId}/signoffs/ready`).send({ comment: 'ready' }).expect(201);
      expect(await text()).toContain('Not signed off: marked ready for review');
      await admin.post(`/api/runs/${runId}/signoffs`).send({ comment: 'Meets the rating within the meter uncertainty' }).expect(201);
      const first = (await review()).entries.find((e) => e.action === 'signed')!;
      const signed = await text();
      expect(signed).toContain('Signed: the figures below are the ones signed off.');
      expect(signed).toContain(`Signed by ${TEST_USERS.admin.name} (admin), ${shifted(first.at, 330)} (Asia/Kolkata)`);
      expect(signed).toContain('Comment: Meets the rating within the meter uncertainty');
      expect(signed).toContain(`Frozen figures: SHA-256 ${first.contentHash}`);
      expect(signed).not.toContain('Earlier sign-offs');

      // A note changes the run: the signature no longer holds and the PDF says so, listing the old one.
      await tech.post(`/api/runs/${runId}/events`).send({ text: 'terminal re-torqued' }).expect(201);
      const changed = await text();
      expect(changed).toContain('Changed since sign-off, needs a new sign-off');
      expect(changed).not.toContain('Frozen figures');
      expect(changed).toContain(`Earlier sign-offs: Signed by ${TEST_USERS.admin.name} (admin), ${shifted(first.at, 330)} (Asia/Kolkata), no longer holds. Comment: Meets the rating`);

      await tech.post(`/api/runs/${runId}/signoffs/ready`).send({}).expect(201);
      await admin.post(`/api/runs/${runId}/signoffs`).send({ comment: 'Signed again after the note' }).expect(201);
      const second = (await review()).entries.find((e) => e.action === 'signed' && e.state === 'current')!;
      const resigned = await text();
      expect(resigned).toContain('Comment: Signed again after the note');
      expect(resigned).toContain(`Frozen figures: SHA-256 ${second.contentHash}`);
      expect(resigned).toContain('Earlier sign-offs:');
      expect(resigned).toContain('no longer holds. Comment: Meets the rating within the meter uncertainty');

      // The shared page's block and the shared PDF show the same: the signature that holds and the earlier one.
      const link = await share('run', runId);
      const { report } = (await stranger().get(`/api/shared/${link.token}`).expect(200)).body;
      expect(report.signoff.signed.comment).toBe('Signed again after the note');
      expect(report.signoff.earlier.map((e: { comment: string; state: string }) => [e.comment, e.state])).toEqual([['Meets the rating within the meter uncertainty', 'superseded']]);
      const sharedPdf = await pdfText(await pdfOf(stranger(), `/api/shared/${link.token}/report.pdf`));
      expect(sharedPdf).toContain('Comment: Signed again after the note');
      expect(sharedPdf).toContain('no longer holds. Comment: Meets the rating within the meter uncertainty');
    } finally {
      await admin.patch('/api/settings').send({ timeZone: 'UTC' }).expect(200);
    }
  });
});

describe('the pack report PDF', () => {
  let packId: number;
  let otherPackId: number;
  let runIds: number[];
  let itemTitle: string;

  beforeAll(async () => {
    packId = await pack('Pack RP-2', {
      protectionSpecs: [{ protection: 'over-temp-discharge', thresholdValue: 60, delaySeconds: 5, releaseValue: 50 }],
      notes: 'internal: dented corner, sender rude',
      owner: 'Client Ltd',
    });
    otherPackId = await pack('Pack RP-3');
    // End voltage 12 V reached after 4000 s and 3600 s at 1 A: two different capacities.
    runIds = [await importedRun('First capacity test', packId, 4200, 0.9), await importedRun('Second capacity test', packId, 3800)];
    await importedRun('Run of another pack', otherPackId, 3700);
    // A protection-check result on the pack's record, stored as the recorder stores a finished check's summary.
    const repo = new RunsRepo(t.ctx.sequelize);
    const base = (await repo.get(runIds[0]!))!;
    const check = await repo.create({
      name: 'Hot cutoff check', tags: [], origin: 'live', benchId: null, batteryId: packId, state: 'finished', createdById: null, startedAt: new Date(),
      config: { kind: 'protection-check', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: false }, stopWhen: 'manual', targetAh: null, targetWh: null, afterRecoverySeconds: 0 },
    });
    const protections = [{
      protection: 'over-temp-discharge', unit: '°C', channel: 'cell', expectedValue: 60, expectedDelaySeconds: 5, expectedReleaseValue: 50, thresholdTolerance: 2, delayToleranceSeconds: 1.5,
      measuredValue: 61.2, measuredDelaySeconds: 5, releaseValue: 49.5, resumeSeconds: 300, beyondAtStart: false, meanHeaterAmps: null, peakHeaterAmps: null, trips: 1, outcome: 'pass', notes: [], window: null,
    }];
    await t.ctx.sequelize.query('UPDATE runs SET summary = ? WHERE id = ?', { replacements: [JSON.stringify({ ...base.summary, protections }), check.id] });
    const items = (await admin.get('/api/inspection-items').expect(200)).body.items as Array<{ id: number; title: string }>;
    itemTitle = items[0]!.title;
    await tech.put(`/api/batteries/${packId}/inspection/${items[0]!.id}`).send({ rating: 'concern', note: 'one weld discoloured' }).expect(200);
    const picture = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#5a6470' } }).jpeg().toBuffer();
    await tech.post(`/api/batteries/${packId}/photos`).field('item', String(items[0]!.id)).attach('file', picture, 'weld.jpg').expect(201);
    await tech.post(`/api/batteries/${packId}/photos`).attach('file', picture, 'label.jpg').expect(201);
  });

  it('holds specs, capacity history, protection record, inspection and runs with the figures exactly as the API gives them, in the lab\'s units', async () => {
    const { runs } = ListRunsResponseSchema.parse((await viewer.get(`/api/runs?batteryId=${packId}&limit=500`).expect(200)).body);
    const record = ProtectionRecordResponseSchema.parse((await viewer.get(`/api/batteries/${packId}/protections`).expect(200)).body);
    const capacityRuns = runs.filter((r) => runIds.includes(r.id));
    expect(capacityRuns).toHaveLength(2);
    // 4000 s and 3600 s at 1 A to the end voltage (the rule of the trapezoid is exact on constant current).
    expect(capacityRuns.map((r) => r.summary!.capacityAh).sort()).toEqual([1, 4000 / 3600].map((ah) => expect.closeTo(ah, 6)));
    expect(record.rows).toHaveLength(1);
    for (const [temperatureUnit, energyUnit] of [['C', 'Wh'], ['F', 'kWh']] as const) {
      await admin.patch('/api/settings').send({ temperatureUnit, energyUnit, labName: 'Northgate Cell Lab' }).expect(200);
      const bytes = await pdfOf(viewer, `/api/batteries/${packId}/report.pdf`);
      const text = await pdfText(bytes);
      expect(text).toContain('Northgate Cell Lab');
      expect(text).toContain('Pack report: Pack RP-2');
      expect(text).toMatch(/Made \d{4}-\d\d-\d\d \d\d:\d\d \(UTC\)/);
      expect(text).toMatch(/page 1 of \d/);
      expect(text).toContain('Rated capacity: 1.00 Ah');
      expect(text).toContain(`Rated energy: ${formatEnergy(12.8, energyUnit)}`);
      for (const run of capacityRuns) {
        const s = run.summary!;
        expect(text).toContain(run.name);
        expect(text).toContain(formatCharge(s.capacityAh));
        expect(text).toContain(formatEnergy(s.capacityWh, energyUnit));
        expect(text).toContain(formatPercent(s.percentRatedAh));
        expect(text).toContain(formatPercent(s.percentRatedWh));
        expect(text).toContain(s.verdict);
      }
      const row = record.rows[0]!;
      expect(text).toContain(`Over-temperature, discharging: ${formatTemperature(60, temperatureUnit)} after 5 s, released at ${formatTemperature(50, temperatureUnit)}`);
      expect(text).toContain(formatTemperature(row.measuredValue, temperatureUnit));
      // 61.2 °C = 142.16 °F (°F = °C × 9/5 + 32, NIST SP 811 appendix B.8).
      if (temperatureUnit === 'F') expect(text).toContain('142.2 °F');
      expect(text).toContain('Hot cutoff check');
      expect(text).toContain(`${itemTitle}: concern (one weld discoloured) weld.jpg Other photos label.jpg`);
      expect(text).toContain('Safety: lithium packs can burn');
      expect(text).not.toContain('Run of another pack');
      // The pack's internal fields and (unless asked) its price stay out of a report that may go to the client.
      expect(text).not.toContain('dented corner');
      expect(text).not.toContain('Client Ltd');
      expect(text).not.toContain('420.00');
      expect(await pdfImageCount(bytes)).toBe(2);
    }
    await admin.patch('/api/settings').send({ temperatureUnit: 'C', energyUnit: 'Wh' }).expect(200);
    expect(await pdfText(await pdfOf(viewer, `/api/batteries/${packId}/report.pdf?prices=1`))).toContain('Price: 420.00 EUR');
  });

  it('has no images when the pack has no photos, names a photo whose file is gone, and follows the pack page\'s access rules', async () => {
    const bytes = await pdfOf(viewer, `/api/batteries/${otherPackId}/report.pdf`);
    expect(await pdfImageCount(bytes)).toBe(0);
    // A photo whose thumbnail file was lost: the report still comes, naming it, with no broken image.
    const picture = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#406a50' } }).jpeg().toBuffer();
    const photoId = (await tech.post(`/api/batteries/${otherPackId}/photos`).attach('file', picture, 'lost.jpg').expect(201)).body.photo.id as number;
    const stored = (await new PhotosRepo(t.ctx.sequelize).get(photoId))!;
    unlinkSync(new PhotoFiles(dataDir).pathOf(stored.storageKey, 'thumb', stored.format));
    const lost = await pdfOf(viewer, `/api/batteries/${otherPackId}/report.pdf`);
    expect(await pdfText(lost)).toContain('lost.jpg (file missing)');
    expect(await pdfImageCount(lost)).toBe(0);
    await stranger().get(`/api/batteries/${packId}/report.pdf`).expect(401);
    await viewer.get('/api/batteries/999999/report.pdf').expect(404);
    await viewer.get('/api/batteries/abc/report.pdf').expect(400);
  });

  it('is given through a pack share link (the price only when chosen), never through a run link, and not after revoking', async () => {
    const packLink = await share('battery', packId);
    const shared = await pdfOf(stranger(), `/api/shared/${packLink.token}/report.pdf`);
    const text = await pdfText(shared);
    expect(text).toContain('Pack report: Pack RP-2');
    expect(text).not.toContain('420.00');
    expect(await pdfImageCount(shared)).toBe(2);
    // A PDF download is an opening too, logged as such.
    const openings = ShareOpeningsResponseSchema.parse((await tech.get(`/api/share-links/${packLink.link.id}/openings`).expect(200)).body).openings;
    expect(openings.map((o) => o.what)).toEqual(['pdf']);
    const priced = await share('battery', packId, { includePrices: true });
    expect(await pdfText(await pdfOf(stranger(), `/api/shared/${priced.token}/report.pdf`))).toContain('Price: 420.00 EUR');

    // A viewer of a shared run gets that run's report and nothing of its pack's.
    const runLink = await share('run', runIds[0]!);
    const runPdf = await pdfText(await pdfOf(stranger(), `/api/shared/${runLink.token}/report.pdf`));
    expect(runPdf).toContain('Run report: First capacity test');
    expect(runPdf).not.toContain('Pack report');
    expect(runPdf).not.toContain('Second capacity test');
    await stranger().get(`/api/batteries/${packId}/report.pdf`).set('Referer', `${t.url}/s/${runLink.token}`).expect(401);
    await stranger().get(`/api/shared/${runLink.token}/batteries/${packId}/report.pdf`).expect(404);

    await tech.post(`/api/share-links/${packLink.link.id}/revoke`).send({}).expect(200);
    const gone = await stranger().get(`/api/shared/${packLink.token}/report.pdf`).expect(404);
    expect(gone.headers['content-type']).toMatch(/json/);
    expect(JSON.stringify(gone.body)).not.toContain('RP-2');
  });
});
