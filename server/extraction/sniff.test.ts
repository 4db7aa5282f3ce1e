// Content-based type detection and charset detection.
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeDocx, makeEml, makeHtml, makePdf, makeText, makeZip } from '../../corpus-demo/render';
import { decodeText, detectTextCharset } from './charset';
import { looksLikeEmail, sniffFile } from './sniff';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(path.join(tmpdir(), 'quarry-sniff-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function sniffBytes(bytes: Buffer, name: string) {
  const file = path.join(dir, `${Math.random().toString(36).slice(2)}-${path.basename(name)}`);
  await writeFile(file, bytes);
  return sniffFile(file, name);
}

describe('sniffFile decides by content, not by extension', () => {
  it('PDF by its "%PDF-" header (ISO 32000-1 §7.5.2), even when named .txt', async () => {
    const pdf = await makePdf({ title: 'T', author: 'A', pages: ['hello'] });
    expect(await sniffBytes(pdf, 'notes.txt')).toMatchObject({
      kind: 'pdf',
      mime: 'application/pdf',
    });
  });

  it('DOCX: a zip (PKWARE APPNOTE §4.3.7 "PK\\3\\4") holding [Content_Types].xml and word/document.xml (ECMA-376)', async () => {
    const docx = await makeDocx({ title: 'T', author: 'A', paragraphs: ['p'] });
    expect(await sniffBytes(docx, 'contract.bin')).toMatchObject({
      kind: 'docx',
      mime: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
    });
  });

  it('a plain zip named .docx is a zip, not a DOCX (ECMA-376 requires word/document.xml)', async () => {
    const zip = await makeZip([{ name: 'a.txt', content: Buffer.from('x') }]);
    expect((await sniffBytes(zip, 'fake.docx')).kind).toBe('zip');
  });

  it('an RFC 5322 message is e-mail without the .eml hint', async () => {
    const eml = await makeEml({
      from: 'a@example.com',
      to: ['b@example.com'],
      subject: 'Hi',
      date: new Date('2021-02-01T10:00:00Z'),
      text: 'Body',
    });
    expect(await sniffBytes(eml, 'message.txt')).toMatchObject({
      kind: 'email',
      mime: 'message/rfc822',
    });
  });

  it('looksLikeEmail: header fields (RFC 5322 §2.2) then a blank line; prose with a colon is not mail', () => {
    expect(looksLikeEmail('From: a@example.com\r\nSubject: x\r\n\r\nbody', '.txt')).toBe(true);
    expect(looksLikeEmail('Subject: only one field\n\nbody', '.txt')).toBe(false);
    expect(looksLikeEmail('Subject: only one field\n\nbody', '.eml')).toBe(true);
    expect(looksLikeEmail('Note: the meeting moved.\nSee you there\n\nDate: soon', '.txt')).toBe(
      false,
    );
    expect(looksLikeEmail('Dear Sir,\nFrom: nowhere\n\n', '.eml')).toBe(false);
  });

  it('HTML by a doctype or <html>/<head>/<body> near the start (WHATWG HTML §13.1)', async () => {
    expect(
      (await sniffBytes(makeHtml({ title: 'T', bodyParagraphs: ['p'] }), 'page.dat')).kind,
    ).toBe('html');
    expect((await sniffBytes(Buffer.from('<html><body>hi</body></html>'), 'x')).kind).toBe('html');
  });

  it('Markdown is text with a .md or .markdown extension (the extension breaks the tie)', async () => {
    const text = makeText('# Heading\n\nSome text.');
    expect((await sniffBytes(text, 'notes.md')).kind).toBe('markdown');
    expect((await sniffBytes(text, 'notes.markdown')).kind).toBe('markdown');
    expect((await sniffBytes(text, 'notes.txt')).kind).toBe('text');
  });

  it('PNG, JPEG and TIFF are images (for OCR); other images and executables are unsupported, whatever they are called', async () => {
    // Signatures: PNG (ISO/IEC 15948 §5.2), GIF89a (GIF spec §17), JPEG SOI (ITU T.81 Annex B), ELF, PE "MZ".
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex');
    const gif = Buffer.concat([Buffer.from('GIF89a', 'latin1'), Buffer.alloc(20)]);
    const jpeg = Buffer.from('ffd8ffe000104a464946000101', 'hex');
    const elf = Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1]), Buffer.alloc(40)]);
    const exe = Buffer.concat([Buffer.from('MZ', 'latin1'), Buffer.alloc(60, 0x90)]);
    expect(await sniffBytes(png, 'scan.pdf')).toMatchObject({ kind: 'image', mime: 'image/png' });
    expect(await sniffBytes(jpeg, 'b.docx')).toMatchObject({ kind: 'image', mime: 'image/jpeg' });
    for (const [bytes, name, detail] of [
      [gif, 'a.txt', 'GIF image'],
      [elf, 'c.md', 'ELF executable'],
      [exe, 'd.eml', 'Windows executable'],
    ] as const) {
      expect(await sniffBytes(bytes, name), name).toMatchObject({
        kind: 'unknown',
        mime: 'application/octet-stream',
        detail,
      });
    }
  });

  it('random bytes are unsupported', async () => {
    const noise = Buffer.alloc(4096);
    let x = 12345;
    for (let i = 0; i < noise.length; i += 1)
      noise[i] = (x = (x * 1103515245 + 12345) & 0x7fffffff) >> 16;
    expect((await sniffBytes(noise, 'data.txt')).kind).toBe('unknown');
    // Unrecognisable bytes that claim to be a PDF or DOCX keep that kind, flagged, so that
    // extraction can report "not a valid PDF/DOCX".
    expect(await sniffBytes(noise, 'report.pdf')).toMatchObject({
      kind: 'pdf',
      fromExtensionOnly: true,
    });
    expect(await sniffBytes(noise, 'memo.docx')).toMatchObject({
      kind: 'docx',
      fromExtensionOnly: true,
    });
  });
});

