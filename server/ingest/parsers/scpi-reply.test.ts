import { describe, expect, it } from 'vitest';
import { parseScpiNumber } from './scpi-reply.js';

describe('parseScpiNumber', () => {
  it('reads NR1, NR2 and NR3 numbers (IEEE 488.2 numeric response formats)', () => {
    expect(parseScpiNumber('12')).toEqual({ ok: true, value: 12 });
    expect(parseScpiNumber('-3.25\r')).toEqual({ ok: true, value: -3.25 });
    expect(parseScpiNumber('+1.23450E+01')).toEqual({ ok: true, value: 12.345 });
  });

  it('accepts a unit suffix', () => {
    expect(parseScpiNumber('13.21 V')).toEqual({ ok: true, value: 13.21 });
    expect(parseScpiNumber('2.5A')).toEqual({ ok: true, value: 2.5 });
  });

  it('rejects text, empty replies and the NaN / overload codes', () => {
    // 9.91E+37 is SCPI's NaN and 9.9E+37 its infinity (SCPI-1999 vol. 1, 7.2.1.5; from memory).
    expect(parseScpiNumber('')).toMatchObject({ ok: false });
    expect(parseScpiNumber('Kestrel Energy,KL-1,0,1.0')).toMatchObject({ ok: false });
    expect(parseScpiNumber('9.91E+37')).toEqual({ ok: false, reason: 'meter reports no reading (NaN)' });
    expect(parseScpiNumber('-9.9E37')).toEqual({ ok: false, reason: 'meter reports overload (infinity)' });
  });
});
