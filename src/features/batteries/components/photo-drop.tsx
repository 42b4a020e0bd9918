import { useQueryClient } from '@tanstack/react-query';
import { useId, useState, type DragEvent } from 'react';
import { queryKeys } from '../../../lib/queries/query-keys';
import { uploadPhoto } from '../api/upload-photo';

/** What the server accepts (it judges the content; this only filters the file picker). */
const ACCEPT = 'image/jpeg,image/png,image/webp';
const PERCENT = 100;

interface Upload {
  key: string;
  name: string;
  fraction: number;
  error: string | null;
}

/**
 * Drop photos here (or pick them): each uploads on its own with a progress bar; a refused
 * file says why and the others carry on.
 */
export function PhotoDrop({ batteryId, itemId, label }: { batteryId: number; itemId: number | null; label: string }) {
  const inputId = useId();
  const queryClient = useQueryClient();
  const [uploads, setUploads] = useState<Upload[]>([]);
  const [over, setOver] = useState(false);
  const update = (key: string, change: Partial<Upload>) => setUploads((list) => list.map((u) => (u.key === key ? { ...u, ...change } : u)));

  const send = async (files: readonly File[]) => {
    const started = files.map((file, i) => ({ file, key: `${Date.now()}-${i}-${file.name}` }));
    setUploads((list) => [...list.filter((u) => u.error !== null || u.fraction < 1), ...started.map(({ file, key }) => ({ key, name: file.name, fraction: 0, error: null }))]);
    for (const { file, key } of started) {
      try {
        await uploadPhoto(batteryId, file, itemId, (fraction) => update(key, { fraction }));
        update(key, { fraction: 1 });
        setUploads((list) => list.filter((u) => u.key !== key));
      } catch (error) {
        update(key, { error: error instanceof Error ? error.message : 'Upload failed.' });
      }
      await queryClient.invalidateQueries({ queryKey: queryKeys.batteries.inspection(batteryId) });
    }
  };

  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setOver(false);
    void send(Array.from(e.dataTransfer.files));
  };

  return (
    <div className="flex flex-col gap-2">
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={onDrop}
        data-testid="photo-drop"
        className={`flex min-h-14 flex-wrap items-center gap-3 rounded-lg border-2 border-dashed px-3 py-2 text-sm ${over ? 'border-accent bg-surface-sunken' : 'border-line'}`}
      >
        {/* The input covers its label (transparent), so the whole button is the touch target. */}
        <label htmlFor={inputId} className="relative inline-flex min-h-11 cursor-pointer items-center rounded-lg border border-line bg-surface-raised px-3 font-semibold focus-within:ring-2 focus-within:ring-accent">
          {label}
          <input
            id={inputId}
            type="file"
            accept={ACCEPT}
            multiple
            className="absolute inset-0 h-full w-full cursor-pointer opacity-0"
            onChange={(e) => {
              const files = Array.from(e.target.files ?? []);
              e.target.value = '';
              void send(files);
            }}
          />
        </label>
        <span className="text-ink-muted">or drop JPEG, PNG or WebP photos here (20 MB each at most)</span>
      </div>
      {uploads.map((u) => (
        <div key={u.key} className="flex flex-col gap-1 text-sm">
          <span className="truncate">{u.name}</span>
          {u.error === null ? (
            <progress max={PERCENT} value={Math.round(u.fraction * PERCENT)} aria-label={`Uploading ${u.name}`} className="h-2 w-full" />
          ) : (
            <p role="alert" className="font-medium text-state-cutoff">
              {u.name}: {u.error}
            </p>
          )}
        </div>
      ))}
    </div>
  );
}
