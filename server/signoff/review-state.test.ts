import { describe, expect, it } from 'vitest';
import { reviewState } from './review-state.js';
import type { StoredSignoff } from './signoff-repo.js';

const A = 'a'.repeat(64);
const B = 'b'.repeat(64);
let nextId = 1;
const entry = (action: StoredSignoff['action'], contentHash: string): StoredSignoff => ({
  id: nextId++, runId: 1, action, comment: '', contentHash, byId: 1, byName: 'x', byRole: 'admin', at: '2026-01-01T00:00:00.000Z',
});

describe('review state of a run', () => {
  it('is none with no history', () => {
    expect(reviewState([], A)).toMatchObject({ status: 'none', entries: [], signed: null });
  });

  it('is ready after a mark on the unchanged run, and none again once the run changed', () => {
    const history = [entry('ready', A)];
    expect(reviewState(history, A).status).toBe('ready');
    const changed = reviewState(history, B);
    expect(changed.status).toBe('none');
    expect(changed.entries[0]!.state).toBe('superseded');
  });

  it('is signed while the run hashes as signed; the mark before it is superseded', () => {
    const state = reviewState([entry('ready', A), entry('signed', A)], A);
    expect(state.status).toBe('signed');
    expect(state.signed?.action).toBe('signed');
    expect(state.entries.map((e) => [e.action, e.state])).toEqual([['signed', 'current'], ['ready', 'superseded']]);
  });

  it('is superseded once a signed run changes, ready when marked again, signed again with both sign-offs kept', () => {
    const history = [entry('ready', A), entry('signed', A)];
    expect(reviewState(history, B)).toMatchObject({ status: 'superseded', signed: null });
    history.push(entry('ready', B));
    expect(reviewState(history, B).status).toBe('ready');
    history.push(entry('signed', B));
    const state = reviewState(history, B);
    expect(state.status).toBe('signed');
    expect(state.entries.filter((e) => e.action === 'signed').map((e) => [e.contentHash, e.state])).toEqual([[B, 'current'], [A, 'superseded']]);
  });

  it('does not revive an older sign-off when the run returns to the content it once had', () => {
    // Signed at A, re-signed at B; content back at A: the newer B sign-off no longer holds, the old one stays superseded.
    const state = reviewState([entry('signed', A), entry('signed', B)], A);
    expect(state.status).toBe('superseded');
    expect(state.entries.every((e) => e.state === 'superseded')).toBe(true);
  });

  it('holds a sign-off frozen in the spelling before a rename while the same content hashes so', () => {
    // A = the run now, B = the same run in the old spelling (what the entry froze).
    const history = [entry('ready', B), entry('signed', B)];
    expect(reviewState(history, A, B)).toMatchObject({ status: 'signed', signed: { contentHash: B } });
    // Without the old spelling's hash it would look changed.
    expect(reviewState(history, A).status).toBe('superseded');
  });
});
