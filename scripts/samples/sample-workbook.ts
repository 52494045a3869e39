/**
 * Writes one sample as an .xlsx file: an "About" sheet with the scenario and cautions, and a
 * "Data" sheet with the invented data and live RATCHET formulas in the stored form Excel reads
 * (`_xldudf_RATCHET_…`). Spilled results are written as dynamic-array formulas (array formulas
 * marked as Excel 365 marks a spilling formula, see dynamic-arrays.ts) over the range of their
 * expected result, with the expected values cached, so the file shows numbers even before the
 * add-in recalculates it.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import JSZip from 'jszip';
import ExcelJS from 'exceljs';
import { cellName, parseCellRef } from '../../src/runner/address.js';
import { toStoredForm } from '../../src/runner/formula-text.js';
import { markDynamicArrays } from '../../src/runner/dynamic-arrays.js';
import type { ExpectedCell, Sample } from './samples.js';

/** Fixed document dates keep regenerated files byte-stable apart from the zip container. */
const FIXED_DATE = new Date(Date.UTC(2026, 0, 1));

function cached(v: ExpectedCell): ExcelJS.CellValue {
  if (typeof v === 'string' && /^#[A-Z/0-9]+[!?A]$/.test(v)) return { error: v } as ExcelJS.CellErrorValue;
  return v;
}

/** True when the file already carries the dynamic-array metadata part. */
async function isMarked(path: string): Promise<boolean> {
  const zip = await JSZip.loadAsync(readFileSync(path));
  return zip.file('xl/metadata.xml') !== null;
}

/** Cell contents of every sheet, for telling whether a regenerated file differs in substance. */
function contents(wb: ExcelJS.Workbook): string {
  const out: string[] = [];
  for (const ws of wb.worksheets) {
    out.push(`#${ws.name}`);
    ws.eachRow((row) => row.eachCell((c) => out.push(`${c.address}=${JSON.stringify(c.value)}`)));
  }
  return out.join('\n');
}

/**
 * Writes `sample` to `path`, unless a file there already holds the same cells (zip timestamps
 * would otherwise change the bytes on every run). Returns whether the file was written.
 */
export async function writeSampleWorkbook(sample: Sample, path: string): Promise<boolean> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Ratchet samples (npm run samples)';
  wb.created = FIXED_DATE;
  wb.modified = FIXED_DATE;

  const about = wb.addWorksheet('About');
  about.getColumn(1).width = 120;
  about.getCell('A1').value = sample.title;
  about.getCell('A1').font = { bold: true, size: 14 };
  sample.about.forEach((line, i) => {
    const c = about.getCell(i + 3, 1);
    c.value = line;
    c.alignment = { wrapText: true, vertical: 'top' };
  });

  const ws = wb.addWorksheet('Data');
  for (const [col, text] of Object.entries(sample.headers)) {
    const c = ws.getCell(`${col}1`);
    c.value = text;
    c.font = { bold: true };
    ws.getColumn(col).width = Math.max(11, text.length + 2);
  }
  for (const [col, values] of Object.entries(sample.columns)) {
    values.forEach((v, i) => {
      if (v !== null) ws.getCell(`${col}${i + 2}`).value = v;
    });
  }
  for (const [cell, v] of Object.entries(sample.labels)) ws.getCell(cell).value = v;
  for (const f of sample.formulas) {
    const a = parseCellRef(`Data!${f.cell}`);
    const rows = f.expected.length;
    const cols = f.expected[0]!.length;
    const formula = toStoredForm(f.formula.replace(/^=/, ''));
    const top = ws.getCell(a.row + 1, a.col + 1);
    const result = cached(f.expected[0]![0]!);
    top.value = (
      rows === 1 && cols === 1 ? { formula, result } : { formula, result, shareType: 'array', ref: `${f.cell}:${cellName(a.row + rows - 1, a.col + cols - 1)}` }
    ) as ExcelJS.CellFormulaValue;
    f.expected.forEach((row, r) =>
      row.forEach((v, c) => {
        if (r > 0 || c > 0) ws.getCell(a.row + r + 1, a.col + c + 1).value = cached(v);
      }),
    );
  }
  ws.views = [{ state: 'frozen', ySplit: 1 }];
  const buffer = await wb.xlsx.writeBuffer();
  if (existsSync(path)) {
    const old = new ExcelJS.Workbook();
    const fresh = new ExcelJS.Workbook();
    try {
      await old.xlsx.readFile(path);
      await fresh.xlsx.load(buffer);
      if (contents(old) === contents(fresh) && (await isMarked(path))) return false;
    } catch {
      // unreadable old file: write the new one
    }
  }
  const { bytes } = await markDynamicArrays(new Uint8Array(buffer as ArrayBuffer));
  writeFileSync(path, bytes);
  return true;
}
