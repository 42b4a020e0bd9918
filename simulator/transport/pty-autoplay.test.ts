import { existsSync } from 'node:fs';
import { ReadlineParser, SerialPort } from 'serialport';
import { afterEach, describe, expect, it } from 'vitest';
import { FrameSchema, type Frame } from '../../shared/schemas/frame.js';
import { loadScenario } from '../scenario/registry.js';
import type { Scenario } from '../scenario/schema.js';
import { startPtyMeter, type PtyMeter } from './pty-meter.js';

const SPEED = 50;
const WATCHDOG_MS = 100;
const UNPLUG = { atSeconds: 30, forSeconds: 10 };
const base = loadScenario('noisy-meter-unplug');
// A short run of the noisy scenario with a clean line, so every missing frame is the unplug's doing.
const scenario: Scenario = {
  ...base,
  program: [{ kind: 'discharge', load: { mode: 'cc', amps: 20 }, maxSeconds: 80 }],
  meter: { ...base.meter, dropProbability: 0, corruptProbability: 0, unplugs: [UNPLUG] },
};
let meter: PtyMeter | undefined;
let stopGateway = () => undefined as void;

afterEach(async () => {
  stopGateway();
  await meter?.stop();
});

/** A gateway like the real one: reads lines, and when the port vanishes, reopens the same path. */
function reconnectingGateway(path: string, onFrame: (f: Frame) => void, onClose: () => void) {
  let stopped = false;
  let port: SerialPort | undefined;
  const open = () => {
    if (stopped) return;
    if (!existsSync(path)) return void setTimeout(open, 10);
    port = new SerialPort({ path, baudRate: 115200 });
    port.on('error', () => undefined);
    port.on('close', () => {
      onClose();
      setTimeout(open, 10);
    });
    port.pipe(new ReadlineParser({ delimiter: '\n' })).on('data', (line: string) => {
      lastDataMs = Date.now();
      onFrame(FrameSchema.parse(JSON.parse(line)));
    });
  };
  // The no-data watchdog: a silent port gets a probe byte, which fails with EIO (and closes
  // the port) if the device has gone without serialport noticing on its read.
  let lastDataMs = Date.now();
  const watchdog = setInterval(() => {
    if (port?.isOpen && Date.now() - lastDataMs > WATCHDOG_MS) port.write('\n');
  }, WATCHDOG_MS / 2);
  open();
  return () => {
    stopped = true;
    clearInterval(watchdog);
    if (port?.isOpen) port.close();
  };
}

describe('a played meter on a pseudo-terminal', { timeout: 20_000 }, () => {
  it('plays at speed with simulated timestamps and unplugs/replugs as the scenario says', async () => {
    meter = await startPtyMeter({ scenario, format: 'jsonl', seed: 3, speed: SPEED, linkPath: `/tmp/kneepoint-sim-auto-${process.pid}` });
    const frames: Frame[] = [];
    let closes = 0;
    stopGateway = reconnectingGateway(meter.path, (f) => frames.push(f), () => (closes += 1));
    const startedMs = Date.now();
    await meter.finished;
    const elapsedSeconds = (Date.now() - startedMs) / 1000;
    await new Promise((r) => setTimeout(r, 100));
    // 80 simulated seconds at 50× take about 1.6 s of real time.
    expect(elapsedSeconds).toBeGreaterThan(80 / SPEED - 0.2);
    expect(elapsedSeconds).toBeLessThan(80 / SPEED + 2);
    expect(closes).toBeGreaterThanOrEqual(1);
    const seqs = frames.map((f) => f.seq!);
    for (let i = 1; i < seqs.length; i += 1) expect(seqs[i]).toBeGreaterThan(seqs[i - 1]);
    const ts = frames.map((f) => f.t);
    expect(ts.some((t) => t >= UNPLUG.atSeconds && t < UNPLUG.atSeconds + UNPLUG.forSeconds)).toBe(false);
    expect(ts.filter((t) => t > UNPLUG.atSeconds + UNPLUG.forSeconds + 2).length).toBeGreaterThan(20);
    expect(ts.filter((t) => t < UNPLUG.atSeconds).length).toBeGreaterThan(20);
  });
});
