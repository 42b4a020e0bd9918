import { useState, type FormEvent } from 'react';
import { PROGRAMME_CAUTIONS } from '../../../../shared/schemas/programme-run';
import { Button } from '../../../components/ui/button';
import { SelectField } from '../../../components/ui/field';
import { Loading, QueryError } from '../../../components/ui/status';
import { useProgrammes } from '../api/programmes';
import { useStartProgramme } from '../api/run-programme';

/** Pick a saved programme for a live run; it starts only once the technician has acknowledged the cautions. */
export function StartProgrammeForm({ runId }: { runId: number }) {
  const programmes = useProgrammes();
  const start = useStartProgramme(runId);
  const [programmeId, setProgrammeId] = useState('');
  const [acknowledged, setAcknowledged] = useState(false);
  if (programmes.isPending) return <Loading label="Loading programmes…" />;
  if (programmes.isError) return <QueryError error={programmes.error} what="The programmes" />;
  if (programmes.data.length === 0) return <p className="text-sm text-ink-muted">No saved programmes yet: write one under Programmes.</p>;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (programmeId && acknowledged) start.mutate(Number(programmeId));
  };
  return (
    <form onSubmit={submit} aria-label="Start a programme" className="flex flex-col gap-3">
      <SelectField
        label="Programme"
        value={programmeId}
        onChange={(e) => setProgrammeId(e.target.value)}
        options={[{ value: '', label: 'Choose a programme…' }, ...programmes.data.map((p) => ({ value: String(p.id), label: p.name }))]}
        required
      />
      <section aria-label="Cautions before a programme" className="rounded-xl border border-caution/50 bg-caution-surface p-4 text-sm">
        <h3 className="font-bold text-caution">Before the server drives this bench</h3>
        <ul className="mt-2 list-disc pl-5">
          {PROGRAMME_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
        <label className="mt-3 flex min-h-11 items-center gap-2 font-medium">
          <input type="checkbox" className="h-5 w-5" checked={acknowledged} onChange={(e) => setAcknowledged(e.target.checked)} />
          I have read these cautions and the bench is set up for them
        </label>
      </section>
      {start.isError && (
        <p role="alert" className="text-sm text-state-cutoff">
          {start.error.message}
        </p>
      )}
      <Button type="submit" disabled={!programmeId || !acknowledged || start.isPending}>
        Start programme
      </Button>
    </form>
  );
}
