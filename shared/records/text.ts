import { RecordFileError } from './errors';

export type TextEncodingName = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

export interface DecodedText {
  text: string;
  encoding: TextEncodingName;
}

/** How much of the start of a file is inspected for binary content. */
const SNIFF_BYTES = 64 * 1024;

function looksBinary(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, SNIFF_BYTES);
  let control = 0;
  for (let i = 0; i < n; i++) {
    const b = bytes[i];
    if (b === 0) return true;
    // Control characters other than tab, line feed, form feed and carriage return.
    if (b < 32 && b !== 9 && b !== 10 && b !== 12 && b !== 13) control++;
  }
  return control > n / 100;
}

/**
 * Turns an uploaded file into text. Logger software writes UTF-8, UTF-16 with a byte-order mark
 * ("Unicode text" from a spreadsheet) or a Windows code page (a degree sign as byte 0xB0); a file
 * with NUL bytes or many control characters is not a text export at all.
 */
/**
 * The encoding a file announces (a UTF-16 byte-order mark) or is taken to have (UTF-8, its own
 * mark skipped), after refusing an empty or binary file. Reads only the first bytes.
 */
export function sniffEncoding(bytes: Uint8Array, field = 'file'): { encoding: 'utf-8' | 'utf-16le' | 'utf-16be'; bomLength: number } {
  if (bytes.length === 0) throw new RecordFileError(field, 'is empty (0 bytes)');
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) return { encoding: 'utf-16le', bomLength: 2 };
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) return { encoding: 'utf-16be', bomLength: 2 };
  if (looksBinary(bytes)) {
    throw new RecordFileError(field, 'is not a text file (it contains binary data); export the logger data as CSV or text');
  }
  const bom = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
  return { encoding: 'utf-8', bomLength: bom ? 3 : 0 };
}

export function decodeRecordFile(bytes: Uint8Array, field = 'file'): DecodedText {
  const sniffed = sniffEncoding(bytes, field);
  let encoding: TextEncodingName = sniffed.encoding;
  const body = bytes.subarray(sniffed.bomLength);
  let text: string;
  try {
    text = new TextDecoder(encoding, { fatal: true }).decode(body);
  } catch {
    if (encoding !== 'utf-8') throw new RecordFileError(field, `is not valid ${encoding.toUpperCase()} text`);
    encoding = 'windows-1252';
    text = new TextDecoder(encoding).decode(body);
  }
  if (encoding !== 'utf-8' && text.includes('\u0000')) {
    throw new RecordFileError(field, 'is not a text file (it contains binary data); export the logger data as CSV or text');
  }
  // Classic Mac line ends: a file with carriage returns and no line feeds.
  if (text.indexOf('\n') < 0 && text.indexOf('\r') >= 0) text = text.replace(/\r/g, '\n');
  if (text.trim() === '') throw new RecordFileError(field, 'holds no readings (only blank lines)');
  return { text, encoding };
}
