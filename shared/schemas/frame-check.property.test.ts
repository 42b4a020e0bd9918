import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { frameProblem } from './frame-check.js';
import { FrameSchema } from './frame.js';

/** Numbers a meter, a parser bug or a hostile client can produce, the edges included. */
const anyNumber = fc.oneof(
  fc.double(),
  fc.constantFrom(Number.NaN, Infinity, -Infinity, -0, 0, 2 ** 53 - 1, 2 ** 53, -1, 1.5, Number.MAX_VALUE, Number.MIN_VALUE),
  fc.integer(),
);
const anyValue = fc.oneof(anyNumber, fc.string({ maxLength: 4 }), fc.constant(null), fc.constant(undefined), fc.boolean(), fc.constant([]));
const channels = fc.oneof(
  fc.dictionary(fc.string({ maxLength: 6 }), anyNumber, { maxKeys: 4 }),
  fc.dictionary(fc.string({ maxLength: 6 }), anyValue, { maxKeys: 3 }),
  fc.constantFrom(undefined, null, [], [1], new Date(0), new Map(), 'x', 3, Object.create(null) as object),
);
const clock = fc.constantFrom(undefined, 'device', 'arrival', 'Device', '', 0, null);
const seq = fc.oneof(fc.constant(undefined), anyNumber, fc.constantFrom('1', null));

/** Frames and near-frames: each key present or not, with good or bad values. */
const candidate = fc.record(
  { t: fc.oneof(anyNumber, anyValue), volts: fc.oneof(anyNumber, anyValue), amps: fc.oneof(anyNumber, anyValue), temps: channels, aux: channels, clock, seq, extra: anyValue },
  { requiredKeys: [] },
);

describe('frameProblem accepts and rejects exactly what FrameSchema does', () => {
  it('on frames and near-frames', () => {
    fc.assert(
      fc.property(candidate, (value) => {
        expect(frameProblem(value) === null).toBe(FrameSchema.safeParse(value).success);
      }),
      { numRuns: 20_000 },
    );
  });

  it('on values that are no object at all', () => {
    fc.assert(
      fc.property(fc.oneof(anyValue, fc.array(anyNumber, { maxLength: 3 })), (value) => {
        expect(frameProblem(value) === null).toBe(FrameSchema.safeParse(value).success);
      }),
    );
  });

  it('names the field at fault', () => {
    expect(frameProblem({ t: 1, volts: Number.NaN, amps: 0 })).toBe('volts is not a finite number');
    expect(frameProblem({ t: 1, volts: 1, amps: 0, temps: { cell: Infinity } })).toBe('temps.cell is not a finite number');
    expect(frameProblem({ t: 1, volts: 1, amps: 0, seq: 1.5 })).toBe('seq is not a count');
    expect(frameProblem({ t: 1, volts: 1, amps: 0, clock: 'device' })).toBeNull();
  });
});
