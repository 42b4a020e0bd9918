import { execFile } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { connectAsync } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { mqttAttachment } from '../../server/mqtt/attach-mqtt.js';
import type { MosquittoBroker } from '../../server/mqtt/broker/mosquitto-broker.js';
import { benchFeedTopic, gatewayConfigTopic, gatewayUsername, SERVER_USERNAME } from '../../server/mqtt/topics.js';
import { GatewayListResponseSchema } from '../../shared/schemas/gateway.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { GatewayProcess, startTestBroker, tempDir } from './gateway-kit.js';
import { eventually, tempSpillDir } from './runs-kit.js';

// Simulator → gateway process → Mosquitto → server, beside the same simulation run directly on
// the server: the two runs must agree reading for reading. The simulator is deterministic for a
// seed, so any lost, repeated or reordered frame shows as a different count or total.

let broker: MosquittoBroker;
let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let batteryId: number;
let north: { id: number; password: string };
let south: { id: number; password: string };
const gateways: GatewayProcess[] = [];

/** 6,000 simulated seconds of a one-cell-weak pack discharged to its BMS cutoff, then rest (common practice for a capacity run). */
const scenario = (speed: number, seed: number) => ({ kind: 'simulator', scenario: 'lfp-12v-weak-cell', speed, seed, staleAfterSeconds: 3 });
const RELATIVE = 1e-9;

beforeAll(async () => {
  broker = await startTestBroker();
  t = await createTestContext({ attachments: [mqttAttachment({ broker }), attachBenchManager, liveAttachment({ spillDir: tempSpillDir() })] });
  admin = await signInAs(t, 'admin');
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  const battery = await admin.post('/api/batteries').send({ label: 'Pack GW-1', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 100 }).expect(201);
  batteryId = battery.body.battery.id;
  const n = await admin.post('/api/gateways').send({ name: 'north' }).expect(201);
  north = { id: n.body.gateway.id, password: n.body.password };
  const s = await admin.post('/api/gateways').send({ name: 'south' }).expect(201);
  south = { id: s.body.gateway.id, password: s.body.password };
}, 60_000);

afterAll(async () => {
  for (const g of gateways) await g.stop();
  await t?.close();
  await broker?.stop();
});

async function bench(name: string, speed: number, seed: number): Promise<number> {
  const res = await admin.post('/api/benches').send({ name, source: scenario(speed, seed), enabled: false }).expect(201);
  return res.body.bench.id;
}

async function assign(gatewayId: number, benchIds: number[]): Promise<void> {
  await admin.put(`/api/gateways/${gatewayId}/benches`).send({ benchIds }).expect(200);
}

async function startGateway(name: string, password: string): Promise<GatewayProcess> {
  const g = new GatewayProcess(broker.url, name, password, tempDir(`kp-gw-${name}-`));
  gateways.push(g);
  await g.start();
  return g;
}

async function armRun(benchId: number, name: string): Promise<number> {
  const res = await tech.post('/api/runs').send({ benchId, batteryId, name, stopWhen: 'manual' }).expect(201);
  return res.body.run.id;
}

const benchStatus = async (id: number) => (await viewer.get(`/api/benches/${id}`).expect(200)).body.bench.status;
const getRun = async (id: number) => (await viewer.get(`/api/runs/${id}`).expect(200)).body.run;
const eventTypes = async (id: number): Promise<{ type: string; reason?: string }[]> =>
  (await viewer.get(`/api/runs/${id}/events`).expect(200)).body.events.map((e: { event: { type: string; reason?: string } }) => e.event);
/** The readings of a run as exported (time, volts, amps, ... per line), without the metadata. */
const exportedRows = async (id: number) => (await viewer.get(`/api/runs/${id}/export.csv`).expect(200)).text.split('\n').filter((l) => /^-?\d/.test(l));

/** Waits until the scenario finished on the bench (the gateway's status comes after its last frame), then stops the run. */
async function finishRun(benchId: number, runId: number, timeoutMs: number): Promise<void> {
  await eventually(async () => expect((await benchStatus(benchId)).message ?? '').toMatch(/finished/), timeoutMs, 250);
  await tech.post(`/api/runs/${runId}/stop`).send({});
  await eventually(async () => expect((await getRun(runId)).state).not.toBe('recording'), 10_000);
}

