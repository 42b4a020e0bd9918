import { useState, type ReactNode } from 'react';
import type { SharedPackReport, SharedRunReport } from '../../../../shared/schemas/share';
import type { RunSummary } from '../../../../shared/schemas/run-summary';
import { HistoryChart } from '../../../components/charts/history-chart';
import { Card } from '../../../components/ui/card';
import { RunEventsList } from '../../../components/ui/run-events-list';
import { SafetyCautions } from '../../../components/ui/safety-cautions';
import { SignoffBlockView } from '../../../components/ui/signoff-block';
import { Loading, QueryError } from '../../../components/ui/status';
import { formatLabTime } from '../../../lib/lab-settings';
import { formatCharge, formatEnergy, formatNumber, formatPercent } from '../../../lib/units';
import { useSharedReport, useSharedReadings } from '../api/share-links';

/** About one bucket per horizontal pixel of a phone-to-desktop chart. */
const SHARED_CHART_MAX_POINTS = 800;

/** How the page draws a run's summary (the route passes the runs feature's panel). */
export type RenderSummary = (summary: RunSummary, report: SharedRunReport) => ReactNode;

function Spec({ label, value }: { label: string; value: string | number | null }) {
  if (value === null || value === '') return null;
  return (
    <>
      <dt className="text-ink-muted">{label}</dt>
      <dd>{value}</dd>
    </>
  );
}

function RunReport({ token, report, renderSummary }: { token: string; report: SharedRunReport; renderSummary: RenderSummary }) {
  const [chartWindow, setChartWindow] = useState<{ from: number | null; to: number | null }>({ from: null, to: null });
  const readings = useSharedReadings(token, chartWindow, SHARED_CHART_MAX_POINTS);
  const time = (iso: string | null) => formatLabTime(iso, report.lab.timeZone);
  return (
    <>
      <h1 className="text-2xl font-bold tracking-tight">{report.run.name}</h1>
      <p className="text-sm text-ink-muted">
        Started {time(report.run.startedAt)} · ended {time(report.run.endedAt)}
        {report.battery && ` · pack ${report.battery.label} (${report.battery.brand})`}
      </p>
      <SignoffBlockView block={report.signoff} formatTime={(iso) => time(iso)} />
      {report.summary ? <Card className="p-6">{renderSummary(report.summary, report)}</Card> : <Card>No summary: the run had not ended when it was shared.</Card>}
      <Card>
        <h2 className="mb-3 font-semibold">Volts and amps</h2>
        {readings.isPending ? (
          <Loading label="Loading readings…" />
        ) : readings.isError ? (
          <QueryError error={readings.error} what="Readings" />
        ) : (
          <HistoryChart readings={readings.data} onZoom={(from, to) => setChartWindow({ from, to })} temperatureUnit={report.lab.temperatureUnit} />
        )}
      </Card>
      <Card>
        <h2 className="mb-3 font-semibold">Events and notes</h2>
        <RunEventsList events={report.events.map((e) => e.event)} temperatureUnit={report.lab.temperatureUnit} energyUnit={report.lab.energyUnit} />
      </Card>
    </>
  );
}

