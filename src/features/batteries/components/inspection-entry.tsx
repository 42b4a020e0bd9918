import { useState } from 'react';
import { INSPECTION_RATINGS, type InspectionEntry, type InspectionRating, type Photo } from '../../../../shared/schemas/inspection';
import { Button } from '../../../components/ui/button';
import { useRateItem } from '../api/pack-record';
import { PhotoDrop } from './photo-drop';
import { PhotoStrip } from './photo-strip';

/** Words and colours of the three ratings (our own: calm for good, loud only for a concern). */
export const RATING_LABEL: Record<InspectionRating, string> = { good: 'Good', acceptable: 'Acceptable', concern: 'Concern' };
const RATING_STYLE: Record<InspectionRating, string> = {
  good: 'border-tone-good text-tone-good',
  acceptable: 'border-tone-caution text-tone-caution',
  concern: 'border-tone-fault bg-tone-fault text-on-tone',
};

interface Props {
  batteryId: number;
  entry: InspectionEntry;
  canWrite: boolean;
  canDelete: (photo: Photo) => boolean;
  onDeletePhoto: (photo: Photo) => void;
}

/** One checklist item for one pack: its rating, note and photos. */
export function InspectionEntryRow({ batteryId, entry, canWrite, canDelete, onDeletePhoto }: Props) {
  const rate = useRateItem(batteryId);
  const [note, setNote] = useState(entry.note ?? '');
  const title = entry.item.title;
  const save = (rating: InspectionRating | null, text: string) => rate.mutate({ itemId: entry.item.id, rating, note: text.trim() || null });

  return (
    <li className="flex flex-col gap-3 border-t border-line py-4 first:border-t-0" aria-label={title}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="font-semibold">
          {title}
          {entry.item.archived && <span className="ml-2 text-xs text-ink-muted">(retired item)</span>}
        </h3>
        {canWrite && !entry.item.archived ? (
          <div role="group" aria-label={`Rating of ${title}`} className="flex flex-wrap gap-2">
            {INSPECTION_RATINGS.map((rating) => {
              const chosen = entry.rating === rating;
              return (
                <button
                  key={rating}
                  type="button"
                  aria-pressed={chosen}
                  disabled={rate.isPending}
                  onClick={() => save(chosen ? null : rating, note)}
                  className={`min-h-11 rounded-lg border-2 px-3 text-sm font-semibold ${chosen ? RATING_STYLE[rating] : 'border-line text-ink-muted'}`}
                >
                  {RATING_LABEL[rating]}
                </button>
              );
            })}
          </div>
        ) : (
          <span className={`rounded-lg border-2 px-3 py-1 text-sm font-semibold ${entry.rating ? RATING_STYLE[entry.rating] : 'border-line text-ink-muted'}`}>
            {entry.rating ? RATING_LABEL[entry.rating] : 'Not rated'}
          </span>
        )}
      </div>
      {canWrite && !entry.item.archived ? (
        <div className="flex flex-col gap-2 sm:flex-row sm:items-end">
          <label className="flex min-w-0 flex-1 flex-col gap-1 text-sm font-medium text-ink-muted">
            Note on {title.toLowerCase()}
            <textarea
              rows={2}
              value={note}
              onChange={(e) => setNote(e.target.value)}
              className="w-full rounded-lg border border-line bg-surface-sunken px-3 py-2 text-base text-ink focus:border-accent focus:outline-none"
            />
          </label>
          <Button variant="secondary" disabled={rate.isPending || note === (entry.note ?? '')} onClick={() => save(entry.rating, note)}>
            Save note
          </Button>
        </div>
      ) : (
        entry.note && <p className="whitespace-pre-wrap text-sm">{entry.note}</p>
      )}
      {rate.isError && (
        <p role="alert" className="text-sm font-medium text-state-cutoff">
          {rate.error instanceof Error ? rate.error.message : 'Not saved.'}
        </p>
      )}
      <PhotoStrip photos={entry.photos} canDelete={canDelete} onDelete={onDeletePhoto} />
      {canWrite && !entry.item.archived && <PhotoDrop batteryId={batteryId} itemId={entry.item.id} label={`Add photos: ${title.toLowerCase()}`} />}
    </li>
  );
}