function expectSameRun(direct: { readingsCount: number; summary: { dischargeWh: number; dischargeAh: number } }, viaGateway: typeof direct): void {
  expect(viaGateway.readingsCount).toBe(direct.readingsCount);
  expect(direct.readingsCount).toBeGreaterThan(1000);
  expect(Math.abs(viaGateway.summary.dischargeWh - direct.summary.dischargeWh)).toBeLessThanOrEqual(RELATIVE * direct.summary.dischargeWh);
  expect(Math.abs(viaGateway.summary.dischargeAh - direct.summary.dischargeAh)).toBeLessThanOrEqual(RELATIVE * direct.summary.dischargeAh);
  expect(direct.summary.dischargeAh).toBeGreaterThan(50);
}

describe('bench gateways', () => {
  it('registers a gateway with a password shown once; viewers read only', async () => {
    const list = GatewayListResponseSchema.parse((await viewer.get('/api/gateways').expect(200)).body);
    expect(list.mqtt).toBe(true);
    expect(list.gateways.map((g) => g.name)).toEqual(['north', 'south']);
    expect(JSON.stringify(list)).not.toContain(north.password);
    await viewer.post('/api/gateways').send({ name: 'east' }).expect(403);
    await tech.put(`/api/gateways/${north.id}/benches`).send({ benchIds: [] }).expect(403);
    await admin.post('/api/gateways').send({ name: 'north' }).expect(409);
    await admin.post('/api/gateways').send({ name: 'No Spaces!' }).expect(400);
    // Only the broker's salted hash is stored.
    const [rows] = await t.ctx.sequelize.query('SELECT passwordHash FROM gateways');
    for (const row of rows as { passwordHash: string }[]) expect(row.passwordHash).toMatch(/^\$7\$/);
  });

  it('records a run through gateway and broker that equals the same run recorded directly', async () => {
    const direct = await bench('Direct A', 500, 11);
    const remote = await bench('Remote A', 500, 11);
    await assign(north.id, [remote]);
    await startGateway('north', north.password);
    await eventually(async () => expect((await viewer.get('/api/gateways').expect(200)).body.gateways[0].state.online).toBe(true));
    const runDirect = await armRun(direct, 'direct');
    const runRemote = await armRun(remote, 'through the gateway');
    await admin.patch(`/api/benches/${direct}`).send({ enabled: true }).expect(200);
    await admin.patch(`/api/benches/${remote}`).send({ enabled: true }).expect(200);
    await finishRun(direct, runDirect, 60_000);
    await finishRun(remote, runRemote, 60_000);
    expectSameRun(await getRun(runDirect), await getRun(runRemote));
    expect(await exportedRows(runRemote)).toEqual(await exportedRows(runDirect));
    const state = (await viewer.get('/api/gateways').expect(200)).body.gateways[0].state;
    expect(state.outboxDepth).not.toBeNull();
    expect(typeof state.clockOffsetMs).toBe('number');
    expect(Math.abs(state.clockOffsetMs)).toBeLessThan(1000); // the same machine's clock
    await assign(north.id, []);
  }, 120_000);

  it('loses nothing and keeps the order when the broker is stopped for 30 s mid-run', async () => {
    // 60 s of play: the broker is away for half of it.
    const direct = await bench('Direct B', 100, 12);
    const remote = await bench('Remote B', 100, 12);
    await assign(north.id, [remote]);
    const runDirect = await armRun(direct, 'direct');
    const runRemote = await armRun(remote, 'through the gateway, broker outage');
    await admin.patch(`/api/benches/${direct}`).send({ enabled: true }).expect(200);
    await admin.patch(`/api/benches/${remote}`).send({ enabled: true }).expect(200);
    await eventually(async () => expect((await getRun(runRemote)).readingsCount).toBeGreaterThan(500), 30_000);
    await broker.stop();
    await new Promise((r) => setTimeout(r, 30_000));
    await broker.start();
    await finishRun(direct, runDirect, 90_000);
    await finishRun(remote, runRemote, 90_000);
    expectSameRun(await getRun(runDirect), await getRun(runRemote));
    expect(await exportedRows(runRemote)).toEqual(await exportedRows(runDirect));
    // The server said when it lost the bench and when it came back.
    const types = (await eventTypes(runRemote)).map((e) => e.type);
    expect(types.indexOf('source-lost')).toBeGreaterThan(-1);
    expect(types.indexOf('source-restored')).toBeGreaterThan(types.indexOf('source-lost'));
    expect(t.ctx.services.gatewayLink!.counters.gaps).toBe(0);
    await assign(north.id, []);
  }, 240_000);

  it('marks the bench lost when the gateway is killed, and resumes when it restarts', async () => {
    const remote = await bench('Remote C', 20, 13);
    await assign(south.id, [remote]);
    const gw = await startGateway('south', south.password);
    const run = await armRun(remote, 'gateway killed');
    await admin.patch(`/api/benches/${remote}`).send({ enabled: true }).expect(200);
    await eventually(async () => expect((await getRun(run)).readingsCount).toBeGreaterThan(20), 30_000);
    await gw.stop('SIGKILL');
    // The broker publishes the gateway's last will; the run records the loss with the reason.
    const lost = await eventually(async () => {
      const found = (await eventTypes(run)).find((e) => e.type === 'source-lost');
      expect(found).toBeDefined();
      return found!;
    }, 15_000);
    expect(lost.reason).toMatch(/gateway south offline/);
    const before = (await getRun(run)).readingsCount;
    const again = new GatewayProcess(broker.url, 'south', south.password, gw.dir);
    gateways.push(again);
    await again.start();
    await eventually(async () => expect((await eventTypes(run)).map((e) => e.type)).toContain('source-restored'), 20_000);
    await eventually(async () => expect((await getRun(run)).readingsCount).toBeGreaterThan(before + 20), 30_000);
    await tech.post(`/api/runs/${run}/stop`).send({}).expect(200);
  }, 120_000);

  it('takes a QoS 1 redelivery once (by its seq) and refuses a malformed message without losing the rest', async () => {
    // South's gateway process is not running yet: only this test's client publishes to the bench.
    const benchId = await bench('Dedupe', 1, 16);
    await assign(south.id, [benchId]);
    const link = t.ctx.services.gatewayLink!;
    const client = await connectAsync(broker.url, { clientId: 'south-dedupe', username: gatewayUsername('south'), password: south.password, reconnectPeriod: 0, protocolVersion: 5 });
    const before = { ...link.counters, framesOk: (await benchStatus(benchId)).framesOk as number };
    const message = (seq: number, tS: number) => JSON.stringify({ type: 'frame', seq, atMs: Date.now(), frame: { t: tS, volts: 13.1, amps: 4, clock: 'device' } });
    await client.publishAsync(benchFeedTopic(benchId), message(1_000_001, 1), { qos: 1 });
    await client.publishAsync(benchFeedTopic(benchId), message(1_000_001, 1), { qos: 1, dup: true });
    await client.publishAsync(benchFeedTopic(benchId), '{"type":"frame","seq":1000002,"frame":{"volts":"high"}}', { qos: 1 });
    await client.publishAsync(benchFeedTopic(benchId), message(1_000_002, 2), { qos: 1 });
    await client.endAsync();
    await eventually(async () => expect(link.counters.invalid - before.invalid).toBe(1));
    await eventually(async () => expect((await benchStatus(benchId)).framesOk - before.framesOk).toBe(2));
    expect(link.counters.duplicates - before.duplicates).toBe(1);
    await assign(south.id, []);
  });

  it('refuses wrong credentials and a revoked gateway', async () => {
    const wrong = connectAsync(broker.url, { clientId: 'intruder', username: gatewayUsername('north'), password: 'not-the-password', reconnectPeriod: 0, protocolVersion: 5 });
    await expect(wrong).rejects.toThrow(/not authori[sz]ed|bad user name or password/i);
    const unknown = connectAsync(broker.url, { clientId: 'intruder2', username: 'gateway-nobody', password: 'x', reconnectPeriod: 0, protocolVersion: 5 });
    await expect(unknown).rejects.toThrow(/not authori[sz]ed|bad user name or password/i);
    const east = (await admin.post('/api/gateways').send({ name: 'east' }).expect(201)).body;
    const ok = await connectAsync(broker.url, { clientId: 'east-check', username: gatewayUsername('east'), password: east.password, reconnectPeriod: 0, protocolVersion: 5 });
    await ok.endAsync();
    await admin.post(`/api/gateways/${east.gateway.id}/revoke`).send({}).expect(200);
    const revoked = connectAsync(broker.url, { clientId: 'east-check2', username: gatewayUsername('east'), password: east.password, reconnectPeriod: 0, protocolVersion: 5 });
    await expect(revoked).rejects.toThrow(/not authori[sz]ed|bad user name or password/i);
  });

  it("refuses a gateway's publish to another gateway's bench (seen by the server's account with mosquitto_sub)", async () => {
    const mine = await bench('North own', 1, 14);
    const theirs = await bench('South own', 1, 15);
    await assign(north.id, [mine]);
    await assign(south.id, [theirs]);
    const serverPassword = readFileSync(join(broker.dir, 'server-password'), 'utf8').trim();
    const sub = new Promise<string>((resolve) =>
      execFile(
        'mosquitto_sub',
        ['-h', '127.0.0.1', '-p', String(broker.port), '-u', SERVER_USERNAME, '-P', serverPassword, '-i', 'acl-check', '-t', benchFeedTopic(mine), '-t', benchFeedTopic(theirs), '-v', '-W', '4'],
        (_err, stdout) => resolve(stdout),
      ),
    );
    await new Promise((r) => setTimeout(r, 500));
    const client = await connectAsync(broker.url, { clientId: 'north-acl', username: gatewayUsername('north'), password: north.password, reconnectPeriod: 0, protocolVersion: 5 });
    await expect(client.publishAsync(benchFeedTopic(theirs), 'forged', { qos: 1 })).rejects.toThrow(/not authori[sz]ed/i);
    await client.publishAsync(benchFeedTopic(mine), 'own', { qos: 1 });
    await client.endAsync();
    const seen = await sub;
    expect(seen).toContain(`${benchFeedTopic(mine)} own`);
    expect(seen).not.toContain('forged');
  });

  it("drops a deleted bench from the broker's ACL and from the gateway's configuration at once", async () => {
    const keep = await bench('West keep', 1, 17);
    const gone = await bench('West gone', 1, 18);
    const west = (await admin.post('/api/gateways').send({ name: 'west' }).expect(201)).body;
    await assign(west.gateway.id, [keep, gone]);
    const client = await connectAsync(broker.url, { clientId: 'west-check', username: gatewayUsername('west'), password: west.password, reconnectPeriod: 0, protocolVersion: 5 });
    const configs: number[][] = [];
    client.on('message', (topic, payload) => {
      if (topic === gatewayConfigTopic('west')) configs.push((JSON.parse(payload.toString()) as { benches: { id: number }[] }).benches.map((b) => b.id));
    });
    await client.subscribeAsync(gatewayConfigTopic('west'), { qos: 1 });
    await eventually(async () => expect(configs.at(-1)).toEqual([keep, gone]), 5_000);
    const seen = configs.length;
    await admin.delete(`/api/benches/${gone}`).expect(204);
    // The configuration was published before the answer: it arrives within a round trip, without waiting for a debounce or a later change.
    await eventually(async () => expect(configs.slice(seen)[0]).toEqual([keep]), 1_000, 20);
    // The broker read its new ACL (SIGHUP) within moments: the deleted bench's feed is refused, the kept one is not.
    await eventually(() => expect(client.publishAsync(benchFeedTopic(gone), 'after delete', { qos: 1 })).rejects.toThrow(/not authori[sz]ed/i), 2_000, 50);
    await client.publishAsync(benchFeedTopic(keep), 'still granted', { qos: 1 });
    await client.endAsync();
  });

  it("closes a revoked gateway's live connection: its next publish is not recorded and it cannot connect again", async () => {
    const benchId = await bench('Revoked feed', 1, 19);
    const gw = (await admin.post('/api/gateways').send({ name: 'gone' }).expect(201)).body;
    await assign(gw.gateway.id, [benchId]);
    const options = { username: gatewayUsername('gone'), password: gw.password, reconnectPeriod: 0, protocolVersion: 5 as const };
    const client = await connectAsync(broker.url, { ...options, clientId: 'gone-live' });
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()));
    const message = (seq: number, tS: number) => JSON.stringify({ type: 'frame', seq, atMs: Date.now(), frame: { t: tS, volts: 13.1, amps: 4, clock: 'device' } });
    await client.publishAsync(benchFeedTopic(benchId), message(1, 1), { qos: 1 });
    await eventually(async () => expect((await benchStatus(benchId)).framesOk).toBe(1));
    await admin.post(`/api/gateways/${gw.gateway.id}/revoke`).send({}).expect(200);
    // Mosquitto drops a connection whose account is gone when it reloads its files (SIGHUP).
    await Promise.race([closed, new Promise((_r, reject) => setTimeout(() => reject(new Error('the revoked connection stayed open')), 3_000))]);
    // The client still tries (it queues the message for a reconnection that never comes).
    client.publish(benchFeedTopic(benchId), message(2, 2), { qos: 1 });
    await expect(connectAsync(broker.url, { ...options, clientId: 'gone-again' })).rejects.toThrow(/not authori[sz]ed|bad user name or password/i);
    await new Promise((r) => setTimeout(r, 500));
    expect((await benchStatus(benchId)).framesOk).toBe(1);
    client.end(true);
  });
});