function PackReport({ token, report }: { token: string; report: SharedPackReport }) {
  const b = report.battery;
  const time = (iso: string | null) => formatLabTime(iso, report.lab.timeZone);
  const thumb = (id: number) => (
    <img key={id} src={`/api/shared/${token}/photos/${id}/thumb`} alt={`Inspection photo ${id}`} className="h-24 w-24 rounded border border-line object-cover" loading="lazy" />
  );
  return (
    <>
      <h1 className="text-2xl font-bold tracking-tight">
        {b.label} · {b.brand}
        {b.model ? ` ${b.model}` : ''}
      </h1>
      <Card>
        <h2 className="mb-2 font-semibold">Specifications</h2>
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <Spec label="Chemistry" value={b.chemistry} />
          <Spec label="Cells" value={`${b.cellsInSeries}S${b.cellsInParallel}P`} />
          <Spec label="Rated" value={formatCharge(b.ratedAh)} />
          <Spec label="Rated energy" value={b.ratedWh === null ? null : formatEnergy(b.ratedWh, report.lab.energyUnit)} />
          <Spec label="BMS rating" value={b.bmsRatedAmps === null ? null : `${formatNumber(b.bmsRatedAmps, 0)} A`} />
          <Spec label="Mass" value={b.massKg === null ? null : `${formatNumber(b.massKg, 2)} kg`} />
          <Spec label="Serial number" value={b.serialNumber} />
          <Spec label="Terminals" value={b.terminalType} />
          {report.includePrices && <Spec label="Price" value={b.price === null ? null : `${formatNumber(b.price, 2)} ${b.priceCurrency ?? ''}`} />}
        </dl>
      </Card>
      <Card>
        <h2 className="mb-2 font-semibold">Capacity history and protection record</h2>
        {report.runs.length === 0 ? (
          <p className="text-sm text-ink-muted">No finished runs.</p>
        ) : (
          // Focusable, so a keyboard can scroll the table sideways on a phone.
          <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Capacity history and protection record table">
            <table className="w-full text-left text-sm">
              <thead>
                <tr>
                  <th scope="col" className="p-2">Run</th>
                  <th scope="col" className="p-2">Started</th>
                  <th scope="col" className="p-2">Capacity</th>
                  <th scope="col" className="p-2">% of rated</th>
                  <th scope="col" className="p-2">Verdict</th>
                  <th scope="col" className="p-2">Protection trips</th>
                </tr>
              </thead>
              <tbody>
                {report.runs.map((r, i) => (
                  <tr key={i} className="border-t border-line">
                    <td className="p-2">{r.name}</td>
                    <td className="p-2">{time(r.startedAt)}</td>
                    <td className="num p-2">{formatCharge(r.capacityAh)}</td>
                    <td className="num p-2">{formatPercent(r.percentRatedAh)}</td>
                    <td className="p-2">{r.verdict ?? '—'}</td>
                    <td className="num p-2">{r.protectionTrips.length + r.protections.length}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Card>
      <Card>
        <h2 className="mb-2 font-semibold">Inspection</h2>
        {report.inspection.length === 0 && report.otherPhotoIds.length === 0 ? (
          <p className="text-sm text-ink-muted">No inspection recorded.</p>
        ) : (
          <ul className="flex flex-col gap-3 text-sm">
            {report.inspection.map((e) => (
              <li key={e.item.id}>
                <p>
                  <strong>{e.item.title}</strong>: {e.rating ?? 'not rated'}
                  {e.note ? ` · ${e.note}` : ''}
                </p>
                <div className="mt-1 flex flex-wrap gap-2">{e.photoIds.map(thumb)}</div>
              </li>
            ))}
            {report.otherPhotoIds.length > 0 && (
              <li>
                <p>
                  <strong>Other photos</strong>
                </p>
                <div className="mt-1 flex flex-wrap gap-2">{report.otherPhotoIds.map(thumb)}</div>
              </li>
            )}
          </ul>
        )}
      </Card>
    </>
  );
}

/** The page a share link opens: read-only, no account, only what was shared. */
export function SharedReportView({ token, renderSummary }: { token: string; renderSummary: RenderSummary }) {
  const report = useSharedReport(token);
  return (
    <main className="mx-auto flex max-w-5xl flex-col gap-4 p-4">
      {report.isPending ? (
        <Loading label="Loading the shared report…" />
      ) : report.isError ? (
        <>
          <h1 className="text-2xl font-bold">Report not available</h1>
          <p>This link does not exist, has expired or was withdrawn. Ask the lab that sent it for a new one.</p>
        </>
      ) : (
        <>
          <div className="flex flex-wrap items-center justify-between gap-2">
            <p className="text-sm text-ink-muted">
              {report.data.lab.name} · shared report · link works until {formatLabTime(report.data.expiresAt, report.data.lab.timeZone)}
            </p>
            <a href={`/api/shared/${token}/report.pdf`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold" download>
              Download PDF
            </a>
          </div>
          {report.data.kind === 'run' ? <RunReport token={token} report={report.data} renderSummary={renderSummary} /> : <PackReport token={token} report={report.data} />}
          <SafetyCautions compact />
        </>
      )}
    </main>
  );
}
