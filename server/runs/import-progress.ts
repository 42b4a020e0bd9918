import type { ImportProgress } from '../../shared/schemas/api-runs.js';

/** Imports followed at once; beyond, the oldest is forgotten (an import that never ends cannot grow the map). */
const MAX_FOLLOWED_IMPORTS = 256;

/**
 * How far each running import has got, kept in memory under the user's id and the id the
 * client chose, so a person's browser can poll its own import and nobody else's. An entry
 * lives from the start of processing to the answer.
 */
export class ImportProgressBoard {
  private readonly entries = new Map<string, ImportProgress>();

  /** Records progress (the newest entry is kept last, for the bound). */
  set(userId: number, progressId: string, progress: ImportProgress): void {
    const key = `${userId}:${progressId}`;
    this.entries.delete(key);
    this.entries.set(key, progress);
    if (this.entries.size > MAX_FOLLOWED_IMPORTS) this.entries.delete(this.entries.keys().next().value!);
  }

  /** The progress of one of the user's imports, or null when none runs under that id. */
  get(userId: number, progressId: string): ImportProgress | null {
    return this.entries.get(`${userId}:${progressId}`) ?? null;
  }

  /** Forgets an import that answered. */
  delete(userId: number, progressId: string): void {
    this.entries.delete(`${userId}:${progressId}`);
  }
}
