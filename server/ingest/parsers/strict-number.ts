/** Exact powers of ten: 10^k is a double without rounding up to k = 22. */
const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);
/** Digits a mantissa may have and still be an exact integer double (below 2^53). */
const MAX_EXACT_DIGITS = 15;
const DECIMAL_BASE = 10;
const CODE_0 = 48;
const CODE_9 = 57;
const CODE_DOT = 46;
const CODE_COMMA = 44;
const CODE_MINUS = 45;
const CODE_PLUS = 43;
const CODE_E_LOWER = 101;
const CODE_E_UPPER = 69;

/**
 * Reads the decimal number written in `text[start, end)` strictly: an optional sign, digits
 * with at most one decimal point (`12`, `12.`, `.5`, `12.50`), an optional exponent
 * (`e-3`), nothing else (no blanks, hex, `Infinity`, thousands marks); NaN otherwise and for
 * a number too large to be finite. With `decimalComma` a comma may stand for the point.
 * Plain numbers of up to 15 digits are read without allocating: the mantissa and 10^k are
 * then exact doubles, so one division is correctly rounded and equals `Number(text)`
 * (Clinger's fast path); longer ones and exponents go to `Number()` on the checked text.
 */
export function readDecimal(text: string, start: number, end: number, decimalComma = false): number {
  let i = start;
  let negative = false;
  let c = i < end ? text.charCodeAt(i) : -1;
  if (c === CODE_MINUS || c === CODE_PLUS) {
    negative = c === CODE_MINUS;
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let pointAt = -1;
  let commaAt = -1;
  for (; i < end; i++) {
    c = text.charCodeAt(i);
    if (c >= CODE_0 && c <= CODE_9) {
      mantissa = mantissa * DECIMAL_BASE + (c - CODE_0);
      digits++;
    } else if (pointAt < 0 && (c === CODE_DOT || (decimalComma && c === CODE_COMMA))) {
      pointAt = digits;
      if (c === CODE_COMMA) commaAt = i;
    } else break;
  }
  if (digits === 0) return Number.NaN;
  if (i === end) {
    if (digits <= MAX_EXACT_DIGITS) {
      const value = pointAt < 0 || pointAt === digits ? mantissa : mantissa / POW10[digits - pointAt]!;
      return negative ? -value : value;
    }
    return slowNumber(text, start, end, commaAt);
  }
  // Only an exponent may follow: [eE][+-]?digits to the end.
  if (c !== CODE_E_LOWER && c !== CODE_E_UPPER) return Number.NaN;
  i++;
  c = i < end ? text.charCodeAt(i) : -1;
  if (c === CODE_MINUS || c === CODE_PLUS) i++;
  if (i >= end) return Number.NaN;
  for (; i < end; i++) {
    c = text.charCodeAt(i);
    if (c < CODE_0 || c > CODE_9) return Number.NaN;
  }
  return slowNumber(text, start, end, commaAt);
}

/** The checked text through Number(), a decimal comma made a point; NaN when not finite. */
function slowNumber(text: string, start: number, end: number, commaAt: number): number {
  const slice = commaAt < 0 ? text.slice(start, end) : `${text.slice(start, commaAt)}.${text.slice(commaAt + 1, end)}`;
  const value = Number(slice);
  return Number.isFinite(value) ? value : Number.NaN;
}
