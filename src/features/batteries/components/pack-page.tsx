import { useQuery } from '@tanstack/react-query';
import { useMemo, useState, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { capacityTrend } from '../../../../shared/measure/capacity-trend';
import type { Photo } from '../../../../shared/schemas/inspection';
import { Button } from '../../../components/ui/button';
import { Card, PageHeader } from '../../../components/ui/card';
import { SafetyCautions } from '../../../components/ui/safety-cautions';
import { Loading, QueryError } from '../../../components/ui/status';
import { useLabSettings } from '../../../lib/lab-settings';
import { batteryQueryOptions } from '../../../lib/queries/batteries';
import { formatCharge, formatEnergy, formatPercent } from '../../../lib/units';
import { useDeletePhoto, useInspection, usePackRuns } from '../api/pack-record';
import { BatteryForm } from './battery-form';
import { CapacityTrendChart } from './capacity-trend-chart';
import { ChecklistEditor } from './checklist-editor';
import { InspectionEntryRow } from './inspection-entry';
import { PackRuns } from './pack-runs';
import { PackSpecs } from './pack-specs';
import { PhotoDrop } from './photo-drop';
import { PhotoStrip } from './photo-strip';
import { ProtectionRecord } from './protection-record';

/** Who is looking: what they may change. */
export interface PackViewer {
  userId: number;
  canWrite: boolean;
  isAdmin: boolean;
}

function Section({ title, children, actions }: { title: string; children: ReactNode; actions?: ReactNode }) {
  return (
    <Card className="flex min-w-0 flex-col gap-4 p-4 sm:p-6" role="region" aria-label={title}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 className="text-lg font-bold">{title}</h2>
        {actions}
      </div>
      {children}
    </Card>
  );
}

/** One pack's whole story: specs, runs and verdicts, capacity trend, protections, teardown, notes and photos. */
export function PackPage({ batteryId, viewer }: { batteryId: number; viewer: PackViewer }) {
  const battery = useQuery(batteryQueryOptions(batteryId));
  const runs = usePackRuns(batteryId);
  const inspection = useInspection(batteryId);
  const deletePhoto = useDeletePhoto(batteryId);
  const settings = useLabSettings();
  const [editing, setEditing] = useState(false);
  const [editingChecklist, setEditingChecklist] = useState(false);
  const pack = battery.data;
  const trend = useMemo(
    () => (pack && runs.data ? capacityTrend(runs.data.runs, { ratedAh: pack.ratedAh, ratedWh: pack.ratedWh }) : []),
    [pack, runs.data],
  );

  if (battery.isPending) return <Loading />;
  if (battery.isError) return <QueryError error={battery.error} what="This pack" />;
  const b = battery.data;
  const canDelete = (photo: Photo) => viewer.isAdmin || (viewer.canWrite && photo.createdBy === viewer.userId);
  const onDeletePhoto = (photo: Photo) => {
    if (window.confirm(`Delete the photo ${photo.fileName}? Its copies are removed from the lab's storage.`)) deletePhoto.mutate(photo.id);
  };

  return (
    <div className="flex min-w-0 flex-col gap-6">
      <PageHeader
        title={b.label}
        subtitle={<Link to="/batteries" className="text-accent hover:underline">All battery packs</Link>}
        actions={
          <div className="flex flex-wrap gap-2">
            {viewer.canWrite && !editing && <Button variant="secondary" onClick={() => setEditing(true)}>Edit pack</Button>}
            <a href={`/api/batteries/${b.id}/report.pdf`} className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold" download>
              Report PDF
            </a>
          </div>
        }
      />
      {editing && (
        <Card className="flex flex-col gap-4 p-6">
          <h2 className="text-lg font-bold">Edit {b.label}</h2>
          <BatteryForm battery={b} onDone={() => setEditing(false)} />
        </Card>
      )}

      <Section title="Specifications">
        <PackSpecs battery={b} />
      </Section>

      <Section title="Runs">
        {runs.isPending ? <Loading label="Loading runs…" /> : runs.isError ? <QueryError error={runs.error} what="Runs" /> : <PackRuns batteryId={b.id} runs={runs.data.runs} canWrite={viewer.canWrite} />}
      </Section>

      <Section title="Capacity over time">
        {trend.length === 0 ? (
          <p className="text-ink-muted">No finished capacity test yet: the trend starts with the first one.</p>
        ) : (
          <>
            <p className="text-sm text-ink-muted">
              Delivered charge and energy of each finished capacity test as a share of the rating ({formatCharge(b.ratedAh)}
              {b.ratedWh !== null && ` · ${formatEnergy(b.ratedWh, settings.energyUnit)}`}), in the order the tests were run.
            </p>
            <CapacityTrendChart points={trend} />
            <ol className="grid gap-1 text-sm" aria-label="Capacity by test">
              {trend.map((p, i) => (
                <li key={p.runId} className="num flex flex-wrap gap-x-3">
                  <span className="font-semibold">#{i + 1}</span>
                  <span className="min-w-0 truncate">{p.runName}</span>
                  <span>{formatCharge(p.deliveredAh)} ({formatPercent(p.percentRatedAh)})</span>
                  <span>{formatEnergy(p.deliveredWh, settings.energyUnit)} ({formatPercent(p.percentRatedWh)})</span>
                </li>
              ))}
            </ol>
          </>
        )}
      </Section>

      <Section title="Protection record">
        <ProtectionRecord batteryId={b.id} />
      </Section>

      <Section
        title="Teardown inspection"
        actions={viewer.isAdmin ? <Button variant="ghost" onClick={() => setEditingChecklist(!editingChecklist)}>{editingChecklist ? 'Done editing checklist' : 'Edit checklist'}</Button> : undefined}
      >
        {viewer.canWrite && <SafetyCautions compact />}
        {editingChecklist && <ChecklistEditor />}
        {inspection.isPending ? (
          <Loading label="Loading the inspection…" />
        ) : inspection.isError ? (
          <QueryError error={inspection.error} what="The inspection" />
        ) : (
          <ul className="flex flex-col">
            {inspection.data.entries.map((entry) => (
              <InspectionEntryRow
                key={`${entry.item.id}-${entry.updatedAt ?? ''}`}
                batteryId={b.id}
                entry={entry}
                canWrite={viewer.canWrite}
                canDelete={canDelete}
                onDeletePhoto={onDeletePhoto}
              />
            ))}
          </ul>
        )}
      </Section>

      <Section title="Notes and attachments">
        {b.notes ? <p className="whitespace-pre-wrap">{b.notes}</p> : <p className="text-ink-muted">No notes.</p>}
        {inspection.data && <PhotoStrip photos={inspection.data.otherPhotos} canDelete={canDelete} onDelete={onDeletePhoto} />}
        {viewer.canWrite && <PhotoDrop batteryId={b.id} itemId={null} label="Attach photos" />}
        {deletePhoto.isError && (
          <p role="alert" className="text-sm font-medium text-state-cutoff">
            {deletePhoto.error instanceof Error ? deletePhoto.error.message : 'The photo was not deleted.'}
          </p>
        )}
      </Section>
    </div>
  );
}
