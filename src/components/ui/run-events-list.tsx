import { MonoNumbers } from './mono-numbers';
import type { RunEvent } from '../../../shared/schemas/run-event';
import { PROTECTION_TRAITS, type Protection } from '../../../shared/schemas/protection-check';
import { NOTE_COLOR, RUN_STATE_COLORS } from '../../lib/palette';
import { formatAmps, formatCharge, formatDuration, formatElapsedClock, formatEnergy, formatTemperature, formatVolts } from '../../lib/units';

const MILESTONE_LABEL = {
  'half-rated-ah': '50 % of rated Ah',
  'rated-ah': '100 % of rated Ah',
  'half-rated-wh': '50 % of rated Wh',
  'rated-wh': '100 % of rated Wh',
  'near-end-voltage': 'Nearing the end voltage',
} as const;

const PROGRAMME_PHASE_WORD = {
  start: 'started',
  end: 'ended',
  skip: 'skipped',
  pause: 'paused',
  resume: 'resumed',
  fail: 'failed safe, outputs off',
  abort: 'aborted, outputs off',
} as const;

/** The lab's display units (from its settings); Wh and °C when not given. */
export interface EventUnits {
  temperatureUnit?: 'C' | 'F';
  energyUnit?: 'Wh' | 'kWh';
}

/** A protection's signal value in its unit (temperatures in the lab's unit). */
export function formatProtectionValue(protection: Protection, value: number | null, temperatureUnit: 'C' | 'F' = 'C'): string {
  const unit = PROTECTION_TRAITS[protection].unit;
  if (unit === '°C') return formatTemperature(value, temperatureUnit);
  return unit === 'V' ? formatVolts(value) : formatAmps(value);
}

/** One line of words for an event, with every number in its unit (the lab's units). */
export function describeEvent(e: RunEvent, { temperatureUnit = 'C', energyUnit = 'Wh' }: EventUnits = {}): string {
  switch (e.type) {
    case 'cutoff':
      if (e.startedBelowEndVoltage) return `Cutoff (already at or below the end voltage when the load came on) at ${formatVolts(e.volts)}: no capacity measured`;
      return `Cutoff (${e.cause === 'protection' ? 'pack protection opened' : 'end voltage reached'}) at ${formatVolts(e.volts)} after ${formatEnergy(e.dischargeWh, energyUnit)}, ${formatCharge(e.dischargeAh)}`;
    case 'recovery':
      return `Pack reconnected after ${formatDuration(e.recoverySeconds)}, ${formatVolts(e.volts)}`;
    case 'alarm':
      return `${e.level === 'critical' ? 'Alarm' : e.level === 'warning' ? 'Warning' : 'Note'}: ${e.message}`;
    case 'alarm-ack':
      return `Alarm (${e.code}) acknowledged by ${e.by} at ${e.at.slice(11, 19)} UTC`;
    case 'annotation':
      return e.author ? `${e.author}: ${e.text}` : e.text;
    case 'gap':
      return `No readings for ${formatDuration(e.gapSeconds)} (nothing integrated across the gap)`;
    case 'source-lost':
      return `Meter lost${e.reason ? `: ${e.reason}` : ''}`;
    case 'source-restored':
      return `Meter back${e.downSeconds != null ? ` after ${formatDuration(e.downSeconds)}` : ''}`;
    case 'protection-trip':
      if (e.beyondAtStart) return `Temperature protection (${e.kind}) on ${e.channel} holding from the start at ${formatTemperature(e.tempCelsius, temperatureUnit)}, limit ${formatTemperature(e.limitCelsius, temperatureUnit)}`;
      return `Temperature protection (${e.kind}) on ${e.channel} at ${formatTemperature(e.tempCelsius, temperatureUnit)}, limit ${formatTemperature(e.limitCelsius, temperatureUnit)}, delay ${formatDuration(e.delaySeconds)}`;
    case 'protection-reset':
      return `Protection (${e.kind}) reset on ${e.channel} at ${formatTemperature(e.tempCelsius, temperatureUnit)}`;
    case 'heater-on':
      return `Heater on, ${formatAmps(e.heaterAmps)}${e.tempCelsius != null ? ` at ${formatTemperature(e.tempCelsius, temperatureUnit)}` : ''}`;
    case 'heater-off':
      return `Heater off after ${formatDuration(e.onSeconds)}, mean ${formatAmps(e.meanHeaterAmps)}${e.peakHeaterAmps != null ? `, peak ${formatAmps(e.peakHeaterAmps)}` : ''}${e.tempCelsius != null ? ` at ${formatTemperature(e.tempCelsius, temperatureUnit)}` : ''}`;
    case 'protection-check-trip': {
      const what = PROTECTION_TRAITS[e.protection].label;
      const at = formatProtectionValue(e.protection, e.value, temperatureUnit);
      if (e.beyondAtStart && e.crossedElapsedSeconds === null) return `${what}: acted from the start (already past its threshold, ${at})`;
      return `${what} acted at ${at}${e.delaySeconds != null ? ` after ${formatDuration(e.delaySeconds)}` : ''}`;
    }
    case 'protection-check-release':
      return `${PROTECTION_TRAITS[e.protection].label} released: current flows again at ${formatProtectionValue(e.protection, e.value, temperatureUnit)}, ${formatDuration(e.resumeSeconds)} after it acted`;
    case 'milestone':
      return `${MILESTONE_LABEL[e.milestone]}: ${formatVolts(e.volts)}, ${formatEnergy(e.dischargeWh, energyUnit)}, ${formatCharge(e.dischargeAh)}`;
    case 'run-start':
      return 'Run started';
    case 'run-stop':
      return `Run stopped${e.note ? `: ${e.note}` : ''}`;
    case 'load-on':
      return `Load on${e.note ? `: ${e.note}` : ''}`;
    case 'load-off':
      return `Load off${e.note ? `: ${e.note}` : ''}`;
    case 'programme-step':
      return `Step ${e.label}: ${PROGRAMME_PHASE_WORD[e.phase]}${e.reason ? ` (${e.reason})` : ''}`;
  }
}

