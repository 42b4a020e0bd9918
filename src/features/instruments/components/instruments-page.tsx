import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { CalibrationState, Instrument } from '../../../../shared/schemas/instrument';
import { Button } from '../../../components/ui/button';
import { Card, PageHeader } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { benchesQueryOptions } from '../../../lib/queries/benches';
import { instrumentsQueryOptions } from '../../../lib/queries/instruments';
import { useDeleteInstrument, useUploadCertificate } from '../api/instruments';
import { InstrumentForm } from './instrument-form';

const KIND_LABEL: Record<Instrument['kind'], string> = { meter: 'Meter', load: 'Electronic load', supply: 'Supply or charger' };
const STATE_LABEL: Record<CalibrationState, string> = { 'in-date': 'In date', overdue: 'Overdue', 'not-recorded': 'No due date' };

function corrections(instrument: Instrument): string {
  const entries = Object.entries(instrument.channels);
  return entries.length === 0 ? 'none' : entries.map(([ch, c]) => `${ch} ×${c.gain} ${c.offset >= 0 ? '+' : '−'}${Math.abs(c.offset)}`).join(', ');
}

/** The lab's instruments and their calibration; admins edit, everyone else reads. */
export function InstrumentsPage({ canEdit }: { canEdit: boolean }) {
  const instruments = useQuery(instrumentsQueryOptions());
  const benches = useQuery(benchesQueryOptions());
  const remove = useDeleteInstrument();
  const upload = useUploadCertificate();
  const [editing, setEditing] = useState<Instrument | 'new' | null>(null);
  const benchName = (id: number | null) => (id === null ? 'On the shelf' : (benches.data?.find((b) => b.id === id)?.name ?? `Bench ${id}`));
  return (
    <>
      <PageHeader
        title="Instruments"
        subtitle="Meters, loads and chargers with their calibration. A meter's gain and offset correct its bench's readings as they arrive; the raw readings are kept."
        actions={canEdit && editing === null ? <Button onClick={() => setEditing('new')}>Add instrument</Button> : undefined}
      />
      {canEdit && editing !== null && (
        <Card className="mb-6 p-6">
          <InstrumentForm key={editing === 'new' ? 'new' : editing.id} instrument={editing === 'new' ? null : editing} onDone={() => setEditing(null)} />
        </Card>
      )}
      {(remove.isError || upload.isError) && (
        <p role="alert" className="mb-4 text-sm text-state-cutoff">
          {(remove.error ?? upload.error) instanceof Error ? (remove.error ?? upload.error)!.message : 'The change was not saved.'}
        </p>
      )}
      {instruments.isPending ? (
        <Loading />
      ) : instruments.isError ? (
        <QueryError error={instruments.error} what="Instruments" />
      ) : instruments.data.length === 0 ? (
        <p className="text-ink-muted">No instruments recorded yet.</p>
      ) : (
        <div className="overflow-x-auto rounded-xl border border-line">
          <table className="w-full text-left text-sm">
            <thead className="bg-surface-sunken text-ink-muted">
              <tr>
                <th className="px-3 py-3">Instrument</th>
                <th className="px-3 py-3">Bench</th>
                <th className="px-3 py-3">Calibration</th>
                <th className="px-3 py-3">Corrections</th>
                <th className="px-3 py-3">Certificate</th>
                {canEdit && <th className="px-3 py-3">Actions</th>}
              </tr>
            </thead>
            <tbody>
              {instruments.data.map((i) => (
                <tr key={i.id} className="border-t border-line bg-surface-raised align-top">
                  <td className="px-3 py-3">
                    <span className="font-semibold">{i.make} {i.model}</span>
                    <br />
                    {KIND_LABEL[i.kind]} · serial {i.serialNumber}
                  </td>
                  <td className="px-3 py-3">{benchName(i.benchId)}</td>
                  <td className={`px-3 py-3 ${i.calibration === 'overdue' ? 'font-semibold text-state-cutoff' : ''}`}>
                    {STATE_LABEL[i.calibration]}
                    {i.calibrationDueOn && <> · due {i.calibrationDueOn}</>}
                    {i.calibratedOn && <><br />calibrated {i.calibratedOn}</>}
                  </td>
                  <td className="px-3 py-3 font-mono">{corrections(i)}</td>
                  <td className="px-3 py-3">
                    {i.certificate ? <a className="underline" href={`/api/instruments/${i.id}/certificate`}>{i.certificate.fileName}</a> : 'none'}
                    {canEdit && (
                      <label className="mt-1 block text-xs text-ink-muted">
                        Upload certificate
                        <input
                          type="file"
                          accept="application/pdf,image/png,image/jpeg"
                          className="block min-h-11"
                          onChange={(e) => {
                            const file = e.target.files?.[0];
                            if (file) upload.mutate({ id: i.id, file });
                          }}
                        />
                      </label>
                    )}
                  </td>
                  {canEdit && (
                    <td className="px-3 py-3">
                      <div className="flex flex-wrap gap-2">
                        <Button variant="secondary" onClick={() => setEditing(i)}>
                          Edit
                        </Button>
                        <Button variant="ghost" disabled={remove.isPending} onClick={() => window.confirm(`Delete the record of ${i.make} ${i.model}?`) && remove.mutate(i.id)}>
                          Delete
                        </Button>
                      </div>
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}
