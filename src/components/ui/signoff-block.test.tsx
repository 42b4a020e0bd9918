import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { SignoffEntry } from '../../../shared/schemas/signoff';
import { SignoffBlockView } from './signoff-block';

const entry = (id: number, state: SignoffEntry['state'], comment: string): SignoffEntry => ({
  id, runId: 1, action: 'signed', comment, contentHash: 'a'.repeat(64), byId: 1, byName: 'Ines Okafor', byRole: 'admin', at: `2026-0${id}-01T12:00:00.000Z`, state,
});

describe('SignoffBlockView', () => {
  it('shows the signature that holds and lists the earlier ones as no longer holding', () => {
    render(<SignoffBlockView block={{ status: 'signed', signed: entry(2, 'current', 'Second look'), earlier: [entry(1, 'superseded', 'First look')] }} formatTime={(iso) => iso.slice(0, 10)} />);
    expect(screen.getByText('Signed off.')).toBeTruthy();
    expect(screen.getByText('Second look')).toBeTruthy();
    const earlier = screen.getByRole('list', { name: 'Earlier sign-offs' });
    expect(within(earlier).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['Ines Okafor, 2026-01-01, no longer holds: First look']);
  });

  it('lists nothing earlier when there is nothing earlier', () => {
    render(<SignoffBlockView block={{ status: 'none', signed: null }} formatTime={(iso) => iso} />);
    expect(screen.queryByRole('list', { name: 'Earlier sign-offs' })).toBeNull();
  });
});
