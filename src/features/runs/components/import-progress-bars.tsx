import type { ImportRunProgress } from '../api/import-run';

const PERCENT = 100;

/** Rows as a person reads them: 412,000. */
const rowsText = (rows: number) => rows.toLocaleString('en-US');

/**
 * The progress of a large import: the file's upload (the browser's own count), then the
 * server's two passes over it (every row checked, then imported), from the rows it reports.
 */
export function ImportProgressBars({ progress, fileName }: { progress: ImportRunProgress; fileName: string }) {
  const { uploadedFraction, server } = progress;
  const importing = server?.phase === 'importing' && server.totalRows !== null && server.totalRows > 0;
  return (
    <div className="flex flex-col gap-2 md:col-span-2" aria-live="polite">
      <label className="flex flex-col gap-1 text-sm text-ink-muted">
        <span>Uploading {fileName}: {Math.round(uploadedFraction * PERCENT)} %</span>
        <progress max={PERCENT} value={Math.round(uploadedFraction * PERCENT)} aria-label={`Uploading ${fileName}`} className="h-2 w-full" />
      </label>
      {uploadedFraction >= 1 && (
        <label className="flex flex-col gap-1 text-sm text-ink-muted">
          <span className="num">
            {server === null
              ? 'Uploaded; the server is starting on it…'
              : importing
                ? `Importing: ${rowsText(server.rows)} of ${rowsText(server.totalRows!)} rows`
                : `Checking every row: ${rowsText(server.rows)} so far`}
          </span>
          {/* Checking has no known end yet: an indeterminate bar (no value) until the total is known. */}
          {importing ? (
            <progress max={server.totalRows!} value={server.rows} aria-label="Importing rows" className="h-2 w-full" />
          ) : (
            <progress aria-label="Checking rows" className="h-2 w-full" />
          )}
        </label>
      )}
    </div>
  );
}
