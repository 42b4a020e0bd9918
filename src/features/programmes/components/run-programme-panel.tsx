import type { RunProgramme } from '../../../../shared/schemas/programme-run';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { formatDuration, formatVolts } from '../../../lib/units';
import { useNow } from '../../../lib/use-now';
import { useProgrammeControl, useRunProgramme } from '../api/run-programme';
import { CommandLog } from './command-log';
import { StartProgrammeForm } from './start-programme-form';
import { StepResultsTable } from './step-results-table';
import { MS_PER_S } from '../../../../shared/units/time';

const STATE_WORD = { starting: 'starting', running: 'running', paused: 'paused', finished: 'finished', failed: 'failed safe, outputs off', aborted: 'aborted, outputs off' } as const;

/** Seconds in the current step: the server's start and clock, moved on by the time since it answered (frozen while paused). */
function timeInStepSeconds(p: RunProgramme, fetchedAtMs: number, nowMs: number): number | null {
  if (p.stepStartedAtMs === null) return null;
  const serverNow = p.state === 'paused' ? p.serverNowMs : p.serverNowMs + (nowMs - fetchedAtMs);
  return Math.max(0, (serverNow - p.stepStartedAtMs) / MS_PER_S);
}

function Controls({ runId, p }: { runId: number; p: RunProgramme }) {
  const control = useProgrammeControl(runId);
  const busy = control.isPending;
  return (
    <div className="flex flex-wrap gap-2" aria-label="Step control">
      {p.state === 'running' && (
        <Button variant="secondary" onClick={() => control.mutate('pause')} disabled={busy}>
          Pause step
        </Button>
      )}
      {p.state === 'paused' && (
        <Button variant="secondary" onClick={() => control.mutate('resume')} disabled={busy}>
          Resume step
        </Button>
      )}
      <Button variant="secondary" onClick={() => control.mutate('skip')} disabled={busy}>
        Skip step
      </Button>
      <Button variant="danger" onClick={() => control.mutate('abort')} disabled={busy}>
        Abort programme
      </Button>
      {control.isError && (
        <p role="alert" className="w-full text-sm text-state-cutoff">
          {control.error.message}
        </p>
      )}
    </div>
  );
}

/**
 * The programme a run follows: its state, the current step and time in it, the steps to come,
 * a technician's pause, skip and abort, each finished step's figures and the command log. On a
 * live run without one, a technician can start a saved programme here.
 */
export function RunProgrammePanel({ runId, canAct, live }: { runId: number; canAct: boolean; live: boolean }) {
  const query = useRunProgramme(runId);
  const now = useNow();
  if (query.isPending) return <Loading label="Loading the programme…" />;
  if (query.isError) return <QueryError error={query.error} what="The run's programme" />;
  const p = query.data;
  if (!p) {
    if (!live || !canAct) return null;
    return (
      <Card className="flex flex-col gap-3 print:hidden">
        <h2 className="font-semibold">Test programme</h2>
        <StartProgrammeForm runId={runId} />
      </Card>
    );
  }
  const going = p.state === 'running' || p.state === 'paused' || p.state === 'starting';
  const seconds = timeInStepSeconds(p, query.dataUpdatedAt, now);
  const current = p.currentIndex;
  const toCome = current === null ? [] : p.stepLabels.slice(current + 1);
  return (
    <Card className="flex flex-col gap-3">
      <h2 className="font-semibold">
        Programme {p.programme.name}: {STATE_WORD[p.state]}
      </h2>
      {p.failReason && (
        <p role="alert" className="text-sm text-state-cutoff">
          {p.failReason}
        </p>
      )}
      {current !== null && (
        <p className="text-lg" data-testid="current-step">
          Now: <strong>{p.stepLabels[current]}</strong>
          {seconds !== null && <span className="num"> · {formatDuration(seconds)} in step</span>}
        </p>
      )}
      {going && toCome.length > 0 && (
        <div className="text-sm">
          <span className="text-ink-muted">Steps to come:</span>
          <ol aria-label="Steps to come" className="list-decimal pl-5">
            {toCome.map((label, i) => (
              <li key={`${label}-${i}`}>{label}</li>
            ))}
          </ol>
        </div>
      )}
      {canAct && going && <Controls runId={runId} p={p} />}
      <p className="text-xs text-ink-muted">
        The server switches every output off at {formatVolts(p.floorVolts, 2)}, over temperature, when the meter goes silent and on abort.
        {p.watchdogArmed.length > 0 ? ` Instrument watchdog armed on ${p.watchdogArmed.join(', ')}.` : ' No instrument watchdog: the instruments on this bench have none, so an output can stay on while the server is down (it is switched off when the server starts again).'} Cautions acknowledged by{' '}
        {p.cautionsAcknowledgedBy}.
      </p>
      <StepResultsTable results={p.results} roundTrips={p.roundTrips} labels={p.stepLabels} />
      <CommandLog runId={runId} />
    </Card>
  );
}
