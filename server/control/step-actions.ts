import type { SimpleStep } from '../../shared/schemas/programme.js';
import { InstrumentFault, type InstrumentControl, type SetPoint } from './instrument-control.js';
import type { OutputsOn } from './safety-net.js';

/** The instruments a programme drives on one bench. */
export interface BenchInstruments {
  load?: InstrumentControl;
  supply?: InstrumentControl;
}

/** Which instrument a step drives and with what set point (null: every output off). */
export function stepDrive(step: SimpleStep): { role: 'load' | 'supply'; point: SetPoint } | null {
  if (step.kind === 'charge') return { role: 'supply', point: { mode: 'cv', value: step.volts, currentLimitAmps: step.currentAmps } };
  if (step.kind === 'discharge') return { role: 'load', point: { mode: step.mode, value: step.value } };
  return null;
}

/** The roles a list of steps needs (a charge needs a supply, a discharge a load). */
export function rolesNeeded(steps: readonly SimpleStep[]): Set<'load' | 'supply'> {
  const roles = new Set<'load' | 'supply'>();
  for (const step of steps) {
    const drive = stepDrive(step);
    if (drive) roles.add(drive.role);
  }
  return roles;
}

/** Throws InstrumentFault naming the instrument's queued errors, if it reports any. */
async function checkErrors(instrument: InstrumentControl): Promise<void> {
  const errors = await instrument.errors();
  if (errors.length > 0) throw new InstrumentFault(instrument.id, `reported ${errors.join('; ')}`);
}

/**
 * Puts the bench in the state a step asks for: the output it does not use off first (never a
 * charger and a load on together), then the set point, then its output on, and the error queue
 * read after each. `stillWanted` is asked right before an output goes on: a step ended, paused or
 * failed meanwhile must not switch anything on. `on` is updated before each command is sent, so
 * the safety net treats an output as on from the moment it was asked for.
 */
export async function applyStep(step: SimpleStep, instruments: BenchInstruments, on: OutputsOn, stillWanted: () => boolean): Promise<void> {
  const drive = stepDrive(step);
  for (const role of ['load', 'supply'] as const) {
    const instrument = instruments[role];
    if (!instrument || drive?.role === role) continue;
    if (on[role] || !drive) {
      on[role] = false;
      await instrument.setOutput(false);
    }
  }
  if (!drive) return;
  const instrument = instruments[drive.role];
  if (!instrument) throw new InstrumentFault(drive.role, `no ${drive.role} on this bench`);
  await instrument.set(drive.point);
  await checkErrors(instrument);
  if (!stillWanted()) return;
  on[drive.role] = true;
  await instrument.setOutput(true);
  await checkErrors(instrument);
}

/** What one instrument said when told to switch its output off. */
export interface OutputOffCheck {
  id: string;
  /** True only when the instrument read back its output off after the command. */
  confirmedOff: boolean;
  /** In words, starting with the instrument's id. */
  detail: string;
}

/** Sends output off to each instrument on its own, so one that fails does not keep the other on; the error of each, or null. */
async function switchEachOff(instruments: BenchInstruments, on: OutputsOn): Promise<Array<{ instrument: InstrumentControl; error: unknown }>> {
  on.load = false;
  on.supply = false;
  const list = [instruments.load, instruments.supply].filter((i): i is InstrumentControl => i !== undefined);
  const settled = await Promise.allSettled(list.map((i) => i.setOutput(false)));
  return settled.map((s, k) => ({ instrument: list[k]!, error: s.status === 'rejected' ? (s.reason ?? 'rejected') : null }));
}

const notConfirmed = (id: string, error: unknown) => `${id}: output off not confirmed (${reasonOf(error)})`;

/** Switches every output off, each instrument on its own, so one that fails does not keep the other on; returns the failures in words. */
export async function allOutputsOff(instruments: BenchInstruments, on: OutputsOn): Promise<string[]> {
  const sent = await switchEachOff(instruments, on);
  return sent.flatMap(({ instrument, error }) => (error === null ? [] : [notConfirmed(instrument.id, error)]));
}

/**
 * Switches every output off as {@link allOutputsOff} does, then reads each instrument back:
 * an output counts as off only when the instrument itself says so (a command written to a
 * port nobody answers on proves nothing). Never throws; each call has the driver's timeout.
 */
export async function outputsOffChecked(instruments: BenchInstruments): Promise<OutputOffCheck[]> {
  const sent = await switchEachOff(instruments, { load: false, supply: false });
  return Promise.all(
    sent.map(async ({ instrument, error }): Promise<OutputOffCheck> => {
      const { id } = instrument;
      if (error !== null) return { id, confirmedOff: false, detail: notConfirmed(id, error) };
      try {
        const back = await instrument.read();
        return back.outputOn ? { id, confirmedOff: false, detail: `${id}: still reads its output on` } : { id, confirmedOff: true, detail: `${id}: output confirmed off` };
      } catch (readError) {
        return { id, confirmedOff: false, detail: notConfirmed(id, readError) };
      }
    }),
  );
}

/** Words for a failure: an instrument's reason, or the error's message. */
export function reasonOf(error: unknown): string {
  if (error instanceof InstrumentFault) return error.message;
  return error instanceof Error ? error.message : String(error);
}
