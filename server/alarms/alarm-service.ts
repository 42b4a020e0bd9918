import { AlarmSettingsSchema, type Alarm, type AlarmKind, type AlarmSettings, type AlarmValues } from '../../shared/schemas/alarm.js';
import type { Reading } from '../../shared/schemas/reading.js';
import type { Run } from '../../shared/schemas/run.js';
import type { RunEvent } from '../../shared/schemas/run-event.js';
import { notFound } from '../domain/domain-errors.js';
import { ListenerSet } from '../ingest/listener-set.js';
import type { AlarmChannels } from './alarm-channel.js';
import type { AlarmRepo } from './alarm-repo.js';
import { ALARM_PRIORITY, LATCHING_KINDS, alarmActionFor, lastEscalationStep } from './alarm-rules.js';
import type { DeliveryKey, DeliveryQueue } from './delivery-queue.js';
import { MS_PER_MINUTE, MS_PER_S } from '../../shared/units/time.js';
import type { Logger } from '../log/logger.js';

/** How often escalations and the silence watchdog are checked. */
export const ALARM_TICK_MS = 1000;
/** Kinds that return to normal when the run ends (latching ones wait for a person). */
const CLEARED_AT_RUN_END: AlarmKind[] = ['over-temperature', 'under-temperature', 'near-end', 'source-lost'];
/** Channels an escalation re-sends by (the in-app list already holds the alarm). */
const ESCALATION_CHANNELS = ['email', 'push'] as const;

/** What the alarm service needs. */
export interface AlarmServiceDeps {
  repo: AlarmRepo;
  queue: DeliveryQueue;
  channels: AlarmChannels;
  /** Tells the delivery worker rows are waiting. */
  kick: () => void;
  /** Adds an event to a run's timeline and shows it live (the acknowledgement). */
  recordRunEvent: (runId: number, event: RunEvent, userId: number) => Promise<void>;
  /** Optional estimate of the minutes left to the end voltage of a live run (null = cannot tell). */
  minutesToEnd?: (runId: number) => number | null;
  nowMs?: () => number;
  log: Logger;
}

/** The latest reading of a live run and when it came, for values and the silence watchdog. */
interface LiveRun {
  reading: Reading;
  atMs: number;
  silent: boolean;
}

/**
 * Raises alarms from what the run recorder emits, as a sink beside the live hub and the
 * archive: every handler returns at once and the work runs on a promise chain per run, so a
 * slow database delays an e-mail, never a reading. Keeps the lifecycle (raise, clear,
 * acknowledge) and escalates unacknowledged critical alarms on a timer.
 */
export class AlarmService {
  /** Every alarm raised or changed (acknowledged), for whoever shows them live. */
  readonly changes = new ListenerSet<[alarm: Alarm]>((e) => this.deps.log.error('alarm listener failed', e));
  private readonly chains = new Map<number, Promise<void>>();
  private readonly live = new Map<number, LiveRun>();
  private readonly ended = new Set<number>();
  /** Runs whose estimate already raised near-end (one raise per run from the estimate). */
  private readonly nearEndSent = new Set<number>();
  private timer: NodeJS.Timeout | null = null;
  private ticking = false;
  /** The lab's alarm settings as of the last tick: the reading path never waits for the database. */
  private settings: AlarmSettings = AlarmSettingsSchema.parse({});
  private minutesToEnd: ((runId: number) => number | null) | undefined;

  constructor(private readonly deps: AlarmServiceDeps) {
    this.minutesToEnd = deps.minutesToEnd;
  }

  /** Plugs in the estimate of minutes to the end voltage that raises `near-end` (e.g. from the live run's power and rated energy left). */
  setEndEstimator(estimate: (runId: number) => number | null): void {
    this.minutesToEnd = estimate;
  }

  private now(): Date {
    return new Date((this.deps.nowMs ?? Date.now)());
  }

  /** Runs `work` after the run's earlier alarm work (so two events never raise one alarm twice). */
  private serial(runId: number, work: () => Promise<void>): void {
    const next = (this.chains.get(runId) ?? Promise.resolve()).then(work).catch((err: unknown) => this.deps.log.error(`alarms for run ${runId} failed`, err));
    this.chains.set(runId, next);
    void next.then(() => {
      if (this.chains.get(runId) === next) this.chains.delete(runId);
    });
  }

  /** Waits for every run's pending alarm work (tests, shutdown). */
  async settle(): Promise<void> {
    while (this.chains.size > 0) await Promise.all([...this.chains.values()]);
  }

