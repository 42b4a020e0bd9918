import modbusSerial from 'modbus-serial';
import { decodeRegisterValue, encodeRegisterValue, wordsOf } from '../../shared/modbus/register-value.js';
import type { ModbusInstrumentDriver } from '../../shared/schemas/instrument-driver.js';
import type { Clock } from '../ingest/clock.js';
import { ListenerSet } from '../ingest/listener-set.js';
import { planReads } from '../ingest/parsers/modbus-registers.js';
import { ModbusRtuPort } from '../ingest/sources/modbus-rtu-port.js';
import type { SerialPortLike } from '../ingest/sources/serial-port-factory.js';
import { InstrumentFault, type CommandLogEntry, type InstrumentControl, type ReadBack, type SetPoint } from './instrument-control.js';
import { showReply } from './scpi-reply-check.js';
import { setPointProblem } from './set-point-check.js';

// modbus-serial is CommonJS with `module.exports.default = module.exports` (see modbus-session.ts).
const ModbusRTU = modbusSerial.default;
type Spec = ModbusInstrumentDriver['registers']['volts'];
const HEX = 16;
const WORD_HEX_DIGITS = 4;
/** Noise kept for the log of a failed exchange. */
const MAX_SHOWN_BYTES = 32;

const hexWords = (words: readonly number[]) => words.map((w) => w.toString(HEX).padStart(WORD_HEX_DIGITS, '0')).join(' ');

/**
 * An instrument driven over Modbus RTU with the register map of its config: writes with
 * function 16 (write multiple registers), reads with function 03. A timeout, a CRC error, an
 * exception reply or a value that makes no sense (an output state other than 0 or 1, an
 * identity with control bytes) rejects with InstrumentFault; every exchange is logged.
 */
export class ModbusInstrument implements InstrumentControl {
  readonly id: string;
  readonly role: ModbusInstrumentDriver['role'];
  private readonly listeners = new ListenerSet<[CommandLogEntry]>();
  private readonly rtuPort: ModbusRtuPort;
  private readonly client: InstanceType<typeof ModbusRTU>;
  private queue: Promise<unknown> = Promise.resolve();
  private closed = false;
  /** Bytes received during the exchange under way: noise that made no reply is shown as garbage. */
  private received = Buffer.alloc(0);
  private readonly onData = (chunk: Buffer): void => {
    if (this.received.length < MAX_SHOWN_BYTES) this.received = Buffer.concat([this.received, chunk]).subarray(0, MAX_SHOWN_BYTES);
  };

  constructor(
    private readonly config: ModbusInstrumentDriver,
    private readonly port: SerialPortLike,
    private readonly clock: Clock,
  ) {
    this.id = config.id;
    this.role = config.role;
    this.rtuPort = new ModbusRtuPort(port);
    this.client = new ModbusRTU(this.rtuPort);
    this.client.setID(config.unitId);
    this.client.setTimeout(config.replyTimeoutMs);
    // modbus-serial re-emits port errors; each exchange reports its own failure.
    this.client.on('error', () => undefined);
    port.on('data', this.onData);
  }

  /** Ready once modbus-serial has taken the (already open) port. */
  async start(): Promise<void> {
    await new Promise<void>((resolve) => this.client.open(() => resolve()));
  }

  /** The identity registers as text, or the unit address when the instrument has none. */
  async identify(): Promise<string> {
    const identity = this.config.registers.identity;
    if (!identity) return `Modbus unit ${this.config.unitId} (no identity registers)`;
    const words = await this.readWords(identity.address, identity.count, 'identity');
    const text = words.map((w) => String.fromCharCode(w >> 8, w & 0xff)).join('').replace(/\0+$/, '');
    // eslint-disable-next-line no-control-regex
    if (text === '' || /[\x00-\x1f\x7f-\xff]/.test(text)) return this.garbage('identity', `${showReply(text)} is not text`);
    return text;
  }

  /** The reset register when mapped, then output off. */
  async reset(): Promise<void> {
    const reset = this.config.registers.reset;
    if (reset) await this.writeWords(reset.address, [reset.value], 'reset');
    await this.setOutput(false);
  }

  /** Writes the mode code, the mode's value and (when given) the current limit. */
  async set(point: SetPoint): Promise<void> {
    const { registers } = this.config;
    const problem = setPointProblem(point, this.config.limits);
    if (problem) throw new InstrumentFault(this.id, problem);
    const code = registers.mode.codes[point.mode];
    const valueSpec = registers.setValue[point.mode];
    if (code === undefined || valueSpec === undefined) throw new InstrumentFault(this.id, `has no ${point.mode.toUpperCase()} mode`);
    if (point.currentLimitAmps !== undefined && registers.currentLimit === undefined) throw new InstrumentFault(this.id, 'has no current limit register');
    await this.writeValue(registers.mode, code, 'mode');
    await this.writeValue(valueSpec, point.value, `${point.mode} value`);
    if (point.currentLimitAmps !== undefined && registers.currentLimit) await this.writeValue(registers.currentLimit, point.currentLimitAmps, 'current limit');
    await this.checkErrorRegister();
  }

  /** Writes 1 or 0 to the output register. */
  async setOutput(on: boolean): Promise<void> {
    await this.writeValue(this.config.registers.output, on ? 1 : 0, on ? 'output on' : 'output off');
    await this.checkErrorRegister();
  }

