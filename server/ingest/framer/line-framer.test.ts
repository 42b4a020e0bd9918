import { describe, expect, it } from 'vitest';
import { LineFramer } from './line-framer.js';

describe('LineFramer', () => {
  it('joins lines split across chunks and strips CR LF', () => {
    const framer = new LineFramer();
    expect(framer.push('12.1,3.0\r\n12.')).toEqual(['12.1,3.0']);
    expect(framer.push('0,2.9\n')).toEqual(['12.0,2.9']);
  });

  it('returns several lines from one chunk and skips blank ones', () => {
    const framer = new LineFramer();
    expect(framer.push(Buffer.from('a\n\nb\r\nc\n'))).toEqual(['a', 'b', 'c']);
  });

  it('drops and counts an over-long line without gluing its neighbours', () => {
    const framer = new LineFramer(16);
    const out = [
      ...framer.push('good,1\n'),
      ...framer.push('x'.repeat(10)),
      ...framer.push('x'.repeat(10)),
      ...framer.push('x'.repeat(10) + '\nafter,2\n'),
    ];
    expect(out).toEqual(['good,1', 'after,2']);
    expect(framer.droppedLines).toBe(1);
  });

  it('drops a complete over-long line arriving in one chunk', () => {
    const framer = new LineFramer(8);
    expect(framer.push('123456789012\nok\n')).toEqual(['ok']);
    expect(framer.droppedLines).toBe(1);
  });

  it('reset forgets a partial line', () => {
    const framer = new LineFramer();
    framer.push('tail-of-old');
    framer.reset();
    expect(framer.push('new\n')).toEqual(['new']);
  });
});