  /** Sink: one reading of a live run (kept for the values of the next alarm; data again clears source-lost). */
  onReading(runId: number, reading: Reading): void {
    const before = this.live.get(runId);
    this.live.set(runId, { reading, atMs: this.now().getTime(), silent: false });
    if (before?.silent) this.serial(runId, async () => void (await this.clear(runId, 'source-lost')));
    const minutes = this.minutesToEnd?.(runId);
    if (minutes !== null && minutes !== undefined && Number.isFinite(minutes) && minutes < this.settings.nearEndMinutes && !this.nearEndSent.has(runId)) {
      this.nearEndSent.add(runId);
      this.serial(runId, () => this.raise(runId, 'near-end', `About ${Math.max(0, Math.round(minutes))} min to the end voltage`, reading.elapsedSeconds, null));
    }
  }

  /** Sink: one event of a run. */
  onRunEvent(runId: number, event: RunEvent): void {
    const action = alarmActionFor(event);
    if (!action) return;
    if (action.type === 'raise') this.serial(runId, () => this.raise(runId, action.kind, action.message, event.elapsedSeconds, event));
    else this.serial(runId, async () => void (await this.clear(runId, action.kind)));
  }

  /** Sink: a run changed; a run that ended raises `run-finished` and clears what the end settles. */
  onRunChange(run: Run): void {
    if ((run.state !== 'finished' && run.state !== 'aborted') || this.ended.has(run.id)) return;
    this.ended.add(run.id);
    const t = run.summary?.durationSeconds ?? this.live.get(run.id)?.reading.elapsedSeconds ?? 0;
    this.serial(run.id, async () => {
      await this.clear(run.id, ...CLEARED_AT_RUN_END);
      await this.raise(run.id, 'run-finished', run.state === 'aborted' ? 'Run stopped before its end (aborted)' : 'Run finished', t, null);
      this.live.delete(run.id);
      this.nearEndSent.delete(run.id);
    });
  }

  /** Starts the timer for escalations and the silence watchdog. */
  start(): void {
    void this.tick();
    this.timer = setInterval(() => void this.tick(), ALARM_TICK_MS);
    this.timer.unref();
  }

