import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inspect } from 'node:util';
import { createHash } from 'node:crypto';
import sharp from 'sharp';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ReadingsResponseSchema } from '../../shared/schemas/api-runs.js';
import { CreateShareLinkResponseSchema, SharedReportSchema, ShareOpeningsResponseSchema } from '../../shared/schemas/share.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

const logLines: string[] = [];
const capture = (message: string, error?: unknown) => logLines.push(message + (error === undefined ? '' : ` ${error instanceof Error ? `${error.message}\n${error.stack}` : inspect(error)}`));
const tokens: string[] = [];
let dataDir: string;
let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let admin: SignedInAgent;

beforeAll(async () => {
  // A dot folder, as the default data folder (.data) is: photos must still be served from it.
  dataDir = mkdtempSync(join(tmpdir(), '.kneepoint-share-'));
  t = await createTestContext({ config: { dataDir }, log: { info: capture, warn: capture, error: capture } });
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

async function pack(label: string, price: number): Promise<number> {
  const b = await admin.post('/api/batteries').send({ label, brand: 'Corvane', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 1, price, priceCurrency: 'EUR' }).expect(201);
  return b.body.battery.id as number;
}

/** An imported run: 1 A for 1 h at 12 V (constant values), filed under `batteryId`. */
async function importedRun(name: string, batteryId: number): Promise<number> {
  const csv = 'time_s,voltage_v,current_a\n' + Array.from({ length: 361 }, (_, i) => `${i * 10},12,1`).join('\n') + '\n';
  const res = await tech.post('/api/runs/import').field('name', name).field('batteryId', String(batteryId)).field('currentSign', 'discharge-positive').attach('file', Buffer.from(csv), 'run.csv').expect(201);
  return res.body.run.id as number;
}

async function share(kind: 'run' | 'battery', targetId: number, extra: Record<string, unknown> = {}) {
  const res = await tech.post('/api/share-links').send({ kind, targetId, ...extra }).expect(201);
  const body = CreateShareLinkResponseSchema.parse(res.body);
  tokens.push(body.token);
  return body;
}

const photo = () => sharp({ create: { width: 64, height: 48, channels: 3, background: '#406a50' } }).jpeg().toBuffer();

let packA: number;
let packB: number;
let runA: number;
let runB: number;
let photoA: number;
let photoB: number;

describe('share links', () => {
  beforeAll(async () => {
    packA = await pack('Pack SH-1', 420);
    packB = await pack('Pack SH-2', 99);
    runA = await importedRun('Shared capacity run', packA);
    runB = await importedRun('Private run of another pack', packB);
    await tech.post(`/api/runs/${runA}/events`).send({ text: 'lid closed, fan on' }).expect(201);
    await tech.post(`/api/runs/${runA}/signoffs/ready`).send({}).expect(201);
    await admin.post(`/api/runs/${runA}/signoffs`).send({ comment: 'Meets the rating' }).expect(201);
    photoA = (await tech.post(`/api/batteries/${packA}/photos`).attach('file', await photo(), 'a.jpg').expect(201)).body.photo.id;
    photoB = (await tech.post(`/api/batteries/${packB}/photos`).attach('file', await photo(), 'b.jpg').expect(201)).body.photo.id;
  });

  it('makes a link with a 256-bit token, 30 days by default, and keeps only its SHA-256', async () => {
    await viewer.post('/api/share-links').send({ kind: 'run', targetId: runA }).expect(403);
    await tech.post('/api/share-links').send({ kind: 'run', targetId: 999999 }).expect(404);
    await tech.post('/api/share-links').send({ kind: 'run', targetId: runA, expiresInDays: 0 }).expect(400);
    const before = Date.now();
    const { link, token, path } = await share('run', runA);
    expect(Buffer.from(token, 'base64url').length * 8).toBeGreaterThanOrEqual(128);
    expect(path).toBe(`/s/${token}`);
    const days = (Date.parse(link.expiresAt) - before) / 86_400_000;
    expect(days).toBeGreaterThan(29.99);
    expect(days).toBeLessThan(30.01);
    const rows = await t.ctx.sequelize.query<Record<string, unknown>>('SELECT * FROM share_links', { type: QueryTypes.SELECT });
    expect(JSON.stringify(rows)).not.toContain(token);
    expect(rows.map((r) => r.tokenHash)).toContain(createHash('sha256').update(token).digest('hex'));
    const chosen = await share('run', runA, { expiresInDays: 3 });
    expect((Date.parse(chosen.link.expiresAt) - Date.now()) / 86_400_000).toBeCloseTo(3, 2);
  });

  it('opens a run report with no account: summary, verdict, events, notes, chart buckets and the sign-off; no prices unless chosen; each opening logged', async () => {
    const { token, link } = await share('run', runA);
    const res = await stranger().get(`/api/shared/${token}`).set('User-Agent', 'ClientBrowser/1.0').expect(200);
    expect(res.headers['set-cookie']).toBeUndefined();
    expect(res.headers['cache-control']).toBe('no-store');
    const report = SharedReportSchema.parse(res.body.report);
    if (report.kind !== 'run') throw new Error('expected a run report');
    expect(report.run.name).toBe('Shared capacity run');
    // 1 A for 1 h at 12 V: 1 Ah, 12 Wh (constant values, exact).
    expect(report.summary?.dischargeAh).toBeCloseTo(1, 6);
    expect(report.summary?.dischargeWh).toBeCloseTo(12, 6);
    expect(report.summary?.costPerKWh ?? null).toBeNull();
    expect(report.battery).toMatchObject({ label: 'Pack SH-1', price: null, priceCurrency: null });
    expect(report.events.some((e) => e.event.type === 'annotation' && e.event.text === 'lid closed, fan on')).toBe(true);
    expect(report.signoff).toMatchObject({ status: 'signed', signed: { comment: 'Meets the rating', byName: 'Test Admin' } });
    expect(JSON.stringify(report)).not.toContain('Private run of another pack');
    const samples = ReadingsResponseSchema.parse((await stranger().get(`/api/shared/${token}/readings?maxPoints=50`).expect(200)).body);
    expect(samples.runId).toBe(runA);
    // 361 readings at 12 V in at most 50 min/max buckets.
    expect(samples.readingsInWindow).toBe(361);
    expect(samples.reduced).toBe(true);
    expect(samples.x.length).toBeLessThanOrEqual(50);
    expect(samples.volts.max.every((v) => v === null || v === 12)).toBe(true);
    // The old address answers the same for clients written before the rename. vocab-rename: keep
    expect((await stranger().get(`/api/shared/${token}/samples?maxPoints=50`).expect(200)).body).toEqual(samples); // vocab-rename: keep

    const priced = await share('run', runA, { includePrices: true });
    const withPrice = SharedReportSchema.parse((await stranger().get(`/api/shared/${priced.token}`).expect(200)).body.report);
    expect(withPrice.kind === 'run' && withPrice.battery?.price).toBe(420);

    const openings = ShareOpeningsResponseSchema.parse((await tech.get(`/api/share-links/${link.id}/openings`).expect(200)).body).openings;
    expect(openings).toHaveLength(1);
    expect(openings[0]!.userAgent).toBe('ClientBrowser/1.0');
    expect(openings[0]!.addressHash).toMatch(/^[0-9a-f]{64}$/);
    expect(openings[0]!.addressHash).not.toContain('127.0.0.1');
    await viewer.get(`/api/share-links/${link.id}/openings`).expect(403);
    const listed = (await tech.get(`/api/share-links?kind=run&targetId=${runA}`).expect(200)).body.links;
    expect(listed.find((l: { id: number }) => l.id === link.id)).toMatchObject({ state: 'active', openings: 1 });
  });

  it('opens a pack report: specs, capacity history of that pack only, inspection photos through the token', async () => {
    const { token } = await share('battery', packA);
    const report = SharedReportSchema.parse((await stranger().get(`/api/shared/${token}`).expect(200)).body.report);
    if (report.kind !== 'battery') throw new Error('expected a pack report');
    expect(report.battery).toMatchObject({ label: 'Pack SH-1', price: null });
    expect(report.runs.map((r) => r.name)).toEqual(['Shared capacity run']);
    expect(report.otherPhotoIds).toEqual([photoA]);
    const thumb = await stranger().get(`/api/shared/${token}/photos/${photoA}/thumb`).expect(200);
    expect(thumb.headers['content-type']).toBe('image/jpeg');
    await stranger().get(`/api/shared/${token}/photos/${photoB}/thumb`).expect(404);
    await stranger().get(`/api/shared/${token}/photos/${photoA}/full`).expect(404);
  });

  it('reaches no other API data with a share token', async () => {
    const run = await share('run', runA);
    const packLink = await share('battery', packA);
    const noContent = (res: request.Response) => {
      expect(JSON.stringify(res.body)).not.toMatch(/Private run|Pack SH-2|Shared capacity run/);
      return res;
    };
    for (const path of [
      `/api/shared/${run.token}/runs`,
      `/api/shared/${run.token}/runs/${runB}`,
      `/api/shared/${run.token}/${runB}`,
      `/api/shared/${run.token}/events`,
      `/api/shared/${run.token}/export.csv`,
      `/api/shared/${run.token}/photos/${photoA}/thumb`,
      `/api/shared/${packLink.token}/readings`,
      `/api/shared/${packLink.token}/batteries/${packB}`,
      `/api/shared/${run.token}/%2e%2e/%2e%2e/runs`,
    ]) {
      noContent(await stranger().get(path).expect(404));
    }
    // The other run's samples are not reachable by asking for its id: the link's own run answers.
    expect((await stranger().get(`/api/shared/${run.token}/readings?runId=${runB}&id=${runB}`).expect(200)).body.runId).toBe(runA);
    for (const path of ['/api/runs', `/api/runs/${runB}`, `/api/runs/${runA}`, `/api/batteries/${packB}`, `/api/photos/${photoB}/thumb`]) {
      noContent(await stranger().get(path).set('Authorization', `Bearer ${run.token}`).set('Cookie', `share=${run.token}`).expect(401));
      noContent(await stranger().get(`${path}?token=${run.token}`).expect(401));
    }
    noContent(await stranger().post(`/api/shared/${run.token}`).send({}).expect(404));
  });

  it('answers 404 with no content once a link is revoked or expired, and for a made-up token', async () => {
    const revoked = await share('run', runA);
    await stranger().get(`/api/shared/${revoked.token}`).expect(200);
    await viewer.post(`/api/share-links/${revoked.link.id}/revoke`).expect(403);
    const after = (await tech.post(`/api/share-links/${revoked.link.id}/revoke`).expect(200)).body.link;
    expect(after).toMatchObject({ state: 'revoked', revokedByName: 'Test Technician' });
    const expired = await share('battery', packA, { expiresInDays: 1 });
    await stranger().get(`/api/shared/${expired.token}`).expect(200);
    // The day passes: the expiry moves into the past.
    await t.ctx.sequelize.query('UPDATE share_links SET expiresAt = DATE_SUB(UTC_TIMESTAMP(3), INTERVAL 1 SECOND) WHERE id = ?', { replacements: [expired.link.id] });
    const made = Buffer.alloc(32, 7).toString('base64url');
    for (const token of [revoked.token, expired.token, made, 'short']) {
      for (const path of [`/api/shared/${token}`, `/api/shared/${token}/readings`, `/api/shared/${token}/photos/${photoA}/thumb`]) {
        const res = await stranger().get(path).expect(404);
        expect(Object.keys(res.body)).toEqual(['error']);
        expect(JSON.stringify(res.body)).not.toMatch(/Shared capacity run|Pack SH-1|Meets the rating/);
      }
    }
    const openings = ShareOpeningsResponseSchema.parse((await tech.get(`/api/share-links/${revoked.link.id}/openings`).expect(200)).body).openings;
    expect(openings).toHaveLength(1);
  });

  it('never writes a share token to the server log, even when a shared request fails', async () => {
    const { token } = await share('run', runA);
    // A fault inside the shared route: the openings log is gone, so the request fails with a 500 that is logged.
    await t.ctx.sequelize.query('RENAME TABLE share_link_openings TO share_link_openings_away');
    try {
      await stranger().get(`/api/shared/${token}`).expect(500);
      await stranger().get(`/api/shared/${token}/report.pdf`).expect(500);
    } finally {
      await t.ctx.sequelize.query('RENAME TABLE share_link_openings_away TO share_link_openings');
    }
    const log = logLines.join('\n');
    expect(log).toContain('Unhandled error on GET /api/shared/[redacted]');
    expect(log).toContain('Unhandled error on GET /api/shared/[redacted]/report.pdf');
    expect(tokens.length).toBeGreaterThan(5);
    for (const shared of tokens) expect(log).not.toContain(shared);
  });
});
