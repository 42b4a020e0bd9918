import { describe, expect, it } from 'vitest';
import type { SignoffEntry } from '../../shared/schemas/signoff.js';
import { signoffLines } from './signoff-lines.js';

const entry = (id: number, action: SignoffEntry['action'], state: SignoffEntry['state'], at: string, comment: string): SignoffEntry => ({
  id, runId: 1, action, comment, contentHash: String(id).repeat(64).slice(0, 64), byId: 1, byName: 'Ines Okafor', byRole: 'admin', at, state,
});

describe('the report\'s sign-off block', () => {
  it('says "not signed off" with no history, and when only marked ready', () => {
    expect(signoffLines({ status: 'none', entries: [] }, 'UTC')).toEqual({ state: 'Not signed off.', signed: [], earlier: [] });
    const ready = signoffLines({ status: 'ready', entries: [entry(1, 'ready', 'current', '2026-07-01T12:00:00.000Z', '')] }, 'UTC');
    expect(ready.state).toMatch(/^Not signed off: marked ready/);
    expect(ready.signed).toEqual([]);
  });

  it('prints the holding signature in the lab\'s zone and lists the earlier one (Europe/Berlin is UTC+2 in July, UTC+1 in January: IANA tz database)', () => {
    const entries = [
      entry(4, 'signed', 'current', '2026-07-01T12:00:00.000Z', 'Second look'),
      entry(3, 'ready', 'superseded', '2026-07-01T11:00:00.000Z', ''),
      entry(2, 'signed', 'superseded', '2026-01-15T09:30:00.000Z', 'First look'),
      entry(1, 'ready', 'superseded', '2026-01-15T09:00:00.000Z', ''),
    ];
    const lines = signoffLines({ status: 'signed', entries }, 'Europe/Berlin');
    expect(lines.state).toBe('Signed: the figures below are the ones signed off.');
    expect(lines.signed).toEqual(['Signed by Ines Okafor (admin), 2026-07-01 14:00 (Europe/Berlin)', 'Comment: Second look', `Frozen figures: SHA-256 ${'4'.repeat(64)}`]);
    expect(lines.earlier).toEqual(['Signed by Ines Okafor (admin), 2026-01-15 10:30 (Europe/Berlin), no longer holds. Comment: First look']);
  });

  it('says the figures changed since sign-off and keeps the signature that no longer holds in the list', () => {
    const lines = signoffLines({ status: 'superseded', entries: [entry(2, 'signed', 'superseded', '2026-07-01T12:00:00.000Z', 'Looked fine')] }, 'UTC');
    expect(lines.state).toMatch(/^Changed since sign-off, needs a new sign-off/);
    expect(lines.signed).toEqual([]);
    expect(lines.earlier).toEqual(['Signed by Ines Okafor (admin), 2026-07-01 12:00 (UTC), no longer holds. Comment: Looked fine']);
  });
});
