import { connectAsync } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { mqttAttachment } from '../../server/mqtt/attach-mqtt.js';
import type { MosquittoBroker } from '../../server/mqtt/broker/mosquitto-broker.js';
import type { GatewayLink } from '../../server/mqtt/gateway-link.js';
import { benchFeedTopic, gatewayUsername } from '../../server/mqtt/topics.js';
import { startServer, type RunningServer } from '../../server/server.js';
import { createTestContext, dropTestDatabase, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { GatewayProcess, startTestBroker, tempDir } from './gateway-kit.js';
import { eventually, tempSpillDir } from './runs-kit.js';

// A server restarted while gateways keep publishing: the broker holds their messages for the
// server's persistent session, and the server remembers the last feed seq it took per bench
// (table gateway_feed_seqs), so a QoS 1 redelivery after the restart is not recorded twice.

let broker: MosquittoBroker;
let t: TestContext;
/** The server now running (the first is t's; each restart replaces it). */
let current: { ctx: RunningServer['ctx']; url: string; close: () => Promise<void> };
const restarted: RunningServer[] = [];
let admin: SignedInAgent;
let tech: SignedInAgent;
let batteryId: number;
let north: { id: number; password: string };
const gateways: GatewayProcess[] = [];

const attachments = () => [mqttAttachment({ broker }), attachBenchManager, liveAttachment({ spillDir: tempSpillDir() })];
/** A one-cell-weak pack discharged to its BMS cutoff, then rest (common practice for a capacity run). */
const scenario = (speed: number, seed: number) => ({ kind: 'simulator', scenario: 'lfp-12v-weak-cell', speed, seed, staleAfterSeconds: 3 });
const RELATIVE = 1e-9;
const link = (): GatewayLink => current.ctx.services.gatewayLink!;

/** Stops the running server and starts another on the same database and broker, as a restart does. */
async function restart(): Promise<void> {
  await current.close();
  const next = await startServer({
    config: t.ctx.config, database: { ...t.ctx.config.db }, port: 0, attachments: attachments(),
    log: { info: () => {}, warn: () => {}, error: (m, e) => console.error(m, e) },
  });
  restarted.push(next);
  current = { ctx: next.ctx, url: next.url, close: () => next.close() };
  [admin, tech] = await Promise.all([signInAs({ url: next.url }, 'admin'), signInAs({ url: next.url }, 'technician')]);
}

beforeAll(async () => {
  broker = await startTestBroker();
  t = await createTestContext({ attachments: attachments() });
  current = { ctx: t.ctx, url: t.url, close: () => t.server.close() };
  [admin, tech] = await Promise.all([signInAs(t, 'admin'), signInAs(t, 'technician')]);
  const battery = await admin.post('/api/batteries').send({ label: 'Pack GW-R', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 100 }).expect(201);
  batteryId = battery.body.battery.id;
  const n = await admin.post('/api/gateways').send({ name: 'north' }).expect(201);
  north = { id: n.body.gateway.id, password: n.body.password };
}, 60_000);

afterAll(async () => {
  for (const g of gateways) await g.stop();
  if (restarted.length > 0) {
    for (const s of restarted) await s.close();
    await dropTestDatabase(t.databaseName);
  } else await t?.close();
  await broker?.stop();
});

async function bench(name: string, speed: number, seed: number): Promise<number> {
  return (await admin.post('/api/benches').send({ name, source: scenario(speed, seed), enabled: false }).expect(201)).body.bench.id;
}
const benchStatus = async (id: number) => (await admin.get(`/api/benches/${id}`).expect(200)).body.bench.status;
const getRun = async (id: number) => (await admin.get(`/api/runs/${id}`).expect(200)).body.run;
/** The readings of a run as exported (time, volts, amps, ... per line), without the metadata. */
const exportedRows = async (id: number) => (await admin.get(`/api/runs/${id}/export.csv`).expect(200)).text.split('\n').filter((l) => /^-?\d/.test(l));

/** Runs the scenario on a bench to its end (the bench says finished) and stops the run. */
async function recordRun(benchId: number, name: string, midway?: () => Promise<void>): Promise<number> {
  const runId = (await tech.post('/api/runs').send({ benchId, batteryId, name, stopWhen: 'manual' }).expect(201)).body.run.id;
  await admin.patch(`/api/benches/${benchId}`).send({ enabled: true }).expect(200);
  if (midway) {
    await eventually(async () => expect((await getRun(runId)).readingsCount).toBeGreaterThan(500), 30_000);
    await midway();
  }
  await eventually(async () => expect((await benchStatus(benchId)).message ?? '').toMatch(/finished/), 90_000, 250);
  await tech.post(`/api/runs/${runId}/stop`).send({});
  await eventually(async () => expect((await getRun(runId)).state).not.toBe('recording'), 10_000);
  await admin.patch(`/api/benches/${benchId}`).send({ enabled: false }).expect(200);
  return runId;
}

describe('a server restart while gateways publish', () => {
  it('drops a QoS 1 redelivery of a message the server took before it restarted', async () => {
    const benchId = await bench('Redelivery', 1, 21);
    await admin.put(`/api/gateways/${north.id}/benches`).send({ benchIds: [benchId] }).expect(200);
    const options = { username: gatewayUsername('north'), password: north.password, reconnectPeriod: 0, protocolVersion: 5 as const };
    const message = (seq: number, tS: number) => JSON.stringify({ type: 'frame', seq, atMs: Date.now(), frame: { t: tS, volts: 13.1, amps: 4, clock: 'device' } });
    const before = await connectAsync(broker.url, { ...options, clientId: 'north-redelivery' });
    await before.publishAsync(benchFeedTopic(benchId), message(1, 1), { qos: 1 });
    await before.publishAsync(benchFeedTopic(benchId), message(2, 2), { qos: 1 });
    await before.endAsync();
    await eventually(async () => expect((await benchStatus(benchId)).framesOk).toBe(2));
    await restart();
    // seq 2 again, as a broker redelivers a message whose acknowledgement did not arrive, then the next one.
    const after = await connectAsync(broker.url, { ...options, clientId: 'north-redelivery' });
    await after.publishAsync(benchFeedTopic(benchId), message(2, 2), { qos: 1, dup: true });
    await after.publishAsync(benchFeedTopic(benchId), message(3, 3), { qos: 1 });
    await after.endAsync();
    await eventually(async () => expect(link().counters.accepted + link().counters.duplicates).toBe(2));
    expect(link().counters.duplicates).toBe(1);
    expect((await benchStatus(benchId)).framesOk).toBe(1);
    await admin.put(`/api/gateways/${north.id}/benches`).send({ benchIds: [] }).expect(200);
  }, 60_000);

  it('records a run through a server restart that equals the same run recorded directly', async () => {
    const direct = await bench('Direct R', 500, 22);
    const remote = await bench('Remote R', 500, 22);
    const runDirect = await recordRun(direct, 'direct');
    const reference = { run: await getRun(runDirect), rows: await exportedRows(runDirect) };
    await admin.put(`/api/gateways/${north.id}/benches`).send({ benchIds: [remote] }).expect(200);
    const gw = new GatewayProcess(broker.url, 'north', north.password, tempDir('kp-gw-north-'));
    gateways.push(gw);
    await gw.start();
    // The gateway keeps publishing while the server is away; the broker queues for the server's session.
    const runRemote = await recordRun(remote, 'through the gateway, server restarted', restart);
    const viaGateway = await getRun(runRemote);
    expect(reference.run.readingsCount).toBeGreaterThan(1000);
    expect(viaGateway.readingsCount).toBe(reference.run.readingsCount);
    expect(Math.abs(viaGateway.summary.dischargeWh - reference.run.summary.dischargeWh)).toBeLessThanOrEqual(RELATIVE * reference.run.summary.dischargeWh);
    expect(Math.abs(viaGateway.summary.dischargeAh - reference.run.summary.dischargeAh)).toBeLessThanOrEqual(RELATIVE * reference.run.summary.dischargeAh);
    const rows = await exportedRows(runRemote);
    const times = rows.map((r) => r.split(',')[0]);
    expect(new Set(times).size).toBe(times.length);
    expect(rows).toEqual(reference.rows);
  }, 240_000);
});
