import { describe, expect, it } from 'vitest';
import { displayFileName } from './photo-name.js';

describe('displayFileName', () => {
  it('drops folder parts of either separator and leading dots', () => {
    expect(displayFileName('../../etc/passwd.jpg')).toBe('passwd.jpg');
    expect(displayFileName('C:\\Users\\lab\\board.png')).toBe('board.png');
    expect(displayFileName('..')).toBe('photo');
    expect(displayFileName('.hidden.webp')).toBe('hidden.webp');
  });

  it('drops control characters and falls back when nothing is left', () => {
    expect(displayFileName('we\u0000ld\n.jpg')).toBe('weld.jpg');
    expect(displayFileName(undefined)).toBe('photo');
    expect(displayFileName('x'.repeat(300)).length).toBe(200);
  });
});
