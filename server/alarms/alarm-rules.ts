import type { AlarmKind, AlarmPriority, AlarmState } from '../../shared/schemas/alarm.js';
import type { RunEvent } from '../../shared/schemas/run-event.js';

/** What a run event means for alarms: raise one or clear one (source-lost comes from the silence watchdog). */
export type AlarmAction =
  | { type: 'raise'; kind: AlarmKind; message: string }
  | { type: 'clear'; kind: AlarmKind };

/** Priority of each kind: critical ones latch and escalate (an open pack or a hot one needs a person now). */
export const ALARM_PRIORITY: Record<AlarmKind, AlarmPriority> = {
  'cutoff': 'critical',
  'protection-trip': 'critical',
  'over-temperature': 'critical',
  'under-temperature': 'warning',
  'near-end': 'warning',
  'source-lost': 'warning',
  'run-finished': 'info',
  // The safety net switched every output off mid-programme: the test is not finished and a person must look.
  'programme-failed': 'critical',
};

/**
 * Kinds that latch: they stay active after the condition returns to normal (a pack that
 * reconnects after its cutoff) until a person acknowledges them (ISA-18.2 "latching alarm").
 */
export const LATCHING_KINDS: ReadonlySet<AlarmKind> = new Set(['cutoff', 'protection-trip', 'programme-failed']);

/** Maps one run event to its alarm action, if any. Pure: the service does the rest. */
export function alarmActionFor(event: RunEvent): AlarmAction | null {
  switch (event.type) {
    case 'cutoff':
      return event.cause === 'end-voltage'
        ? { type: 'raise', kind: 'cutoff', message: `End voltage reached: cutoff at ${event.volts.toFixed(3)} V` }
        : { type: 'raise', kind: 'protection-trip', message: `Pack protection opened (${event.signal ?? 'signal unknown'}) at ${event.volts.toFixed(3)} V` };
    case 'protection-trip':
      return { type: 'raise', kind: 'protection-trip', message: `Temperature protection (${event.kind}) tripped at ${event.tempCelsius.toFixed(1)} °C` };
    case 'protection-check-trip':
      return { type: 'raise', kind: 'protection-trip', message: `Checked protection (${event.protection}) acted` };
    case 'alarm':
      if (event.code === 'over-temperature' || event.code === 'under-temperature') return { type: 'raise', kind: event.code, message: event.message };
      return null;
    case 'milestone':
      return event.milestone === 'near-end-voltage' ? { type: 'raise', kind: 'near-end', message: `Near the end voltage: ${event.volts.toFixed(3)} V` } : null;
    case 'source-restored':
      return { type: 'clear', kind: 'source-lost' };
    case 'programme-step': {
      if (event.phase !== 'fail') return null;
      const where = `step ${event.index + 1}${event.label ? ` (${event.label})` : ''}: ${event.reason ?? 'reason not given'}`;
      return event.outputsConfirmedOff === false
        ? { type: 'raise', kind: 'programme-failed', message: `Programme failed at ${where}. Not every output could be confirmed off: check the bench by hand.` }
        : { type: 'raise', kind: 'programme-failed', message: `Programme failed safe at ${where}. Outputs switched off.` };
    }
    default:
      return null;
  }
}

/** The lifecycle state from the two facts kept: acknowledged (when) and returned to normal (when). */
export function alarmState(acknowledged: boolean, cleared: boolean): AlarmState {
  if (cleared) return acknowledged ? 'cleared' : 'cleared-unacknowledged';
  return acknowledged ? 'acknowledged' : 'unacknowledged';
}

/** Delay before escalation step `step` (1 = the first resend), counted from the alarm's raise. */
export function escalationDueMs(raisedAtMs: number, step: number, everyMs: number): number {
  return raisedAtMs + step * everyMs;
}

/**
 * How many escalation steps an alarm has: step 1 sends again to everyone told at first; each
 * later step adds the bench's next on-call person (the first is told at once).
 */
export function lastEscalationStep(onCallCount: number): number {
  return Math.max(1, onCallCount);
}
