import { useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { LIVE_RUN_STATES } from '../../../../shared/schemas/run';
import type { RunEvent } from '../../../../shared/schemas/run-event';
import { HistoryChart, type ChartMarker } from '../../../components/charts/history-chart';
import { Button } from '../../../components/ui/button';
import { Card, PageHeader } from '../../../components/ui/card';
import { RunEventsList } from '../../../components/ui/run-events-list';
import { RunStateBadge } from '../../../components/ui/state-badge';
import { Loading, QueryError } from '../../../components/ui/status';
import { formatLabTime, useLabSettings } from '../../../lib/lab-settings';
import { NOTE_COLOR, RUN_STATE_COLORS } from '../../../lib/palette';
import { formatElapsedClock } from '../../../lib/units';
import { useRun, useRunEvents } from '../api/get-run';
import { useRunBattery } from '../api/get-run-context';
import { useRunReadings, type ReadingWindow } from '../api/get-run-readings';
import { CapacityAnalysisPanel } from './capacity-analysis-panel';
import { ImportNoticesPanel } from './import-notices-panel';
import { RunLabelEditor } from './run-label-editor';
import { RunNoteForm } from './run-note-form';
import { RunSetupPanel } from './run-setup-panel';
import { RunSummaryPanel } from './run-summary-panel';
import { RunNotes, type NoteViewer } from './run-notes';
import { useLiveNotes } from '../api/use-live-notes';
import { ProtectionCheckPanel, TempChannels } from './protection-check-panel';

/** About one bucket per horizontal pixel of a wide chart. */
const CHART_MAX_POINTS = 1000;
const FULL_WINDOW: ReadingWindow = { from: null, to: null };

/** The chart's window lives in the address (`?from=&to=`, run seconds), so a link can open the run zoomed to a stretch. */
function windowFrom(params: URLSearchParams): ReadingWindow {
  const read = (key: string) => {
    const raw = params.get(key);
    const n = raw === null || raw.trim() === '' ? NaN : Number(raw);
    return Number.isFinite(n) ? n : null;
  };
  const from = read('from');
  const to = read('to');
  return from !== null && to !== null && to <= from ? FULL_WINDOW : { from, to };
}

function markerFor(e: RunEvent): ChartMarker | null {
  if (e.type === 'cutoff') return { elapsedSeconds: e.elapsedSeconds, color: RUN_STATE_COLORS.cutoff };
  if (e.type === 'recovery') return { elapsedSeconds: e.elapsedSeconds, color: RUN_STATE_COLORS.recovered };
  if (e.type === 'annotation') return { elapsedSeconds: e.elapsedSeconds, color: NOTE_COLOR };
  return null;
}

/** A recorded run: verdict, figures, the zoomable history chart, events and exports. */
export function RunDetail({ runId, canEdit = false, viewer = null }: { runId: number; canEdit?: boolean; viewer?: NoteViewer | null }) {
  const run = useRun(runId);
  const events = useRunEvents(runId);
  useLiveNotes(runId);
  const settings = useLabSettings();
  const pack = useRunBattery(run.data?.batteryId ?? null);
  const [params, setParams] = useSearchParams();
  const readingWindow = useMemo(() => windowFrom(params), [params]);
  const setWindow = (w: ReadingWindow) => {
    const next = new URLSearchParams(params);
    for (const key of ['from', 'to'] as const) {
      const v = w[key];
      if (v === null) next.delete(key);
      else next.set(key, String(Math.round(v * 10) / 10));
    }
    setParams(next, { replace: true });
  };
  const readings = useRunReadings(runId, readingWindow, CHART_MAX_POINTS);
  const [editing, setEditing] = useState(false);
  // Stable between renders so the chart is not rebuilt for nothing.
  const markers = useMemo(
    () => (events.data ?? []).map((e) => markerFor(e.event)).filter((m): m is ChartMarker => m !== null),
    [events.data],
  );

  if (run.isPending) return <Loading label="Loading run…" />;
  if (run.isError) return <QueryError error={run.error} what="This run" />;
  const r = run.data;
  const stored = events.data?.map((e) => e.event) ?? [];
  const live = LIVE_RUN_STATES.includes(r.state);
  const zoomed = readingWindow.from !== null || readingWindow.to !== null;

  return (
    <>
      <p className="mb-2 hidden text-sm text-ink-muted print:block">
        {settings.labName} · Run report · printed {formatLabTime(new Date().toISOString(), settings.timeZone)}
      </p>
      <PageHeader
        title={r.name}
        subtitle={
          <span className="flex flex-wrap items-center gap-3">
            <RunStateBadge state={r.state} />
            <span>Started {formatLabTime(r.startedAt, settings.timeZone)}</span>
            {r.endedAt && <span>Ended {formatLabTime(r.endedAt, settings.timeZone)}</span>}
            <span className="num">{r.readingsCount.toLocaleString('en-US')} readings</span>
            {r.tags.length > 0 && <span>Tags: {r.tags.join(', ')}</span>}
          </span>
        }
        actions={
          <div className="flex flex-wrap gap-2 print:hidden">
            {canEdit && !editing && (
              <Button variant="secondary" onClick={() => setEditing(true)}>
                Rename / tag
              </Button>
            )}
            <Button variant="secondary" onClick={() => window.print()}>
              Print report
            </Button>
            {live && r.benchId !== null && (
              <Link to={`/benches/${r.benchId}`} className="inline-flex min-h-11 items-center rounded-lg bg-accent px-4 text-sm font-semibold text-accent-ink">
                Watch live
              </Link>
            )}
            <a href={`/api/runs/${runId}/export.csv`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold" download>
              Export CSV
            </a>
            <a href={`/api/runs/${runId}/export.json`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold" download>
              Export JSON
            </a>
            <a href={`/api/runs/${runId}/report.pdf`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold" download>
              Report PDF
            </a>
          </div>
        }
      />
      <div className="flex flex-col gap-4">
        <ImportNoticesPanel />
        {editing && (
          <Card className="print:hidden">
            <RunLabelEditor run={r} onDone={() => setEditing(false)} />
          </Card>
        )}
        <Card className="p-6">
          <RunSetupPanel run={r} />
        </Card>
        {r.summary && r.kind === 'protection-check' ? (
          <Card className="p-6">
            <ProtectionCheckPanel runId={runId} summary={r.summary} temperatureUnit={settings.temperatureUnit} energyUnit={settings.energyUnit} />
          </Card>
        ) : r.summary ? (
          <Card className="flex flex-col gap-3 p-6">
            <RunSummaryPanel
              summary={r.summary}
              temperatureUnit={settings.temperatureUnit}
              energyUnit={settings.energyUnit}
              // The price is the pack's, in the pack's currency when it names one, else the lab's.
              currency={pack.data?.priceCurrency ?? settings.currency}
            />
            <TempChannels summary={r.summary} temperatureUnit={settings.temperatureUnit} />
          </Card>
        ) : (
          <Card className="text-ink-muted">No summary yet: the run is still recording.</Card>
        )}
        <Card>
          <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
            <h2 className="font-semibold">
              Volts and amps{' '}
              {readings.data && (
                <span className="num text-sm font-normal text-ink-muted">
                  {formatElapsedClock(readings.data.from)} – {formatElapsedClock(readings.data.to)} ·{' '}
                  {readings.data.reduced ? `min/max of ${readings.data.bucketSeconds?.toFixed(1)} s buckets` : 'every reading'}
                </span>
              )}
            </h2>
            <div className="flex items-center gap-2 text-sm text-ink-muted print:hidden">
              <span>Drag across the chart to zoom.</span>
              <Button variant="secondary" disabled={!zoomed} onClick={() => setWindow(FULL_WINDOW)}>
                Whole run
              </Button>
            </div>
          </div>
          {readings.isPending ? (
            <Loading label="Loading readings…" />
          ) : readings.isError ? (
            <QueryError error={readings.error} what="Readings" />
          ) : (
            <HistoryChart readings={readings.data} markers={markers} onZoom={(from, to) => setWindow({ from, to })} temperatureUnit={settings.temperatureUnit} />
          )}
        </Card>
        {r.kind === 'capacity-discharge' && !live && r.summary?.capacityAh ? (
          <Card>
            <CapacityAnalysisPanel runId={runId} summary={r.summary} />
          </Card>
        ) : null}
        <Card>
          <h2 className="mb-3 font-semibold">Events</h2>
          {canEdit && (
            <div className="mb-4">
              <RunNoteForm runId={runId} durationSeconds={r.summary?.durationSeconds ?? null} />
            </div>
          )}
          {events.isError ? <QueryError error={events.error} what="Events" /> : <RunEventsList events={stored} temperatureUnit={settings.temperatureUnit} energyUnit={settings.energyUnit} />}
        </Card>
        <Card>
          <RunNotes runId={runId} events={events.data ?? []} viewer={viewer} />
        </Card>
      </div>
    </>
  );
}
