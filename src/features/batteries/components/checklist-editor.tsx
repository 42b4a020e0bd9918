import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { Loading, QueryError } from '../../../components/ui/status';
import { useEditChecklist, useInspectionItems } from '../api/pack-record';

/** The lab's teardown checklist, for an admin: add, rename, reorder, retire or restore items. */
export function ChecklistEditor() {
  const items = useInspectionItems();
  const { add, patch } = useEditChecklist();
  const [title, setTitle] = useState('');
  const [drafts, setDrafts] = useState<Record<number, string>>({});
  if (items.isPending) return <Loading label="Loading the checklist…" />;
  if (items.isError) return <QueryError error={items.error} what="The checklist" />;
  const list = items.data;
  const error = add.error ?? patch.error;

  return (
    <div className="flex flex-col gap-3" aria-label="Edit the checklist">
      <ol className="flex flex-col gap-2">
        {list.map((item, index) => (
          <li key={item.id} className="flex flex-wrap items-end gap-2">
            <div className="min-w-0 flex-1">
              <TextField label={`Item ${index + 1}`} value={drafts[item.id] ?? item.title} onChange={(e) => setDrafts({ ...drafts, [item.id]: e.target.value })} disabled={item.archived} />
            </div>
            {drafts[item.id] !== undefined && drafts[item.id] !== item.title && (
              <Button variant="secondary" onClick={() => patch.mutate({ id: item.id, title: drafts[item.id]! })}>
                Rename
              </Button>
            )}
            <Button variant="ghost" aria-label={`Move ${item.title} up`} disabled={index === 0} onClick={() => {
              const above = list[index - 1]!;
              patch.mutate({ id: item.id, position: above.position });
              patch.mutate({ id: above.id, position: item.position });
            }}>
              ↑
            </Button>
            <Button variant="ghost" onClick={() => patch.mutate({ id: item.id, archived: !item.archived })}>
              {item.archived ? 'Restore' : 'Retire'}
            </Button>
          </li>
        ))}
      </ol>
      <form
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          if (title.trim()) add.mutate(title.trim(), { onSuccess: () => setTitle('') });
        }}
      >
        <div className="min-w-0 flex-1">
          <TextField label="New checklist item" value={title} onChange={(e) => setTitle(e.target.value)} />
        </div>
        <Button type="submit" disabled={add.isPending || !title.trim()}>
          Add item
        </Button>
      </form>
      {error && (
        <p role="alert" className="text-sm font-medium text-state-cutoff">
          {error instanceof Error ? error.message : 'Not saved.'}
        </p>
      )}
    </div>
  );
}
