import { useState, type FormEvent } from 'react';
import type { Run } from '../../../../shared/schemas/run';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { usePatchRun } from '../api/patch-run';

/** Splits "lfp, acceptance ,  2025" into clean tags. */
export function parseTags(text: string): string[] {
  return [...new Set(text.split(',').map((t) => t.trim()).filter(Boolean))];
}

/** Rename and retag a run so it can be found months later (technicians). */
export function RunLabelEditor({ run, onDone }: { run: Run; onDone: () => void }) {
  const patch = usePatchRun(run.id);
  const [name, setName] = useState(run.name);
  const [tags, setTags] = useState(run.tags.join(', '));
  const submit = (e: FormEvent) => {
    e.preventDefault();
    patch.mutate({ name: name.trim(), tags: parseTags(tags) }, { onSuccess: onDone });
  };
  return (
    <form onSubmit={submit} aria-label="Name and tags" className="grid gap-3 md:grid-cols-[2fr_2fr_auto] md:items-end">
      <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} />
      <TextField label="Tags (comma-separated)" value={tags} onChange={(e) => setTags(e.target.value)} placeholder="lfp, acceptance, kestrel" />
      <div className="flex gap-2">
        <Button type="submit" disabled={patch.isPending || !name.trim()}>
          Save
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
      {patch.isError && (
        <p role="alert" className="text-sm text-state-cutoff md:col-span-3">
          {patch.error instanceof Error ? patch.error.message : 'Not saved.'}
        </p>
      )}
    </form>
  );
}
