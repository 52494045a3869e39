/**
 * Files the runner cannot read get messages that say why — an encrypted workbook, an old .xls,
 * a package that would unpack to more than the limit (declared or actual sizes) — and formula
 * cells the engine cannot calculate are listed and keep their stored values in `--out` copies.
 * Encrypted and .xls files are OLE compound files (MS-CFB 2.2: signature D0 CF 11 E0 A1 B1 1A
 * E1, directory entries named in UTF-16LE); an encrypted package holds the streams
 * "EncryptionInfo" and "EncryptedPackage" (MS-OFFCRYPTO 2.3.4) (memory). Zip field offsets
 * follow APPNOTE.TXT 4.3.12 and 4.3.16 (memory).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { describe, expect, it } from 'vitest';
import '../../src/runner/ratchet.js';
import { runSheet } from '../../src/runner/cli.js';
import { packageProblem } from '../../src/runner/package-check.js';

const SMALL = join(import.meta.dirname, 'fixtures', 'small.xlsx');
const tmp = mkdtempSync(join(tmpdir(), 'ratchet-read-'));

function capture() {
  const err: string[] = [];
  const out: string[] = [];
  return { io: { out: (s: string) => out.push(s), err: (s: string) => err.push(s) }, err, out };
}

/** A minimal compound file: the 512-byte header, then one directory sector naming `streams`. */
function compoundFile(streams: readonly string[]): Uint8Array {
  const bytes = new Uint8Array(512 * 2);
  bytes.set([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1], 0);
  const view = new DataView(bytes.buffer);
  view.setUint16(0x1a, 3, true); // major version 3
  view.setUint16(0x1c, 0xfffe, true); // little-endian
  view.setUint16(0x1e, 9, true); // 512-byte sectors
  view.setUint32(0x30, 0, true); // first directory sector
  ['Root Entry', ...streams].forEach((name, i) => {
    const at = 512 + i * 128;
    const u16 = Buffer.from(`${name}\0`, 'utf16le');
    bytes.set(u16, at);
    view.setUint16(at + 64, u16.length, true);
    bytes[at + 66] = i === 0 ? 5 : 2; // root storage, then streams
  });
  return bytes;
}

async function readMessage(bytes: Uint8Array, name: string): Promise<{ code: number; err: string }> {
  const file = join(tmp, name);
  writeFileSync(file, bytes);
  const c = capture();
  const code = await runSheet([file], c.io);
  return { code, err: c.err.join('') };
}

/** The offset of the central directory entry of the first part of a zip. */
function firstCentralEntry(zip: Uint8Array): number {
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  for (let i = zip.length - 22; i >= 0; i--) if (view.getUint32(i, true) === 0x06054b50) return view.getUint32(i + 16, true);
  throw new Error('no end of central directory');
}

describe('runner messages for files it cannot read', () => {
  it('an encrypted workbook says it is encrypted, not "not an .xlsx or damaged"', async () => {
    const r = await readMessage(compoundFile(['EncryptionInfo', 'EncryptedPackage']), 'locked.xlsx');
    expect(r.code).toBe(1);
    expect(r.err).toContain('it is encrypted (protected with a password to open)');
    expect(r.err).not.toContain('damaged');
  });

  it('an Excel 97-2003 compound file says to save it as .xlsx', async () => {
    const r = await readMessage(compoundFile(['Workbook']), 'old.xls');
    expect(r.code).toBe(1);
    expect(r.err).toContain('Excel 97–2003 workbook (.xls)');
  });

  it('a package whose declared sizes exceed 1 GiB is refused before unpacking', async () => {
    const zip = new Uint8Array(readFileSync(SMALL));
    const view = new DataView(zip.buffer);
    view.setUint32(firstCentralEntry(zip) + 24, 0xc0000000, true); // declared 3 GiB
    const r = await readMessage(zip, 'bomb.xlsx');
    expect(r.code).toBe(1);
    expect(r.err).toContain('it would unpack to 3072 MB, more than the runner\'s limit of 1024 MB');
  });

  it('a part that unpacks to more than it declares is caught (a lying zip bomb)', async () => {
    const zip = new JSZip();
    zip.file('[Content_Types].xml', 'x'.repeat(200000));
    const bytes = await zip.generateAsync({ type: 'uint8array', compression: 'DEFLATE' });
    const view = new DataView(bytes.buffer);
    view.setUint32(firstCentralEntry(bytes) + 24, 1000, true); // declares 1000 bytes
    const r = await readMessage(bytes, 'liar.xlsx');
    expect(r.code).toBe(1);
    expect(r.err).toContain('unpacks to more than the size its zip directory declares');
  });

  it('packageProblem refuses a package whose unpacked size exceeds the limit, and passes a sound workbook', async () => {
    const zip = new JSZip();
    zip.file('a.xml', '0'.repeat(3 * 1024 * 1024));
    const bytes = await zip.generateAsync({ type: 'uint8array', compression: 'DEFLATE' });
    expect(packageProblem(bytes, 2 * 1024 * 1024)?.kind).toBe('oversized');
    expect(packageProblem(bytes, 4 * 1024 * 1024)).toBeUndefined();
    expect(packageProblem(new Uint8Array(readFileSync(SMALL)))).toBeUndefined();
  });
});

describe('cells the engine cannot calculate', () => {
  it('are listed in a message and keep their stored values in the --out copy', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Data');
    ws.getCell('A1').value = 2;
    ws.getCell('B1').value = { formula: 'SOMEVENDOR.SCORE(A1)', result: 42 } as ExcelJS.CellFormulaValue;
    ws.getCell('C1').value = { formula: 'B1*2', result: 84 } as ExcelJS.CellFormulaValue;
    ws.getCell('D1').value = { formula: 'A1*3', result: 0 } as ExcelJS.CellFormulaValue;
    const input = join(tmp, 'vendor.xlsx');
    await wb.xlsx.writeFile(input);
    const out = join(tmp, 'vendor-copy.xlsx');
    const c = capture();
    expect(await runSheet([input, '--json', '--out', out], c.io)).toBe(0);
    const json = JSON.parse(c.out.join('')) as Record<string, unknown>;
    expect([json['Data!B1'], json['Data!C1'], json['Data!D1']]).toEqual(['#NAME?', '#NAME?', 6]);
    expect(c.err.join('')).toContain('2 formula cells cannot be calculated here');
    expect(c.err.join('')).toContain('Data!B1, Data!C1.');
    expect(c.err.join('')).toContain('The copy keeps the values stored in the workbook for them.');
    const copy = new ExcelJS.Workbook();
    await copy.xlsx.readFile(out);
    const cs = copy.getWorksheet('Data')!;
    expect(cs.getCell('B1').value).toMatchObject({ formula: 'SOMEVENDOR.SCORE(A1)', result: 42 });
    expect(cs.getCell('C1').value).toMatchObject({ formula: 'B1*2', result: 84 });
    expect(cs.getCell('D1').value).toMatchObject({ formula: 'A1*3', result: 6 });
  });
});
