import { describe, expect, it } from 'vitest';
import { ColumnarRingBuffer } from './ring-buffer';

function ordered(buf: ColumnarRingBuffer): (number | null)[][] {
  const out = Array.from({ length: buf.columnCount }, () => [] as (number | null)[]);
  buf.copyOrdered(out);
  return out;
}

describe('ColumnarRingBuffer', () => {
  it('keeps rows in order before it is full', () => {
    const buf = new ColumnarRingBuffer(2, 4);
    buf.push([0, 12.8]);
    buf.push([1, 12.7]);
    expect(buf.length).toBe(2);
    expect(ordered(buf)).toEqual([
      [0, 1],
      [12.8, 12.7],
    ]);
  });

  it('overwrites the oldest rows when it wraps around and still reads oldest-first', () => {
    const buf = new ColumnarRingBuffer(2, 3);
    for (let t = 0; t < 7; t++) buf.push([t, t * 10]);
    expect(buf.length).toBe(3);
    expect(ordered(buf)).toEqual([
      [4, 5, 6],
      [40, 50, 60],
    ]);
    expect(buf.last(1)).toBe(60);
    expect(buf.at(0, 0)).toBe(4);
  });

  it('stores a gap as null so the chart breaks the line', () => {
    const buf = new ColumnarRingBuffer(2, 3);
    buf.push([0, 1]);
    buf.push([1, null]);
    expect(ordered(buf)[1]).toEqual([1, null]);
    expect(buf.last(1)).toBeNull();
  });

  it('reuses the output arrays instead of allocating new ones', () => {
    const buf = new ColumnarRingBuffer(1, 2);
    const out = [[] as (number | null)[]];
    const first = out[0];
    buf.push([1]);
    buf.push([2]);
    buf.push([3]);
    expect(buf.copyOrdered(out)).toBe(2);
    expect(out[0]).toBe(first);
    expect(first).toEqual([2, 3]);
  });

  it('clears without losing capacity and refuses nonsense sizes', () => {
    const buf = new ColumnarRingBuffer(1, 2);
    buf.push([5]);
    buf.clear();
    expect(buf.length).toBe(0);
    expect(buf.last(0)).toBeNull();
    expect(() => new ColumnarRingBuffer(1, 0)).toThrow(RangeError);
  });
});
