import { render } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { MonoNumbers } from './mono-numbers';

describe('MonoNumbers', () => {
  it('wraps each number with its unit, and leaves the words alone', () => {
    const { container } = render(<MonoNumbers text="Cutoff at 10.64 V after 1,198.1 Wh, 93.29 Ah at -4.5 °C" />);
    const mono = [...container.querySelectorAll('.num')].map((e) => e.textContent);
    expect(mono).toEqual(['10.64 V', '1,198.1 Wh', '93.29 Ah', '-4.5 °C']);
    expect(container.textContent).toBe('Cutoff at 10.64 V after 1,198.1 Wh, 93.29 Ah at -4.5 °C');
  });

  it('does not take the start of a word for a unit', () => {
    const { container } = render(<MonoNumbers text="2 Amps rated, 3 Ways" />);
    expect([...container.querySelectorAll('.num')].map((e) => e.textContent)).toEqual(['2', '3']);
  });
});
