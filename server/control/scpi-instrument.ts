import type { ScpiInstrumentDriver } from '../../shared/schemas/instrument-driver.js';
import { MAX_ERROR_QUEUE_READS } from '../../shared/schemas/instrument-driver.js';
import type { Clock } from '../ingest/clock.js';
import { ListenerSet } from '../ingest/listener-set.js';
import type { SerialPortLike } from '../ingest/sources/serial-port-factory.js';
import { fillTemplate } from './format-value.js';
import {
  InstrumentFault,
  type CommandLogEntry,
  type InstrumentControl,
  type ReadBack,
  type SetPoint,
} from './instrument-control.js';
import { LineExchange } from './line-exchange.js';
import { checkErrorEntry, checkIdentity, checkNumber, checkState, type Checked } from './scpi-reply-check.js';
import { setPointProblem } from './set-point-check.js';

/**
 * An instrument driven by SCPI over a serial line, with the command set of its config. Every
 * exchange goes to the onCommand listeners, failed ones with their problem. A missing reply,
 * a reply of the wrong shape, or (with `verifyWithErrorQuery`) an entry in the instrument's
 * error queue after a command rejects with InstrumentFault naming the reason.
 */
export class ScpiInstrument implements InstrumentControl {
  readonly id: string;
  readonly role: ScpiInstrumentDriver['role'];
  private readonly line: LineExchange;
  private readonly listeners = new ListenerSet<[CommandLogEntry]>();

  constructor(
    private readonly config: ScpiInstrumentDriver,
    private readonly port: SerialPortLike,
    private readonly clock: Clock,
  ) {
    this.id = config.id;
    this.role = config.role;
    this.line = new LineExchange(port, clock, config.lineEnding);
  }

  /** `*IDN?`: maker, model, serial and firmware as one line. */
  async identify(): Promise<string> {
    return this.ask(this.config.commands.identify, checkIdentity);
  }

  /** `*RST`, then output off, so the instrument is known to be off whatever its reset does. */
  async reset(): Promise<void> {
    await this.send(this.config.commands.reset);
    await this.setOutput(false);
  }

  /** Selects the mode, sets its value and (when given) the current limit. */
  async set(point: SetPoint): Promise<void> {
    const { commands } = this.config;
    const problem = setPointProblem(point, this.config.limits);
    if (problem) throw new InstrumentFault(this.id, problem);
    const select = commands.mode[point.mode];
    const value = commands.setValue[point.mode];
    if (select === undefined || value === undefined) throw new InstrumentFault(this.id, `has no ${point.mode.toUpperCase()} mode`);
    if (point.currentLimitAmps !== undefined && commands.currentLimit === undefined) {
      throw new InstrumentFault(this.id, 'has no current limit command');
    }
    await this.send(select);
    await this.send(fillTemplate(value, point.value));
    if (point.currentLimitAmps !== undefined && commands.currentLimit !== undefined) {
      await this.send(fillTemplate(commands.currentLimit, point.currentLimitAmps));
    }
  }

  /** Input (load) or output (supply) on or off. */
  async setOutput(on: boolean): Promise<void> {
    await this.send(on ? this.config.commands.outputOn : this.config.commands.outputOff);
  }

  /** Volts, amps and the output state, each asked in turn. */
  async read(): Promise<ReadBack> {
    const { commands } = this.config;
    const volts = await this.ask(commands.readVolts, checkNumber);
    const amps = await this.ask(commands.readAmps, checkNumber);
    const outputOn = await this.ask(commands.readOutput, checkState);
    return { volts, amps, outputOn };
  }

  /** Reads the error queue until it says 0 (empty); returns the entries as the instrument wrote them. */
  async errors(): Promise<string[]> {
    const entries: string[] = [];
    for (let i = 0; i < MAX_ERROR_QUEUE_READS; i += 1) {
      const entry = await this.ask(this.config.commands.errorQuery, checkErrorEntry);
      if (entry.code === 0) return entries;
      entries.push(`${entry.code},"${entry.text}"`);
    }
    throw new InstrumentFault(this.id, `error queue still not empty after ${MAX_ERROR_QUEUE_READS} reads`);
  }

  /** Arms the instrument's own watchdog when its command set has one. */
  async armWatchdog(timeoutSeconds: number): Promise<boolean> {
    const template = this.config.commands.watchdog;
    if (template === undefined) return false;
    if (!Number.isFinite(timeoutSeconds) || timeoutSeconds <= 0) throw new InstrumentFault(this.id, `watchdog time ${timeoutSeconds} s is not positive`);
    await this.send(fillTemplate(template, timeoutSeconds));
    return true;
  }

  /** Stops listening and closes the port; switches nothing. */
  async close(): Promise<void> {
    this.line.detach('instrument closed');
    if (!this.port.isOpen) return;
    await new Promise<void>((done) => this.port.close(() => done()));
  }

  /** Every exchange, for the run's command log. */
  onCommand(listener: (entry: CommandLogEntry) => void): () => void {
    return this.listeners.add(listener);
  }

  /** Sends a query and checks its reply; logs the exchange either way. */
  private async ask<T>(text: string, check: (reply: string) => Checked<T>): Promise<T> {
    const atMs = this.clock.nowMs();
    const result = await this.line.query(text, this.config.replyTimeoutMs);
    if ('problem' in result) return this.fail(atMs, text, null, result.problem);
    const checked = check(result.reply);
    if (!checked.ok) return this.fail(atMs, text, result.reply, `garbage reply: ${checked.reason}`);
    this.log({ atMs, instrumentId: this.id, sent: text, reply: result.reply, problem: null });
    return checked.value;
  }

  /** Sends a command without reply; then, when so configured, asks the error queue. */
  private async send(text: string): Promise<void> {
    const atMs = this.clock.nowMs();
    const failed = await this.line.command(text);
    if (failed && 'problem' in failed) this.fail(atMs, text, null, failed.problem);
    this.log({ atMs, instrumentId: this.id, sent: text, reply: null, problem: null });
    if (!this.config.commands.verifyWithErrorQuery) return;
    const entry = await this.ask(this.config.commands.errorQuery, checkErrorEntry);
    if (entry.code !== 0) throw new InstrumentFault(this.id, `refused ${text}: ${entry.code},"${entry.text}"`);
  }

  private fail(atMs: number, sent: string, reply: string | null, problem: string): never {
    this.log({ atMs, instrumentId: this.id, sent, reply, problem });
    throw new InstrumentFault(this.id, `${sent}: ${problem}`);
  }

  private log(entry: CommandLogEntry): void {
    this.listeners.emit(entry);
  }
}
