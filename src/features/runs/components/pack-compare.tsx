import { useQueries, useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import type { Run } from '../../../../shared/schemas/run';
import { Card, PageHeader } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { batteriesQueryOptions } from '../../../lib/queries/batteries';
import { runsQueryOptions } from '../api/get-runs';
import { MAX_COMPARED_RUNS, RunCompare } from './run-compare';

/** Finished runs looked at per pack when picking its capacity run. */
const RUNS_PER_PACK = 100;

/** One pack in the selection: its id and, when chosen, the run that stands for it. */
export interface PackChoice {
  batteryId: number;
  runId: number | null;
}

/** Reads `packs=4,7:12` (pack 4 by its latest capacity run, pack 7 by run 12); bad entries are dropped. */
export function parsePackChoices(param: string | null): PackChoice[] {
  const out: PackChoice[] = [];
  for (const part of (param ?? '').split(',')) {
    const m = part.match(/^(\d+)(?::(\d+))?$/);
    if (m && !out.some((c) => c.batteryId === Number(m[1]))) out.push({ batteryId: Number(m[1]), runId: m[2] ? Number(m[2]) : null });
  }
  return out.slice(0, MAX_COMPARED_RUNS);
}

/** Writes the selection back as `packs=…` (the inverse of parsePackChoices). */
export function formatPackChoices(choices: readonly PackChoice[]): string {
  return choices.map((c) => (c.runId === null ? String(c.batteryId) : `${c.batteryId}:${c.runId}`)).join(',');
}

/** The run that stands for a pack: the chosen one if it is among its runs, else its latest finished capacity run. */
export function representativeRun(runs: readonly Run[], chosenRunId: number | null): Run | null {
  const capacity = runs.filter((r) => r.state === 'finished' && r.kind === 'capacity-discharge' && r.summary);
  return (chosenRunId !== null ? capacity.find((r) => r.id === chosenRunId) : undefined) ?? capacity[0] ?? null;
}

/**
 * Packs from the register compared through one capacity run each: /runs/compare?packs=4,7:12.
 * Tick packs to add or drop them; each pack's run can be changed from its latest finished one.
 */
export function PackCompare() {
  const [params, setParams] = useSearchParams();
  const choices = parsePackChoices(params.get('packs'));
  const packs = useQuery(batteriesQueryOptions());
  const packRuns = useQueries({ queries: choices.map((c) => runsQueryOptions({ batteryId: c.batteryId, state: 'finished', limit: RUNS_PER_PACK, offset: 0 })) });
  const setChoices = (next: PackChoice[]) => setParams({ packs: formatPackChoices(next) }, { replace: true });

  if (packs.isError) return <QueryError error={packs.error} what="The pack register" />;
  const failed = packRuns.find((q) => q.isError);
  if (failed) return <QueryError error={failed.error} what="The packs' runs" />;
  if (!packs.data || packRuns.some((q) => !q.data)) return <Loading label="Loading packs to compare…" />;

  const reps = choices.map((c, i) => representativeRun(packRuns[i]!.data!.runs, c.runId));
  const runIds = reps.filter((r): r is Run => r !== null).map((r) => r.id);
  const full = choices.length >= MAX_COMPARED_RUNS;

  return (
    <div className="flex flex-col gap-4">
      {runIds.length === 0 && <PageHeader title="Compare packs" subtitle="Each pack by its latest finished capacity run, or one you choose." />}
      <Card>
        <fieldset>
          <legend className="mb-2 font-semibold">Packs from the register (up to {MAX_COMPARED_RUNS})</legend>
          <ul className="flex flex-col gap-1 md:flex-row md:flex-wrap md:gap-3">
            {packs.data.map((b) => {
              const at = choices.findIndex((c) => c.batteryId === b.id);
              return (
                <li key={b.id}>
                  <label className="inline-flex min-h-11 cursor-pointer items-center gap-2">
                    <input
                      type="checkbox"
                      className="h-5 w-5"
                      checked={at >= 0}
                      disabled={at < 0 && full}
                      onChange={() => setChoices(at >= 0 ? choices.filter((c) => c.batteryId !== b.id) : [...choices, { batteryId: b.id, runId: null }])}
                    />
                    {b.label}
                  </label>
                </li>
              );
            })}
          </ul>
        </fieldset>
        {choices.map((c, i) => {
          const pack = packs.data.find((b) => b.id === c.batteryId);
          const options = packRuns[i]!.data!.runs.filter((r) => r.kind === 'capacity-discharge' && r.summary);
          const rep = reps[i];
          return (
            <div key={c.batteryId} className="mt-2">
              {rep ? (
                <label className="flex flex-wrap items-center gap-2 text-sm">
                  {pack?.label ?? `Pack ${c.batteryId}`} by run
                  <select
                    className="min-h-11 rounded-lg border border-line bg-surface-raised px-2"
                    value={rep.id}
                    onChange={(e) => setChoices(choices.map((x) => (x.batteryId === c.batteryId ? { ...x, runId: Number(e.target.value) } : x)))}
                  >
                    {options.map((r, k) => (
                      <option key={r.id} value={r.id}>
                        {r.name}
                        {k === 0 ? ' (latest)' : ''}
                      </option>
                    ))}
                  </select>
                </label>
              ) : (
                <p className="text-sm text-ink-muted">{pack?.label ?? `Pack ${c.batteryId}`}: no finished capacity run yet.</p>
              )}
            </div>
          );
        })}
      </Card>
      {runIds.length > 0 ? <RunCompare key={runIds.join(',')} runIds={runIds} title="Compare packs" /> : <p className="text-ink-muted">Tick packs to compare them by their latest finished capacity run.</p>}
    </div>
  );
}
