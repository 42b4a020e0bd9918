import { act, render, screen } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { usePrinting } from './use-printing';

function Probe() {
  return <p>{usePrinting() ? 'printing' : 'screen'}</p>;
}

describe('usePrinting', () => {
  it('turns true when the print media query starts matching, and back', () => {
    const listeners = new Set<() => void>();
    const query = {
      matches: false,
      addEventListener: (_type: string, l: () => void) => listeners.add(l),
      removeEventListener: (_type: string, l: () => void) => listeners.delete(l),
    };
    vi.stubGlobal('matchMedia', (q: string) => (q === 'print' ? query : { ...query, matches: false }));
    render(<Probe />);
    expect(screen.getByText('screen')).toBeTruthy();
    act(() => {
      query.matches = true;
      listeners.forEach((l) => l());
    });
    expect(screen.getByText('printing')).toBeTruthy();
    act(() => {
      query.matches = false;
      listeners.forEach((l) => l());
    });
    expect(screen.getByText('screen')).toBeTruthy();
  });
});
