import type { Run } from '../../../../shared/schemas/run';
import { CHEMISTRY_LABEL } from '../../../lib/chemistry-label';
import { useLabSettings } from '../../../lib/lab-settings';
import { formatCharge, formatEnergy, formatNumber, formatPercent, formatVolts } from '../../../lib/units';
import { useRunBattery, useRunBench } from '../api/get-run-context';

const KIND = { 'capacity-discharge': 'Capacity discharge', charge: 'Charge', 'protection-check': 'Protection check', custom: 'Custom' } as const;
const STOP = { 'after-recovery': 'After cutoff and recovery', 'target-ah': 'At a target Ah', 'target-wh': 'At a target Wh', manual: 'By hand' } as const;

function Row({ label, value }: { label: string; value: string }) {
  return (
    <div className="flex justify-between gap-4 border-b border-line py-1.5 text-sm last:border-b-0">
      <dt className="text-ink-muted">{label}</dt>
      <dd className="num text-right">{value}</dd>
    </div>
  );
}

/** What was tested, where and how: the half of a report that makes the figures mean something. */
export function RunSetupPanel({ run }: { run: Run }) {
  const battery = useRunBattery(run.batteryId);
  const bench = useRunBench(run.benchId);
  const { energyUnit } = useLabSettings();
  const b = battery.data;
  const cells = run.endVolts?.mode === 'per-cell' ? (run.endVolts.cellsInSeries ?? b?.cellsInSeries ?? null) : null;
  const endVolts =
    run.endVolts === null
      ? 'Lab default for the chemistry'
      : run.endVolts.mode === 'absolute'
        ? formatVolts(run.endVolts.volts)
        : `${formatVolts(run.endVolts.voltsPerCell, 3)} per cell${cells ? ` × ${cells} = ${formatVolts(run.endVolts.voltsPerCell * cells)}` : ''}`;
  return (
    <div className="grid gap-6 md:grid-cols-2">
      <section aria-label="Battery pack">
        <h2 className="mb-2 font-semibold">Pack</h2>
        {run.batteryId === null ? (
          <p className="text-sm text-ink-muted">Not linked to a registered pack.</p>
        ) : b ? (
          <dl>
            <Row label="Label" value={b.label} />
            <Row label="Brand / model" value={[b.brand, b.model].filter(Boolean).join(' ')} />
            <Row label="Chemistry, cells" value={`${CHEMISTRY_LABEL[b.chemistry]}, ${b.cellsInSeries}S${b.cellsInParallel > 1 ? `${b.cellsInParallel}P` : ''}`} />
            <Row label="Rated" value={`${formatCharge(b.ratedAh)}${b.ratedWh !== null ? ` · ${formatEnergy(b.ratedWh, energyUnit)}` : ''}`} />
            {b.bmsRatedAmps !== null && <Row label="Protection rating" value={`${formatNumber(b.bmsRatedAmps, 0)} A`} />}
            {b.serialNumber && <Row label="Serial number" value={b.serialNumber} />}
            {b.sender && <Row label="Sent by" value={b.sender} />}
          </dl>
        ) : (
          <p className="text-sm text-ink-muted">{battery.isError ? 'The pack record could not be loaded.' : 'Loading…'}</p>
        )}
      </section>
      <section aria-label="Test setup">
        <h2 className="mb-2 font-semibold">Test</h2>
        <dl>
          <Row label="Kind" value={KIND[run.kind]} />
          <Row label="Bench" value={run.origin === 'import' ? 'Imported log' : (bench.data?.name ?? (run.benchId === null ? '—' : `Bench ${run.benchId}`))} />
          <Row label="End voltage" value={endVolts} />
          <Row label="Acceptance" value={`${formatPercent(run.acceptancePercent, 0)} of rated`} />
          <Row label="Stop" value={STOP[run.stopWhen]} />
          {run.targetAh !== null && <Row label="Target" value={formatCharge(run.targetAh)} />}
          {run.targetWh !== null && <Row label="Target" value={formatEnergy(run.targetWh, energyUnit)} />}
        </dl>
      </section>
    </div>
  );
}
