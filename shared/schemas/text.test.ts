import { describe, expect, it } from 'vitest';
import { labelText, noteText } from './text.js';

describe('labelText', () => {
  const label = labelText(20);
  it('accepts ordinary labels, accents and symbols, trimmed', () => {
    expect(label.parse('  Pack A-12 ')).toBe('Pack A-12');
    expect(label.parse('Zelle Ø18 µΩ °C')).toBe('Zelle Ø18 µΩ °C');
  });
  for (const [what, value] of [
    ['NUL only', '\u0000'],
    ['NULs around spaces', '\u0000 \u0000'],
    ['a NUL inside', 'Pack\u0000A'],
    ['an escape sequence', '\u001b[31mred'],
    ['a line break', 'two\nlines'],
    ['DEL', 'x\u007F'],
    ['a C1 control', 'x\u0085'],
    ['zero-width characters only', '\u200B\u200B'],
    ['blank', '   '],
  ] as const) {
    it(`refuses ${what}`, () => expect(label.safeParse(value).success).toBe(false));
  }
});

describe('noteText', () => {
  it('keeps line breaks and tabs but refuses NUL and escapes', () => {
    expect(noteText(100).parse('line one\n\tline two')).toBe('line one\n\tline two');
    expect(noteText(100).safeParse('note\u0000').success).toBe(false);
    expect(noteText(100).safeParse('\u001b[2J').success).toBe(false);
  });
  it('with a minimum, refuses text with nothing visible', () => {
    expect(noteText(100, 1).safeParse('\u200B').success).toBe(false);
    expect(noteText(100).parse('')).toBe('');
  });
});
