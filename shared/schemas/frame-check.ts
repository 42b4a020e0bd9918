import type { Frame } from './frame.js';

/** A plain object: what z.record accepts (not an array, a Date, a Map or another class's instance). */
function isPlainObject(value: unknown): value is Record<string, unknown> {
  if (typeof value !== 'object' || value === null) return false;
  const proto = Object.getPrototypeOf(value) as unknown;
  return proto === Object.prototype || proto === null;
}

/** A record of channel values: a plain object whose own values are all finite numbers. */
function channelsProblem(value: unknown, name: string): string | null {
  if (value === undefined) return null;
  if (!isPlainObject(value)) return `${name} is not a map of channels`;
  for (const key in value) {
    if (!Object.hasOwn(value, key)) continue;
    const v = value[key];
    if (typeof v !== 'number' || !Number.isFinite(v)) return `${name}.${key} is not a finite number`;
  }
  return null;
}

function finiteProblem(value: unknown, name: string): string | null {
  return typeof value === 'number' && Number.isFinite(value) ? null : `${name} is not a finite number`;
}

/**
 * Why a value is not a valid Frame, or null when it is one: the same rules as FrameSchema
 * (`frame-check.property.test.ts` holds them equal), written by hand because a source checks
 * every frame it makes and zod costs several times more per frame. `clock` may be absent
 * (FrameSchema defaults it); unknown keys are ignored, as FrameSchema strips them.
 */
export function frameProblem(value: unknown): string | null {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return 'not an object';
  const f = value as Partial<Record<keyof Frame, unknown>>;
  const first = finiteProblem(f.t, 't') ?? finiteProblem(f.volts, 'volts') ?? finiteProblem(f.amps, 'amps');
  if (first !== null) return first;
  const channels = channelsProblem(f.temps, 'temps') ?? channelsProblem(f.aux, 'aux');
  if (channels !== null) return channels;
  if (f.clock !== undefined && f.clock !== 'device' && f.clock !== 'arrival') return 'clock is neither device nor arrival';
  if (f.seq !== undefined && !(typeof f.seq === 'number' && Number.isSafeInteger(f.seq) && f.seq >= 0)) return 'seq is not a count';
  return null;
}