  /** Reads volts, amps and the output state in as few requests as the map allows. */
  async read(): Promise<ReadBack> {
    const { volts, amps, output } = this.config.registers;
    const values = await this.readSpecs([volts, amps, output], 'read back');
    const [v, a, state] = values;
    if (!Number.isFinite(v) || !Number.isFinite(a)) return this.garbage('read back', `volts ${v}, amps ${a} are not measurements`);
    if (state !== 0 && state !== 1) return this.garbage('read back', `output register reads ${state}, not 0 or 1`);
    return { volts: v, amps: a, outputOn: state === 1 };
  }

  /** The error register's code when mapped and non-zero (reading it clears it); else empty. */
  async errors(): Promise<string[]> {
    const spec = this.config.registers.errorCode;
    if (!spec) return [];
    const [code] = await this.readSpecs([spec], 'error code');
    return code === 0 ? [] : [`error code ${code}`];
  }

  /** Writes the watchdog time when the map has a watchdog register. */
  async armWatchdog(timeoutSeconds: number): Promise<boolean> {
    const spec = this.config.registers.watchdog;
    if (!spec) return false;
    if (!Number.isFinite(timeoutSeconds) || timeoutSeconds <= 0) throw new InstrumentFault(this.id, `watchdog time ${timeoutSeconds} s is not positive`);
    await this.writeValue(spec, timeoutSeconds, 'watchdog');
    return true;
  }

  /** Detaches modbus-serial and closes the port; switches nothing. */
  async close(): Promise<void> {
    this.closed = true;
    this.port.off('data', this.onData);
    this.rtuPort.close();
    if (this.port.isOpen) await new Promise<void>((done) => this.port.close(() => done()));
  }

  /** Every exchange, for the run's command log. */
  onCommand(listener: (entry: CommandLogEntry) => void): () => void {
    return this.listeners.add(listener);
  }

  private async checkErrorRegister(): Promise<void> {
    const found = await this.errors();
    if (found.length > 0) throw new InstrumentFault(this.id, `refused the last write: ${found.join('; ')}`);
  }

  private async writeValue(spec: Spec, value: number, what: string): Promise<void> {
    let words: number[];
    try {
      words = encodeRegisterValue(value, spec);
    } catch (err) {
      throw new InstrumentFault(this.id, `${what}: ${(err as Error).message}`);
    }
    await this.writeWords(spec.address, words, what);
  }

  private async readSpecs(specs: Spec[], what: string): Promise<number[]> {
    const blocks: { block: { start: number; count: number }; words: number[] }[] = [];
    for (const block of planReads(specs)) blocks.push({ block, words: await this.readWords(block.start, block.count, what) });
    return specs.map((spec) => {
      const found = blocks.find(({ block }) => spec.address >= block.start && spec.address + wordsOf(spec.type) <= block.start + block.count)!;
      return decodeRegisterValue(found.words.slice(spec.address - found.block.start), spec);
    });
  }

  private readWords(address: number, count: number, what: string): Promise<number[]> {
    const sent = `read ${count} at ${address} (${what})`;
    return this.exchange(sent, async () => {
      const reply = await this.client.readHoldingRegisters(address, count);
      return { value: reply.data, shown: hexWords(reply.data) };
    });
  }

  private writeWords(address: number, words: number[], what: string): Promise<void> {
    const sent = `write ${address} = ${hexWords(words)} (${what})`;
    return this.exchange(sent, async () => {
      await this.client.writeRegisters(address, words);
      return { value: undefined, shown: 'ok' };
    });
  }

  /** One request at a time; the outcome goes to the log, a failure rejects with its reason. */
  private exchange<T>(sent: string, job: () => Promise<{ value: T; shown: string }>): Promise<T> {
    const run = async (): Promise<T> => {
      const atMs = this.clock.nowMs();
      if (this.closed) return this.fail(atMs, sent, 'instrument closed');
      this.received = Buffer.alloc(0);
      try {
        const { value, shown } = await job();
        this.listeners.emit({ atMs, instrumentId: this.id, sent, reply: shown, problem: null });
        return value;
      } catch (err) {
        // modbus-serial rejects with plain objects ({ name, message, errno }) as well as Errors.
        const message = typeof err === 'object' && err !== null && 'message' in err ? String(err.message) : String(err);
        const timedOut = /timed out/i.test(message);
        // A timeout with bytes on the line means the instrument answered, but nothing that was a reply.
        if (timedOut && this.received.length > 0) return this.fail(atMs, sent, `garbage reply: ${this.received.toString('hex')} is no Modbus reply`);
        const problem = timedOut ? `no reply within ${this.config.replyTimeoutMs} ms` : /crc/i.test(message) ? `garbage reply: ${message}` : message;
        return this.fail(atMs, sent, problem);
      }
    };
    const next = this.queue.then(run, run);
    this.queue = next.catch(() => undefined);
    return next;
  }

  private fail(atMs: number, sent: string, problem: string): never {
    this.listeners.emit({ atMs, instrumentId: this.id, sent, reply: null, problem });
    throw new InstrumentFault(this.id, `${sent}: ${problem}`);
  }

  private garbage(what: string, reason: string): never {
    this.listeners.emit({ atMs: this.clock.nowMs(), instrumentId: this.id, sent: what, reply: null, problem: `garbage reply: ${reason}` });
    throw new InstrumentFault(this.id, `${what}: garbage reply: ${reason}`);
  }
}
