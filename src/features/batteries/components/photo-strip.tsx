import type { Photo } from '../../../../shared/schemas/inspection';

/** Thumbnails of a pack's photos; each opens its web-size copy. The author or an admin may delete. */
export function PhotoStrip({ photos, canDelete, onDelete }: { photos: readonly Photo[]; canDelete: (photo: Photo) => boolean; onDelete: (photo: Photo) => void }) {
  if (photos.length === 0) return null;
  return (
    <ul className="flex flex-wrap gap-3" aria-label="Photos">
      {photos.map((photo) => (
        <li key={photo.id} className="flex w-36 flex-col gap-1">
          <a href={photo.urls.web} target="_blank" rel="noreferrer" className="block overflow-hidden rounded-lg border border-line bg-surface-sunken">
            <img src={photo.urls.thumb} alt={photo.fileName} loading="lazy" className="h-28 w-full object-cover" />
          </a>
          <span className="truncate text-xs text-ink-muted" title={photo.fileName}>
            {photo.fileName}
          </span>
          {canDelete(photo) && (
            <button type="button" onClick={() => onDelete(photo)} className="min-h-11 rounded-lg border border-line text-xs font-semibold" aria-label={`Delete photo ${photo.fileName}`}>
              Delete
            </button>
          )}
        </li>
      ))}
    </ul>
  );
}
