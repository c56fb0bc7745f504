import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readInputFile } from '../../../src-main/io/read-input-file.js';

const dir = mkdtempSync(join(tmpdir(), 'holdfast-files-'));

describe('readInputFile: the text of a file named on the command line', () => {
  it('reads an all-ASCII file, a UTF-8 file with accented names and one with a byte-order mark as the same text', () => {
    const ascii = 'date,ALPHA,BETA\n2024-01-02,100.5,20\n';
    const accented = 'date,Énergie Nord,Café Süd\n2024-01-02,100.5,20\n';
    writeFileSync(join(dir, 'ascii.csv'), ascii);
    writeFileSync(join(dir, 'accented.csv'), accented);
    writeFileSync(join(dir, 'bom.csv'), '\uFEFF' + accented);
    expect(readInputFile(dir, 'ascii.csv')).toEqual({ path: 'ascii.csv', text: ascii });
    expect(readInputFile(dir, 'accented.csv').text).toBe(accented);
    expect(readInputFile(dir, 'bom.csv').text).toBe(accented);
  });

  it('names the file that is missing', () => {
    expect(() => readInputFile(dir, 'absent.csv')).toThrow(/no such file/);
  });
});
