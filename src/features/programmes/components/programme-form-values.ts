import { ProgrammeInputSchema, type Programme, type ProgrammeInput, type ProgrammeStep } from '../../../../shared/schemas/programme';

/** One step as the form holds it: every field of every kind, unused ones empty. */
export interface StepFormValues {
  kind: ProgrammeStep['kind'];
  volts?: number;
  currentAmps?: number;
  taperAmps?: number;
  maxSeconds?: number;
  settleVoltsPerMinute?: number;
  mode?: 'cc' | 'cp' | 'cr';
  value?: number;
  endVolts?: number;
  targetAh?: number;
  targetWh?: number;
  targetCelsius?: number;
  direction?: 'below' | 'above';
  times?: number;
  steps?: StepFormValues[];
}

/** The whole form. */
export interface ProgrammeFormValues {
  name: string;
  description: string;
  chemistry: ProgrammeInput['chemistry'];
  cellsInSeries: number;
  maxCurrentAmps: number;
  steps: StepFormValues[];
}

/** The fields each kind of step uses (the rest of the form's fields are dropped when it is sent). */
const FIELDS_OF: Readonly<Record<StepFormValues['kind'], readonly (keyof StepFormValues)[]>> = {
  charge: ['volts', 'currentAmps', 'taperAmps', 'maxSeconds'],
  rest: ['maxSeconds', 'settleVoltsPerMinute'],
  discharge: ['mode', 'value', 'endVolts', 'targetAh', 'targetWh'],
  'wait-temp': ['targetCelsius', 'direction', 'maxSeconds'],
  repeat: ['times'],
};

/** A new step of a kind, with the values a technician most often types (a blank form for the numbers). */
export function blankStep(kind: StepFormValues['kind']): StepFormValues {
  if (kind === 'discharge') return { kind, mode: 'cc' };
  if (kind === 'wait-temp') return { kind, direction: 'below' };
  if (kind === 'repeat') return { kind, times: 2, steps: [blankStep('discharge')] };
  return { kind };
}

function cleanStep(step: StepFormValues): Record<string, unknown> {
  const out: Record<string, unknown> = { kind: step.kind };
  for (const key of FIELDS_OF[step.kind]) {
    const v = step[key];
    // An empty number input gives NaN: the field was left out.
    if (v !== undefined && !(typeof v === 'number' && Number.isNaN(v))) out[key] = v;
  }
  if (step.kind === 'repeat') out.steps = (step.steps ?? []).map(cleanStep);
  return out;
}

/** Form values to the API's programme, checked with the shared schema (the same check the server makes). */
export function toProgrammeInput(values: ProgrammeFormValues) {
  return ProgrammeInputSchema.safeParse({
    name: values.name,
    ...(values.description.trim() ? { description: values.description } : {}),
    chemistry: values.chemistry,
    cellsInSeries: values.cellsInSeries,
    maxCurrentAmps: values.maxCurrentAmps,
    steps: values.steps.map(cleanStep),
  });
}

/** A saved programme back into the form. */
export function toFormValues(p: Programme | null): ProgrammeFormValues {
  if (!p) return { name: '', description: '', chemistry: 'lfp', cellsInSeries: 1, maxCurrentAmps: Number.NaN, steps: [blankStep('charge')] };
  return { name: p.name, description: p.description ?? '', chemistry: p.chemistry, cellsInSeries: p.cellsInSeries, maxCurrentAmps: p.maxCurrentAmps, steps: p.steps as StepFormValues[] };
}
