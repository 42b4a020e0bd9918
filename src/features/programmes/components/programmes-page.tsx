import { useState } from 'react';
import type { Programme } from '../../../../shared/schemas/programme';
import { planSteps } from '../../../../shared/measure/programme-plan';
import { Button } from '../../../components/ui/button';
import { Card, PageHeader } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { useDeleteProgramme, useProgrammes } from '../api/programmes';
import { ProgrammeEditor } from './programme-editor';

/** The lab's saved test programmes: technicians write, change and remove them; everyone reads them. */
export function ProgrammesPage({ canEdit }: { canEdit: boolean }) {
  const programmes = useProgrammes();
  const remove = useDeleteProgramme();
  const [editing, setEditing] = useState<Programme | 'new' | null>(null);
  return (
    <>
      <PageHeader
        title="Test programmes"
        subtitle="Steps a run follows on a bench with a controllable load and charger."
        actions={canEdit && editing === null ? <Button onClick={() => setEditing('new')}>New programme</Button> : undefined}
      />
      {editing !== null && (
        <Card className="mb-4">
          <ProgrammeEditor key={editing === 'new' ? 'new' : editing.id} programme={editing === 'new' ? null : editing} onDone={() => setEditing(null)} />
        </Card>
      )}
      {programmes.isPending ? (
        <Loading label="Loading programmes…" />
      ) : programmes.isError ? (
        <QueryError error={programmes.error} what="The programmes" />
      ) : programmes.data.length === 0 ? (
        <p className="text-ink-muted">No programmes saved yet.</p>
      ) : (
        <ul className="flex flex-col gap-3" aria-label="Programmes">
          {programmes.data.map((p) => (
            <li key={p.id}>
              <Card className="flex flex-col gap-2">
                <h2 className="font-semibold">{p.name}</h2>
                <p className="text-sm text-ink-muted">
                  {p.chemistry.toUpperCase()} · {p.cellsInSeries} in series · protection {p.maxCurrentAmps} A{p.description ? ` · ${p.description}` : ''}
                </p>
                <ol className="list-decimal pl-5 text-sm">
                  {planSteps(p.steps).map((s) => (
                    <li key={s.index}>{s.label}</li>
                  ))}
                </ol>
                {canEdit && (
                  <div className="flex gap-2">
                    <Button variant="secondary" onClick={() => setEditing(p)}>
                      Change
                    </Button>
                    <Button variant="ghost" onClick={() => remove.mutate(p.id)} disabled={remove.isPending}>
                      Remove
                    </Button>
                  </div>
                )}
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
