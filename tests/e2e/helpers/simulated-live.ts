import type { Page, WebSocketRoute } from 'playwright-core';
import type { Run } from '../../../shared/schemas/run.js';
import type { RunEvent } from '../../../shared/schemas/run-event.js';
import { ClientMessageSchema, ServerMessageSchema, timeColumn, type ReadingColumns, type ServerMessage, type Topic } from '../../../shared/schemas/ws.js';

/**
 * A WebSocket peer inside the browser that speaks shared/schemas/ws.ts, for screens whose
 * server side (the live hub) is not in this checkout yet. Every message is checked against
 * ServerMessageSchema before it is sent, so the client is fed exactly what the contract allows.
 * The readings are invented demo data (a fictional 12.8 V LFP pack on a 600 W load).
 */
const SAMPLE_PERIOD_S = 1;
const LOAD_WATTS = 600;

/** Demo discharge: a slow sag on the plateau, then the knee. Invented shape, not a model. */
export function demoDischarge(seconds: number): ReadingColumns {
  const cols = { elapsedSeconds: [] as number[], volts: [] as number[], amps: [] as number[], watts: [] as number[], temps: { cell: [] as number[] }, dischargeWh: [] as number[], dischargeAh: [] as number[], chargeWh: [] as number[], chargeAh: [] as number[] };
  let wh = 0;
  let ah = 0;
  for (let t = 0; t <= seconds; t += SAMPLE_PERIOD_S) {
    const x = t / seconds;
    const volts = 13.25 - 0.55 * x - 1.2 * Math.pow(x, 12);
    const amps = LOAD_WATTS / volts;
    wh += (LOAD_WATTS * SAMPLE_PERIOD_S) / 3600;
    ah += (amps * SAMPLE_PERIOD_S) / 3600;
    cols.elapsedSeconds.push(t);
    cols.volts.push(Number(volts.toFixed(3)));
    cols.amps.push(Number(amps.toFixed(3)));
    cols.watts.push(LOAD_WATTS);
    cols.temps.cell.push(Number((22 + 9 * x).toFixed(2)));
    cols.dischargeWh.push(wh);
    cols.dischargeAh.push(ah);
    cols.chargeWh.push(0);
    cols.chargeAh.push(0);
  }
  return cols;
}

/** The same readings as a topic carries them: run time (`elapsedSeconds`) on a run topic, source time (`t`) on a bench topic; the demo's meter clock starts at 0. */
function onTopic(kind: Topic['kind'], cols: ReadingColumns): ReadingColumns {
  const { elapsedSeconds, t, ...rest } = cols;
  const time = elapsedSeconds ?? t ?? [];
  return kind === 'run' ? { ...rest, elapsedSeconds: time } : { ...rest, t: time };
}

export interface SimulatedBench {
  benchId: number;
  run: Run | null;
  recent: ReadingColumns;
  events: RunEvent[];
}

/** Serves /ws for the page; returns a function that pushes a live event to run subscribers. */
export async function simulateLive(page: Page, benches: SimulatedBench[]): Promise<{ pushEvent(runId: number, event: RunEvent): void }> {
  const sockets = new Set<{ ws: WebSocketRoute; topics: Set<string> }>();
  const send = (ws: WebSocketRoute, message: ServerMessage) => ws.send(JSON.stringify(ServerMessageSchema.parse(message)));
  const empty: ReadingColumns = { elapsedSeconds: [], volts: [], amps: [], watts: [], temps: {} };

  await page.routeWebSocket(/\/ws$/, (ws) => {
    const peer = { ws, topics: new Set<string>() };
    sockets.add(peer);
    ws.onClose(() => sockets.delete(peer));
    send(ws, { type: 'hello', serverTimeMs: Date.now(), user: { id: 2, role: 'technician' } });
    ws.onMessage((raw) => {
      const message = ClientMessageSchema.parse(JSON.parse(String(raw)));
      if (message.type !== 'subscribe') return;
      const topic: Topic = message.topic;
      peer.topics.add(`${topic.kind}:${topic.id}`);
      const bench = benches.find((b) => (topic.kind === 'bench' ? b.benchId === topic.id : b.run?.id === topic.id));
      const status = { state: 'receiving' as const, framesOk: bench ? timeColumn(bench.recent).length : 0, framesRejected: 0, lastFrameAt: new Date().toISOString() };
      send(ws, {
        type: 'snapshot',
        stream: 'simulated',
        seq: bench ? timeColumn(bench.recent).length : 0,
        resume: 'fresh',
        topic,
        status: topic.kind === 'bench' ? status : null,
        run: bench?.run ?? null,
        recent: onTopic(topic.kind, bench?.recent ?? empty),
        events: topic.kind === 'run' ? (bench?.events ?? []) : [],
      });
    });
  });

  return {
    pushEvent(runId, event) {
      // Later subscribers get it in their snapshot, as from the real hub.
      benches.find((b) => b.run?.id === runId)?.events.push(event);
      for (const peer of sockets) {
        if (peer.topics.has(`run:${runId}`)) send(peer.ws, { type: 'event', topic: { kind: 'run', id: runId }, eventId: null, event });
      }
    },
  };
}