function eventColor(e: RunEvent): string {
  if (e.type === 'programme-step' && (e.phase === 'fail' || e.phase === 'abort')) return RUN_STATE_COLORS.cutoff;
  if (e.type === 'cutoff' || e.type === 'protection-trip' || e.type === 'protection-check-trip' || (e.type === 'alarm' && e.level === 'critical')) return RUN_STATE_COLORS.cutoff;
  if (e.type === 'recovery' || e.type === 'protection-reset' || e.type === 'protection-check-release') return RUN_STATE_COLORS.recovered;
  if (e.type === 'annotation') return NOTE_COLOR;
  if (e.type === 'gap' || e.type === 'source-lost' || e.type === 'alarm') return RUN_STATE_COLORS.recovered;
  return RUN_STATE_COLORS.finished;
}

/** A run's timeline, newest first, each event at its run time. */
export function RunEventsList({ events, temperatureUnit = 'C', energyUnit = 'Wh' }: { events: readonly RunEvent[] } & EventUnits) {
  if (events.length === 0) return <p className="text-sm text-ink-faint">No events yet.</p>;
  const newestFirst = [...events].sort((a, b) => b.elapsedSeconds - a.elapsedSeconds);
  return (
    <ol aria-label="Run events" className="flex max-h-96 flex-col gap-2 overflow-y-auto print:max-h-none print:overflow-visible">
      {newestFirst.map((e, i) => (
        <li key={`${e.elapsedSeconds}-${e.type}-${i}`} className="flex gap-3 border-l-4 pl-3 text-sm" style={{ borderColor: eventColor(e) }}>
          <span className="num shrink-0 text-ink-muted">{formatElapsedClock(e.elapsedSeconds)}</span>
          <span className="text-ink">
            <MonoNumbers text={describeEvent(e, { temperatureUnit, energyUnit })} />
          </span>
        </li>
      ))}
    </ol>
  );
}
