import type { ReviewStatus, SignoffEntry } from '../../shared/schemas/signoff.js';
import type { StoredSignoff } from './signoff-repo.js';

/** A run's review history judged against the run as it is now. */
export interface ReviewState {
  status: ReviewStatus;
  /** Newest first, each marked current or superseded. */
  entries: SignoffEntry[];
  /** The sign-off that still holds, if any. */
  signed: SignoffEntry | null;
}

/**
 * Judges a history (oldest first) against the run's current content hash. A sign-off holds
 * while it is the latest one and the run still hashes the same; a ready mark holds while no
 * sign-off followed it, no newer mark replaced it and the run is unchanged. Anything else is
 * superseded, and a run signed once but changed since is `superseded` until signed again.
 * `legacyHash` is the hash of the same content in the spelling of entries frozen before a
 * rename of the snapshot's keys; such an entry holds as well.
 */
export function reviewState(history: StoredSignoff[], currentHash: string, legacyHash: string = currentHash): ReviewState {
  const lastIndex = (action: StoredSignoff['action']) => history.findLastIndex((e) => e.action === action);
  const signedAt = lastIndex('signed');
  const readyAt = lastIndex('ready');
  const holds = (index: number) => {
    const entry = history[index]!;
    if (entry.contentHash !== currentHash && entry.contentHash !== legacyHash) return false;
    return entry.action === 'signed' ? index === signedAt : index === readyAt && readyAt > signedAt;
  };
  const entries: SignoffEntry[] = history.map((e, i) => ({ ...e, state: holds(i) ? 'current' : 'superseded' }));
  const signed = signedAt >= 0 && holds(signedAt) ? entries[signedAt]! : null;
  const ready = readyAt >= 0 && holds(readyAt);
  const status: ReviewStatus = signed ? 'signed' : ready ? 'ready' : signedAt >= 0 ? 'superseded' : 'none';
  return { status, entries: entries.reverse(), signed };
}
