import { describe, expect, it } from 'vitest';
import { ProgrammeInputSchema, type ProgrammeStep } from '../schemas/programme.js';
import { CELL_VOLT_LIMITS, chargeCeilingVolts, programmeProblems, safetyFloorVolts, type PackLimits } from './programme-limits.js';
import { planSteps } from './programme-plan.js';

// A made-up 8-cell LFP pack with a 100 A protection (demo values).
const PACK: PackLimits = { chemistry: 'lfp', cellsInSeries: 8, maxCurrentAmps: 100 };

describe('programme limits: unsafe values are refused with a message', () => {
  it('LFP floor 2.5 V a cell (makers\u2019 data sheets typical, from memory): 8 cells = 20 V', () => {
    expect(CELL_VOLT_LIMITS.lfp.floorVolts).toBe(2.5);
    expect(safetyFloorVolts(PACK)).toBe(20);
    const problems = programmeProblems([{ kind: 'discharge', mode: 'cc', value: 10, endVolts: 19.9 }], PACK);
    expect(problems).toEqual([{ path: 'steps.0.endVolts', message: expect.stringMatching(/19\.9 V is below this pack's floor of 20 V/) }]);
    expect(programmeProblems([{ kind: 'discharge', mode: 'cc', value: 10, endVolts: 20 }], PACK)).toEqual([]);
  });

  it("a protection cutoff above the chemistry floor raises the floor by the margin (50 mV a cell)", () => {
    expect(safetyFloorVolts({ ...PACK, protectionCutoffVolts: 22 })).toBeCloseTo(22.4, 9);
    expect(programmeProblems([{ kind: 'discharge', mode: 'cc', value: 10, endVolts: 22.2 }], { ...PACK, protectionCutoffVolts: 22 })).toHaveLength(1);
  });

  it("a current above the pack's protection rating is refused, in a repeat block too", () => {
    const steps: ProgrammeStep[] = [{ kind: 'repeat', times: 3, steps: [{ kind: 'charge', volts: 28.8, currentAmps: 120, taperAmps: 5 }] }];
    expect(programmeProblems(steps, PACK)).toEqual([{ path: 'steps.0.steps.0.currentAmps', message: expect.stringMatching(/120 A is above the pack's protection rating of 100 A/) }]);
  });

  it('constant power is judged at its end voltage, constant resistance at the charge ceiling', () => {
    // P = V × I: 2,100 W at 20 V draws 105 A; Ohm's law: 29.2 V over 0.28 Ω draws 104.3 A.
    expect(programmeProblems([{ kind: 'discharge', mode: 'cp', value: 2100, endVolts: 20 }], PACK)).toHaveLength(1);
    expect(programmeProblems([{ kind: 'discharge', mode: 'cp', value: 1900, endVolts: 20 }], PACK)).toHaveLength(0);
    expect(chargeCeilingVolts(PACK)).toBeCloseTo(29.2, 9);
    expect(programmeProblems([{ kind: 'discharge', mode: 'cr', value: 0.28, endVolts: 21 }], PACK)).toHaveLength(1);
    expect(programmeProblems([{ kind: 'discharge', mode: 'cr', value: 0.3, endVolts: 21 }], PACK)).toHaveLength(0);
  });

  it('a charge voltage above the chemistry ceiling (LFP 3.65 V a cell) is refused', () => {
    expect(programmeProblems([{ kind: 'charge', volts: 29.6, currentAmps: 10, taperAmps: 1 }], PACK)[0]!.message).toMatch(/above the lfp ceiling of 29\.2 V/);
  });
});

describe('programme schema and plan', () => {
  it('a charge needs a taper current or a time; a rest a time or a settle threshold', () => {
    const base = { name: 'Capacity', chemistry: 'lfp', cellsInSeries: 8, maxCurrentAmps: 100 };
    expect(ProgrammeInputSchema.safeParse({ ...base, steps: [{ kind: 'charge', volts: 28.8, currentAmps: 10 }] }).success).toBe(false);
    expect(ProgrammeInputSchema.safeParse({ ...base, steps: [{ kind: 'rest' }] }).success).toBe(false);
    expect(ProgrammeInputSchema.safeParse({ ...base, steps: [{ kind: 'rest', maxSeconds: 600 }] }).success).toBe(true);
  });

  it('unrolls a repeat block in order with each pass labelled', () => {
    const plan = planSteps([
      { kind: 'charge', volts: 28.8, currentAmps: 10, taperAmps: 1 },
      { kind: 'repeat', times: 2, steps: [{ kind: 'discharge', mode: 'cc', value: 10, endVolts: 22 }, { kind: 'rest', maxSeconds: 60 }] },
    ]);
    expect(plan.map((p) => p.label)).toEqual(['1 charge', '2.1 discharge (pass 1 of 2)', '2.2 rest (pass 1 of 2)', '2.1 discharge (pass 2 of 2)', '2.2 rest (pass 2 of 2)']);
    expect(plan.map((p) => p.index)).toEqual([0, 1, 2, 3, 4]);
  });
});
