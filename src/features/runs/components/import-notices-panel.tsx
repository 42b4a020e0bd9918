import { useState } from 'react';
import { useLocation } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';

/** The import's notices, when the import form sent them along with the navigation. */
function noticesFromState(state: unknown): string[] {
  const notices = (state as { importNotices?: unknown } | null)?.importNotices;
  return Array.isArray(notices) ? notices.filter((n): n is string => typeof n === 'string') : [];
}

/** What the importer decided or assumed for the file just imported (shown once, after the import). */
export function ImportNoticesPanel() {
  const location = useLocation();
  const [dismissed, setDismissed] = useState(false);
  const notices = noticesFromState(location.state);
  if (dismissed || notices.length === 0) return null;
  return (
    <Card className="print:hidden" role="region" aria-label="How the file was read">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h2 className="text-base font-semibold">How the file was read</h2>
        <Button variant="ghost" onClick={() => setDismissed(true)}>
          Dismiss
        </Button>
      </div>
      <ul className="mt-2 list-disc pl-5 text-sm text-ink-muted">
        {notices.map((n) => (
          <li key={n}>{n}</li>
        ))}
      </ul>
    </Card>
  );
}
