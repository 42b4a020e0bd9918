import type { ProgrammeStep, SimpleStep } from '../schemas/programme.js';

/** One step as the executor runs it: repeat blocks unrolled, each pass labelled. */
export interface PlannedStep {
  /** Position in the unrolled list, from 0. */
  index: number;
  step: SimpleStep;
  /** Words for people: "3 discharge (pass 2 of 5)". */
  label: string;
}

const KIND_WORD: Readonly<Record<SimpleStep['kind'], string>> = {
  charge: 'charge',
  rest: 'rest',
  discharge: 'discharge',
  'wait-temp': 'wait for temperature',
};

/** Unrolls a programme's steps into the order they run (a repeat block's steps `times` times over). */
export function planSteps(steps: readonly ProgrammeStep[]): PlannedStep[] {
  const out: PlannedStep[] = [];
  const add = (step: SimpleStep, label: string) => out.push({ index: out.length, step, label });
  steps.forEach((step, i) => {
    const n = i + 1;
    if (step.kind !== 'repeat') return add(step, `${n} ${KIND_WORD[step.kind]}`);
    for (let pass = 1; pass <= step.times; pass++)
      step.steps.forEach((inner, j) => add(inner, `${n}.${j + 1} ${KIND_WORD[inner.kind]} (pass ${pass} of ${step.times})`));
  });
  return out;
}
