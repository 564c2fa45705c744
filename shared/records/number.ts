const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16];

/**
 * A decimal number written in text[a, b), with '.' or (decimalComma) ',' as the decimal mark and
 * an optional exponent; NaN for anything else (empty, "NaN", "---", "1.2.3", a thousands mark).
 *
 * Up to 15 significant digits without an exponent are read exactly: the digits as an integer
 * (< 2^53) divided by an exact power of ten is one correctly rounded IEEE division, so the result
 * equals Number() of the same text (Clinger's fast path). Anything longer goes through Number().
 */
export function parseDecimal(text: string, a: number, b: number, decimalComma: boolean): number {
  while (a < b && text.charCodeAt(a) === 32) a++;
  while (b > a && text.charCodeAt(b - 1) === 32) b--;
  if (a >= b) return NaN;
  const mark = decimalComma ? 44 : 46;
  let k = a;
  let c = text.charCodeAt(k);
  let negative = false;
  if (c === 45 || c === 43) {
    negative = c === 45;
    k++;
  }
  let mantissa = 0;
  let digits = 0;
  let fractionDigits = 0;
  for (; k < b; k++) {
    c = text.charCodeAt(k);
    if (c < 48 || c > 57) break;
    mantissa = mantissa * 10 + (c - 48);
    digits++;
  }
  if (k < b && c === mark) {
    k++;
    for (; k < b; k++) {
      c = text.charCodeAt(k);
      if (c < 48 || c > 57) break;
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      fractionDigits++;
    }
  }
  if (digits === 0) return NaN;
  if (k === b) {
    if (digits <= 15) {
      const v = fractionDigits === 0 ? mantissa : mantissa / POW10[fractionDigits];
      return negative ? -v : v;
    }
    return slowParse(text, a, b, decimalComma);
  }
  if (c !== 101 && c !== 69) return NaN;
  k++;
  if (k < b && (text.charCodeAt(k) === 43 || text.charCodeAt(k) === 45)) k++;
  const exponentStart = k;
  while (k < b && text.charCodeAt(k) >= 48 && text.charCodeAt(k) <= 57) k++;
  if (k !== b || k === exponentStart) return NaN;
  return slowParse(text, a, b, decimalComma);
}

function slowParse(text: string, a: number, b: number, decimalComma: boolean): number {
  const s = text.slice(a, b);
  return Number(decimalComma ? s.replace(',', '.') : s);
}

/** parseDecimal over a whole string. */
export function parseDecimalText(s: string, decimalComma = false): number {
  return parseDecimal(s, 0, s.length, decimalComma);
}
