// Text detection and decoding: byte-order marks first (Unicode Standard §23.8), then strict
// UTF-8, then chardet's statistical guess decoded with iconv-lite.
import chardet from 'chardet';
import iconv from 'iconv-lite';

export interface DecodedText {
  text: string;
  charset: string;
}

const utf8Strict = new TextDecoder('utf-8', { fatal: true });

function bomCharset(bytes: Buffer): { charset: string; skip: number } | null {
  if (bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf)
    return { charset: 'UTF-8', skip: 3 };
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe)
    return { charset: 'UTF-16LE', skip: 2 };
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff)
    return { charset: 'UTF-16BE', skip: 2 };
  return null;
}

/**
 * The text when `bytes` is valid UTF-8, allowing a multi-byte sequence cut at the end (the
 * caller may pass only the head of a file).
 */
function asUtf8(bytes: Buffer, truncated: boolean): string | null {
  let end = bytes.length;
  if (truncated) {
    // Drop up to 3 trailing bytes of an incomplete sequence (RFC 3629 §3).
    let back = 0;
    while (back < 3 && end - back - 1 >= 0 && (bytes[end - back - 1] & 0xc0) === 0x80) back += 1;
    const lead = end - back - 1;
    if (lead >= 0 && bytes[lead] >= 0xc0) {
      const need = bytes[lead] >= 0xf0 ? 4 : bytes[lead] >= 0xe0 ? 3 : 2;
      if (back + 1 < need) end = lead;
    }
  }
  try {
    return utf8Strict.decode(bytes.subarray(0, end));
  } catch {
    return null;
  }
}

/** Share of characters that are control characters other than tab, CR, LF and form feed. */
function controlShare(text: string): number {
  if (text.length === 0) return 0;
  let bad = 0;
  for (let i = 0; i < text.length; i += 1) {
    const c = text.charCodeAt(i);
    if (
      (c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d && c !== 0x0c) ||
      c === 0x7f ||
      c === 0xfffd
    )
      bad += 1;
  }
  return bad / text.length;
}

/** Above this share of control characters the bytes are treated as binary (common practice). */
const MAX_CONTROL_SHARE = 0.02;

/** Finds the charset of `bytes` if they look like text, else null. `truncated` = a file's head only. */
export function detectTextCharset(bytes: Buffer, truncated = false): string | null {
  if (bytes.length === 0) return null;
  const bom = bomCharset(bytes);
  if (bom) {
    const body = bytes.subarray(
      bom.skip,
      truncated ? bom.skip + ((bytes.length - bom.skip) & ~1) : bytes.length,
    );
    return controlShare(iconv.decode(body, bom.charset)) <= MAX_CONTROL_SHARE ? bom.charset : null;
  }
  // NUL bytes do not occur in text written in a single-byte charset or UTF-8.
  if (bytes.includes(0)) return null;
  const utf8 = asUtf8(bytes, truncated);
  if (utf8 !== null) return controlShare(utf8) <= MAX_CONTROL_SHARE ? 'UTF-8' : null;
  const guess = chardet.detect(bytes);
  const charset =
    guess && iconv.encodingExists(guess) && !/^UTF-(16|32)/i.test(guess) ? guess : 'windows-1252';
  return controlShare(iconv.decode(bytes, charset)) <= MAX_CONTROL_SHARE ? charset : null;
}

/** Decodes a whole text file, stripping any byte-order mark. */
export function decodeText(bytes: Buffer, charset?: string): DecodedText {
  const bom = bomCharset(bytes);
  if (bom)
    return {
      text: iconv.decode(bytes.subarray(bom.skip), bom.charset, { stripBOM: true }),
      charset: bom.charset,
    };
  const found = charset ?? detectTextCharset(bytes) ?? 'UTF-8';
  return { text: iconv.decode(bytes, found, { stripBOM: true }), charset: found };
}