describe('charset detection', () => {
  const french =
    'Le délai de livraison a été prolongé jusqu’à la fin du trimestre. Garçon, café crème à côté. '.repeat(
      4,
    );
  const latinText = french.replaceAll('’', "'");

  it('UTF-8 is recognised by strict decoding (RFC 3629)', () => {
    expect(detectTextCharset(Buffer.from(french, 'utf8'))).toBe('UTF-8');
  });

  it('ISO-8859-1 text is detected and decoded back to the same characters', () => {
    const bytes = makeText(latinText, { encoding: 'latin1' });
    const charset = detectTextCharset(bytes);
    expect(charset).toMatch(/^(ISO-8859-1|windows-1252)$/);
    expect(decodeText(bytes).text).toBe(latinText);
  });

  it('UTF-16LE with a byte-order mark (Unicode Standard §23.8) decodes without the BOM', () => {
    const bytes = makeText(french, { encoding: 'utf16le' });
    expect(detectTextCharset(bytes)).toBe('UTF-16LE');
    expect(decodeText(bytes)).toEqual({ text: french, charset: 'UTF-16LE' });
  });

  it('UTF-16BE with a byte-order mark', () => {
    const le = Buffer.from(french, 'utf16le');
    const be = Buffer.alloc(le.length);
    for (let i = 0; i < le.length; i += 2) {
      be[i] = le[i + 1];
      be[i + 1] = le[i];
    }
    const bytes = Buffer.concat([Buffer.from([0xfe, 0xff]), be]);
    expect(decodeText(bytes)).toEqual({ text: french, charset: 'UTF-16BE' });
  });

  it('a UTF-8 sequence cut at the end of a sniffed head is still UTF-8', () => {
    const bytes = Buffer.from('abc é', 'utf8');
    expect(detectTextCharset(bytes.subarray(0, bytes.length - 1), true)).toBe('UTF-8');
  });
});
