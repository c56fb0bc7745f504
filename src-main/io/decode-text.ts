import { isAscii, isUtf8 } from 'node:buffer';
import { TextDecoder } from 'node:util';

/**
 * The text of a file read in chunks, whatever of the encodings a spreadsheet saves it in. Decided
 * once, from the first chunk: a byte order mark names UTF-8, UTF-16LE or UTF-16BE (and is
 * dropped); otherwise the file is UTF-8 when its first chunk is valid UTF-8 (ASCII is), and
 * Windows-1252 (what spreadsheets on Windows save as "CSV") when it is not.
 */
export type TextEncodingName = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

/** Bytes that cannot be text in the file's encoding; `text` is what decoded before them. */
export class UndecodableBytes extends Error {
  constructor(
    readonly text: string,
    message: string,
  ) {
    super(message);
  }
}

/** Whole lines of a chunk: as text, or as their bytes when they are ASCII (one byte a character). */
export type DecodedLines = { used: number; text: string; ascii?: undefined } | { used: number; ascii: Buffer };

export class ChunkDecoder {
  encoding: TextEncodingName | undefined;
  private carry: Buffer | undefined; // the start of a UTF-8 character cut by the chunk's end
  private decoder: TextDecoder | undefined;

  /**
   * The text of the whole lines at the start of `chunk` (through its last line break) and how
   * many bytes they take; `last` reads everything. The caller hands the bytes left over back at
   * the start of the next chunk, so that no line of text is cut in two and joined again (a file
   * in UTF-16, whose line break is two bytes, or a line longer than the chunk, is decoded whole,
   * any line cut by the chunk's end is joined by the reader). Lines that are ASCII, in either
   * encoding that has ASCII as its first half, come back undecoded as `ascii`, a view of
   * `chunk` (valid until the caller refills it): a reader scans them where they lie, and makes
   * text only of the lines it needs as text.
   */
  decodeLines(chunk: Buffer, last: boolean): DecodedLines {
    const rest = this.encoding === undefined ? this.sniff(chunk) : chunk;
    const used = this.linesEnd(rest, last);
    const lines = rest.subarray(0, used);
    const skipped = chunk.length - rest.length;
    if (this.carry === undefined && this.encoding !== 'utf-16le' && this.encoding !== 'utf-16be' && isAscii(lines))
      return { used: skipped + used, ascii: lines };
    return { used: skipped + used, text: this.decode(lines, last) };
  }

  private linesEnd(bytes: Buffer, last: boolean): number {
    if (last || this.encoding === 'utf-16le' || this.encoding === 'utf-16be') return bytes.length;
    const newline = bytes.lastIndexOf(10);
    return newline === -1 ? bytes.length : newline + 1;
  }

  /** The text of the next chunk; `last` flushes. Throws UndecodableBytes. */
  decode(chunk: Buffer, last: boolean): string {
    if (this.encoding === undefined) chunk = this.sniff(chunk);
    if (this.encoding === 'utf-8') return this.utf8(chunk, last);
    if (this.encoding === 'windows-1252' && isAscii(chunk)) return chunk.toString('latin1');
    try {
      return this.decoder!.decode(chunk, { stream: !last });
    } catch {
      throw new UndecodableBytes('', `bytes that are not ${this.encoding} text`);
    }
  }

  private sniff(chunk: Buffer): Buffer {
    if (chunk[0] === 0xef && chunk[1] === 0xbb && chunk[2] === 0xbf) {
      this.encoding = 'utf-8';
      return chunk.subarray(3);
    }
    if ((chunk[0] === 0xff && chunk[1] === 0xfe) || (chunk[0] === 0xfe && chunk[1] === 0xff)) {
      this.encoding = chunk[0] === 0xff ? 'utf-16le' : 'utf-16be';
      this.decoder = new TextDecoder(this.encoding, { fatal: true });
      return chunk.subarray(2);
    }
    if (chunk.includes(0))
      throw new UndecodableBytes(
        '',
        'the file holds NUL bytes: it is not a text file, or UTF-16 without a byte order mark (save it as UTF-8)',
      );
    if (isAscii(chunk) || isUtf8(chunk.subarray(0, completeUtf8(chunk)))) this.encoding = 'utf-8';
    else {
      this.encoding = 'windows-1252';
      this.decoder = new TextDecoder('windows-1252');
    }
    return chunk;
  }

  private utf8(chunk: Buffer, last: boolean): string {
    let bytes = this.carry ? Buffer.concat([this.carry, chunk]) : chunk;
    this.carry = undefined;
    if (isAscii(bytes)) return bytes.toString('latin1'); // the same text, without UTF-8 decoding
    if (!last) {
      const end = completeUtf8(bytes);
      if (end < bytes.length) this.carry = Buffer.from(bytes.subarray(end));
      bytes = bytes.subarray(0, end);
    }
    const text = bytes.toString('utf8');
    if (isUtf8(bytes)) return text;
    throw new UndecodableBytes(
      text.slice(0, text.indexOf('\uFFFD')),
      'bytes that are not UTF-8 text, in a file whose start is UTF-8 (save the whole file in one encoding)',
    );
  }
}

/** The length of the prefix of `bytes` that ends on a whole UTF-8 character. */
function completeUtf8(bytes: Buffer): number {
  const n = bytes.length;
  for (let back = 1; back <= Math.min(3, n); back++) {
    const b = bytes[n - back];
    if ((b & 0xc0) === 0x80) continue; // a continuation byte: look further back
    const need = b >= 0xf0 ? 4 : b >= 0xe0 ? 3 : b >= 0xc0 ? 2 : 1;
    return need > back ? n - back : n;
  }
  return n;
}
