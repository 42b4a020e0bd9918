import type { ChargerSpec, LoadSpec } from '../scenario/schema.js';

/**
 * Cell current a load draws from a source of `sourceVolts` behind `ohms` (positive = discharge).
 * Constant power solves P = I·(V − I·R) for the smaller root; when the pack cannot deliver
 * the power at all the load sits at the maximum-power point, as an inverter at its limit would.
 */
export function dischargeAmps(load: LoadSpec, sourceVolts: number, ohms: number): number {
  if (sourceVolts <= 0) return 0;
  switch (load.mode) {
    case 'cc':
      return load.amps;
    case 'cr':
      return sourceVolts / (ohms + load.ohms);
    case 'cp': {
      const discriminant = sourceVolts * sourceVolts - 4 * ohms * load.watts;
      if (discriminant < 0) return sourceVolts / (2 * ohms);
      return (sourceVolts - Math.sqrt(discriminant)) / (2 * ohms);
    }
  }
}

/**
 * Cell current from a constant-current, constant-voltage charger (negative = charge).
 * The charger's current limit is shared with the heater pad, which it feeds first.
 */
export function chargeAmps(charger: ChargerSpec, sourceVolts: number, ohms: number, heaterAmps: number): number {
  const headroomAmps = Math.max(0, charger.ccAmps - heaterAmps);
  const cvAmps = Math.max(0, (charger.cvVolts - sourceVolts) / ohms);
  return -Math.min(headroomAmps, cvAmps);
}
