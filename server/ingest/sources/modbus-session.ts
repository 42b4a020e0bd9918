import modbusSerial from 'modbus-serial';
import type { ModbusFormat, RegisterSpec } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import type { TimerHandle } from '../clock.js';
import { decodeRegister, planReads, type ReadBlock } from '../parsers/modbus-registers.js';
import { toAmps } from '../parsers/units.js';
import { ModbusRtuPort } from './modbus-rtu-port.js';
import type { PortSession, SessionContext } from './port-session.js';
import { MS_PER_S } from '../../../shared/units/time.js';

// modbus-serial is CommonJS with `module.exports.default = module.exports`; under NodeNext
// the default import is the module object, whose `default` is the client class.
const ModbusRTU = modbusSerial.default;

/** Decodes every mapped quantity from the blocks read; names the first register a short reply missed. */
export function decodeModbusFrame(format: ModbusFormat, blocks: { block: ReadBlock; words: number[] }[], tMs: number): Frame | string {
  const read = (spec: RegisterSpec): number | undefined => {
    for (const { block, words } of blocks) {
      const value = decodeRegister(words, block.start, spec);
      if (value !== undefined) return value;
    }
    return undefined;
  };
  const volts = read(format.registers.volts);
  const amps = read(format.registers.amps);
  if (volts === undefined) return `register ${format.registers.volts.address} (volts) missing from reply`;
  if (amps === undefined) return `register ${format.registers.amps.address} (amps) missing from reply`;
  // An f32 register can hold NaN or ±∞ (many meters write NaN for "no reading").
  if (!Number.isFinite(volts)) return `register ${format.registers.volts.address} (volts) reads ${volts}`;
  if (!Number.isFinite(amps)) return `register ${format.registers.amps.address} (amps) reads ${amps}`;
  const frame: Frame = { t: tMs / MS_PER_S, volts, amps: toAmps(amps, 'A', format.currentSign), clock: 'arrival' };
  const { t: tSpec, seq: seqSpec } = format.registers;
  if (tSpec) {
    const t = read(tSpec);
    if (t === undefined) return `register ${tSpec.address} (t) missing from reply`;
    if (!Number.isFinite(t)) return `register ${tSpec.address} (t) reads ${t}`;
    frame.t = t;
    frame.clock = 'device';
  }
  if (seqSpec) {
    const seq = read(seqSpec);
    if (seq === undefined || !Number.isInteger(seq) || seq < 0) return `register ${seqSpec.address} (seq) is not a count`;
    frame.seq = seq;
  }
  for (const group of ['temps', 'aux'] as const) {
    const values: Record<string, number> = {};
    for (const [name, spec] of Object.entries(format.registers[group])) {
      const value = read(spec);
      if (value === undefined) return `register ${spec.address} (${name}) missing from reply`;
      // A probe that reads NaN (unplugged sensor) leaves its channel out; volts and amps still count.
      if (Number.isFinite(value)) values[name] = value;
    }
    if (Object.keys(values).length > 0) frame[group] = values;
  }
  return frame;
}

/** All register specs of a format, for planning reads. */
function allSpecs(format: ModbusFormat): RegisterSpec[] {
  const { volts, amps, t, seq, temps, aux } = format.registers;
  return [volts, amps, ...(t ? [t] : []), ...(seq ? [seq] : []), ...Object.values(temps), ...Object.values(aux)];
}

/**
 * Polls a Modbus RTU slave through modbus-serial (function 03, read holding registers)
 * every `pollMs`; a timeout, an exception reply or a CRC error is a counted rejection.
 */
export function startModbusSession(ctx: SessionContext, format: ModbusFormat): PortSession {
  const { clock, tracker } = ctx;
  const rtuPort = new ModbusRtuPort(ctx.port);
  const client = new ModbusRTU(rtuPort);
  client.setID(format.unitId);
  client.setTimeout(format.replyTimeoutMs);
  const plan = planReads(allSpecs(format));
  let stopped = false;
  let nextPoll: TimerHandle | undefined;
  // modbus-serial re-emits port errors; the serial source handles the port's own events.
  client.on('error', () => undefined);

  const cycle = async (): Promise<void> => {
    const startMs = clock.nowMs();
    try {
      const blocks = [];
      for (const block of plan) {
        const reply = await client.readHoldingRegisters(block.start, block.count);
        blocks.push({ block, words: reply.data });
      }
      if (stopped) return;
      const frame = decodeModbusFrame(format, blocks, startMs);
      if (typeof frame === 'string') tracker.rejected(frame);
      else ctx.emitFrame(frame);
    } catch (err) {
      if (stopped) return;
      tracker.rejected(`modbus: ${err instanceof Error ? err.message : String(err)}`);
    }
    const elapsedMs = clock.nowMs() - startMs;
    nextPoll = clock.setTimeout(() => void cycle(), Math.max(0, format.pollMs - elapsedMs));
  };

  client.open(() => void cycle());
  return {
    stop: () => {
      stopped = true;
      if (nextPoll !== undefined) clock.clearTimeout(nextPoll);
      rtuPort.close();
    },
  };
}
