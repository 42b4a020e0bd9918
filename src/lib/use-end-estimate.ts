import { useQuery } from '@tanstack/react-query';
import { useMemo, useRef } from 'react';
import { nominalWh } from '../../shared/measure/nominal';
import { EndEstimator, type EndEstimate } from '../../shared/measure/time-to-end';
import type { Battery } from '../../shared/schemas/battery';
import { ChemistrySchema } from '../../shared/schemas/chemistry';
import { LIVE_RUN_STATES } from '../../shared/schemas/run';
import type { LiveView } from './live-view';
import { batteryQueryOptions } from './queries/batteries';

const HIDDEN: EndEstimate = { secondsToEnd: null, percentOfRated: null };

/** The pack's rated energy: its stated Wh, else rated Ah × the chemistry's nominal volts; null when unknown. */
export function ratedWhOf(battery: Pick<Battery, 'ratedWh' | 'ratedAh' | 'chemistry' | 'cellsInSeries'> | undefined | null): number | null {
  if (!battery) return null;
  // The same chemistry mapping as the run pipeline (server/runs/measure-config.ts): unknown ones have no nominal volts.
  return battery.ratedWh ?? nominalWh(ChemistrySchema.safeParse(battery.chemistry).data ?? 'other', battery.cellsInSeries, battery.ratedAh);
}

/**
 * The live run's estimated time to the end voltage and % of rated so far (shared/measure/
 * time-to-end.ts), fed one reading per view update; hidden for a charge run or an ended one.
 */
export function useEndEstimate(view: LiveView): EndEstimate {
  const run = view.run;
  const discharge = !!run && run.kind !== 'charge' && LIVE_RUN_STATES.includes(run.state);
  const battery = useQuery({ ...batteryQueryOptions(run?.batteryId ?? null), enabled: discharge && run?.batteryId != null });
  const ratedWh = ratedWhOf(battery.data);
  const estimator = useRef<{ key: string; est: EndEstimator } | null>(null);
  return useMemo(() => {
    if (!discharge || view.time === null || view.volts === null || view.amps === null || view.dischargeWh === null) return HIDDEN;
    const key = `${run?.id}:${ratedWh}`;
    if (estimator.current?.key !== key) estimator.current = { key, est: new EndEstimator(ratedWh) };
    // A reading already seen (same run time) changes nothing: the estimator ignores it.
    return estimator.current.est.push({ elapsedSeconds: view.time, volts: view.volts, amps: view.amps, dischargeWh: view.dischargeWh });
  }, [discharge, run?.id, ratedWh, view.time, view.volts, view.amps, view.dischargeWh]);
}