  /** Stops the timer and waits for pending work. */
  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.settle();
  }

  /** One turn of the timer: silent sources, then due escalations. */
  async tick(): Promise<void> {
    if (this.ticking) return;
    this.ticking = true;
    try {
      const settings = await this.deps.repo.settings();
      this.settings = settings;
      const nowMs = this.now().getTime();
      for (const [runId, live] of this.live) {
        if (live.silent || this.ended.has(runId) || nowMs - live.atMs < settings.sourceLostSeconds * MS_PER_S) continue;
        live.silent = true;
        const message = `No data from the bench for ${settings.sourceLostSeconds} s`;
        this.serial(runId, () => this.raise(runId, 'source-lost', message, live.reading.elapsedSeconds, null));
      }
      await this.escalateDue(settings.escalateAfterMinutes * MS_PER_MINUTE);
    } catch (err) {
      this.deps.log.error('alarm timer failed', err);
    } finally {
      this.ticking = false;
    }
  }

  private values(runId: number, t: number, event: RunEvent | null): AlarmValues {
    const r = this.live.get(runId)?.reading;
    const temps = r?.temps ? Object.values(r.temps) : [];
    const at = event && 'volts' in event && 'dischargeWh' in event ? event : null;
    return {
      volts: at ? at.volts : (r?.volts ?? null),
      amps: at && 'amps' in at ? at.amps : (r?.amps ?? null),
      dischargeWh: at ? at.dischargeWh : (r?.dischargeWh ?? null),
      dischargeAh: at ? at.dischargeAh : (r?.dischargeAh ?? null),
      tempCelsius: temps.length > 0 ? Math.max(...temps) : null,
      runSeconds: t,
    };
  }

  /** Raises an alarm unless one of that kind is still open on the run; queues its notices. */
  private async raise(runId: number, kind: AlarmKind, message: string, t: number, event: RunEvent | null): Promise<void> {
    const { repo } = this.deps;
    if (await repo.hasOpen(runId, kind)) return;
    if (kind === 'run-finished' && (await repo.list({ runId })).some((a) => a.kind === 'run-finished')) return;
    const context = await repo.runContext(runId);
    if (!context) return;
    const now = this.now();
    const shelved = await repo.isShelved(context.benchId, kind, now);
    const priority = ALARM_PRIORITY[kind];
    const settings = await repo.settings();
    const escalates = priority === 'critical' && !shelved;
    const alarm = await repo.insert({
      runId, benchId: context.benchId, kind, priority, message, elapsedSeconds: t, values: this.values(runId, t, event), shelved, raisedAt: now,
      nextEscalationAt: escalates ? new Date(now.getTime() + settings.escalateAfterMinutes * MS_PER_MINUTE) : null,
    });
    // A notice of something that has already happened (run finished) has no condition to return from.
    if (priority === 'info') await repo.clear(runId, [kind], now);
    this.changes.emit((await repo.get(alarm.id)) ?? alarm);
    if (shelved) return this.deps.log.info(`alarm ${alarm.id} (${kind}) on bench ${context.benchId} is shelved: recorded, nobody notified`);
    const keys = await this.firstRecipients(alarm);
    if (await this.deps.queue.enqueue(keys, now)) this.deps.kick();
  }

  /** Who hears of an alarm first: its subscribers by their channels, and for a critical one the first on call. */
  private async firstRecipients(alarm: Alarm): Promise<DeliveryKey[]> {
    const { repo, channels } = this.deps;
    const keys = (await repo.subscribers(alarm.benchId, alarm.kind)).map((s) => ({ alarmId: alarm.id, userId: s.userId, channel: s.channel, step: 0 }));
    if (alarm.priority === 'critical' && alarm.benchId !== null) {
      const first = (await repo.onCall(alarm.benchId))[0];
      if (first) for (const channel of ['in-app', ...ESCALATION_CHANNELS] as const) keys.push({ alarmId: alarm.id, userId: first.userId, channel, step: 0 });
    }
    return keys.filter((k) => channels.has(k.channel));
  }

  private async clear(runId: number, ...kinds: AlarmKind[]): Promise<void> {
    const ids = await this.deps.repo.clear(runId, kinds, this.now());
    for (const id of ids) {
      const alarm = await this.deps.repo.get(id);
      if (alarm) this.changes.emit(alarm);
    }
  }

  /**
   * Escalates every due alarm by one step: step 1 sends again to everyone told at first;
   * each later step also tells the bench's next on-call person. Claiming the step with a
   * conditional UPDATE means two servers (or a restart) never escalate one step twice.
   */
  async escalateDue(everyMs: number): Promise<void> {
    const { repo, queue, channels } = this.deps;
    const now = this.now();
    for (const due of await repo.dueEscalations(now)) {
      const alarm = await repo.get(due.id);
      if (!alarm) continue;
      const onCall = alarm.benchId !== null ? await repo.onCall(alarm.benchId) : [];
      const step = due.step + 1;
      const nextAt = step < lastEscalationStep(onCall.length) ? new Date(now.getTime() + everyMs) : null;
      if (!(await repo.advanceEscalation(alarm.id, due.step, nextAt))) continue;
      const first = (await this.firstRecipients(alarm)).filter((k) => k.channel !== 'in-app');
      const people = new Set([...first.map((k) => k.userId), ...onCall.slice(0, step).map((o) => o.userId)]);
      const keys: DeliveryKey[] = [];
      for (const userId of people) for (const channel of ESCALATION_CHANNELS) {
        const subscribed = first.some((k) => k.userId === userId && k.channel === channel);
        const onCallPerson = onCall.slice(0, step).some((o) => o.userId === userId);
        if ((subscribed || onCallPerson) && channels.has(channel)) keys.push({ alarmId: alarm.id, userId, channel, step });
      }
      // The newly called person also finds it in their in-app list.
      const added = onCall[step - 1];
      if (added && step > 1) keys.push({ alarmId: alarm.id, userId: added.userId, channel: 'in-app', step });
      if (await queue.enqueue(keys, now)) this.deps.kick();
      const updated = await repo.get(alarm.id);
      if (updated) this.changes.emit(updated);
    }
  }

  /**
   * Acknowledges an alarm: stops its escalation and every notice not yet sent, and records
   * who and when on the run's timeline (shown live). A second acknowledge changes nothing.
   */
  async acknowledge(alarmId: number, user: { id: number; name: string }): Promise<Alarm> {
    const { repo } = this.deps;
    const alarm = await repo.get(alarmId);
    if (!alarm) throw notFound(`Alarm ${alarmId}`);
    const at = this.now();
    if (!(await repo.acknowledge(alarmId, user.id, at, LATCHING_KINDS.has(alarm.kind)))) return alarm;
    await this.deps.queue.cancelForAlarm(alarmId);
    const elapsedSeconds = this.live.get(alarm.runId)?.reading.elapsedSeconds ?? alarm.elapsedSeconds;
    await this.deps.recordRunEvent(alarm.runId, { type: 'alarm-ack', elapsedSeconds, alarmId, code: alarm.kind, by: user.name, at: at.toISOString() }, user.id);
    const updated = (await repo.get(alarmId))!;
    this.changes.emit(updated);
    return updated;
  }
}
