import { ListenerSet } from '../../ingest/listener-set.js';
import { InstrumentFault, type CommandLogEntry, type InstrumentControl, type InstrumentRole, type ReadBack, type SetPoint } from '../instrument-control.js';

/** What a confused instrument sends back. */
const GARBAGE = '\u0000\u00ff?#';

/** How a fake instrument answers: properly, with garbage, or not at all (its driver's timeout). */
export type FakeBehaviour = 'ok' | 'garbage' | 'silent';

/**
 * An in-memory instrument for the executor's tests: it keeps its set point and output state,
 * logs each call as a command exchange, and can be told to answer garbage or nothing (the driver
 * then rejects with InstrumentFault, as the contract says).
 */
export class FakeInstrument implements InstrumentControl {
  point: SetPoint | null = null;
  outputOn = false;
  behaviour: FakeBehaviour = 'ok';
  /** Errors the instrument will report on the next `errors()` call. */
  queuedErrors: string[] = [];
  /** Every call, in order, as text (`set cc 10`, `output on`, ...). */
  readonly calls: string[] = [];
  watchdogSeconds: number | null = null;
  /** Answers (and acts) a turn of the event loop later, like an instrument on a serial line. */
  slow = false;
  /** What `read()` reports for volts and amps (the test bench sets these). */
  terminals = { volts: 0, amps: 0 };
  private readonly listeners = new ListenerSet<[CommandLogEntry]>(() => undefined);

  constructor(
    readonly id: string,
    readonly role: InstrumentRole,
    private readonly nowMs: () => number,
    private readonly hasWatchdog = true,
  ) {
    this.lastHeardMs = nowMs();
  }

  /** Server clock of the last command that reached the instrument (its watchdog counts from it). */
  private lastHeardMs: number;

  /**
   * One exchange. Silent: nothing reaches the instrument. Garbage: commands still act (a
   * set or output command has no reply to spoil), but every query's reply is garbage.
   */
  private exchange<T>(sent: string, answer: () => T, reply: string, query: boolean): Promise<T> {
    this.calls.push(sent);
    const atMs = this.nowMs();
    if (this.behaviour === 'silent') {
      const problem = `no reply to ${sent} within the timeout`;
      this.listeners.emit({ atMs, instrumentId: this.id, sent, reply: null, problem });
      return Promise.reject(new InstrumentFault(this.id, problem));
    }
    this.lastHeardMs = atMs;
    if (this.slow) return new Promise((resolve) => setImmediate(() => resolve(this.answered(sent, answer, reply, query, atMs))));
    return Promise.resolve().then(() => this.answered(sent, answer, reply, query, atMs));
  }

  private answered<T>(sent: string, answer: () => T, reply: string, query: boolean, atMs: number): T {
    const value = answer();
    if (this.behaviour === 'garbage' && query) {
      const problem = `garbage reply to ${sent}`;
      this.listeners.emit({ atMs, instrumentId: this.id, sent, reply: GARBAGE, problem });
      throw new InstrumentFault(this.id, problem);
    }
    this.listeners.emit({ atMs, instrumentId: this.id, sent, reply: query ? reply : null, problem: null });
    return value;
  }

  /** The instrument's own watchdog: output off when no command reached it for its timeout. */
  checkWatchdog(): void {
    if (this.watchdogSeconds !== null && this.nowMs() - this.lastHeardMs >= this.watchdogSeconds * 1000) this.outputOn = false;
  }

  identify(): Promise<string> {
    return this.exchange('*IDN?', () => `Northgate Fake,${this.role},0001,1.0`, `Northgate Fake,${this.role},0001,1.0`, true);
  }

  reset(): Promise<void> {
    return this.exchange('*RST', () => {
      this.outputOn = false;
      this.point = null;
    }, '', false);
  }

  set(point: SetPoint): Promise<void> {
    return this.exchange(`set ${point.mode} ${point.value}${point.currentLimitAmps !== undefined ? ` limit ${point.currentLimitAmps}` : ''}`, () => void (this.point = { ...point }), '', false);
  }

  setOutput(on: boolean): Promise<void> {
    return this.exchange(`output ${on ? 'on' : 'off'}`, () => void (this.outputOn = on), '', false);
  }

  read(): Promise<ReadBack> {
    const back = { ...this.terminals, outputOn: this.outputOn };
    return this.exchange('read?', () => back, `${back.volts},${back.amps},${back.outputOn ? 1 : 0}`, true);
  }

  errors(): Promise<string[]> {
    return this.exchange('SYST:ERR?', () => this.queuedErrors.splice(0), '0,"No error"', true);
  }

  armWatchdog(timeoutSeconds: number): Promise<boolean> {
    return this.exchange(`watchdog ${timeoutSeconds}`, () => {
      if (this.hasWatchdog) this.watchdogSeconds = timeoutSeconds;
      return this.hasWatchdog;
    }, this.hasWatchdog ? '1' : '0', true);
  }

  close(): Promise<void> {
    return Promise.resolve();
  }

  onCommand(listener: (entry: CommandLogEntry) => void): () => void {
    return this.listeners.add(listener);
  }
}
