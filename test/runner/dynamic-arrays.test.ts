/**
 * Dynamic-array marks in written workbooks: every array-formula anchor carries cm="1", pointing
 * at the one XLDAPR cell-metadata record (fDynamic) of xl/metadata.xml, which the package lists
 * in [Content_Types].xml and links from the workbook (MS-XLSX dynamicArrayProperties). The marked
 * files still read back with exceljs and evaluate the same in the runner.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { describe, expect, it } from 'vitest';
import { markDynamicArrays, METADATA_XML } from '../../src/runner/dynamic-arrays.js';
import { EvaluatedWorkbook } from '../../src/runner/workbook.js';
import { excelOf } from './helpers.js';

async function parts(bytes: Uint8Array): Promise<Record<string, string>> {
  const zip = await JSZip.loadAsync(bytes);
  const out: Record<string, string> = {};
  for (const name of Object.keys(zip.files)) if (!zip.files[name]!.dir) out[name] = await zip.file(name)!.async('string');
  return out;
}

describe('dynamic-array marks', () => {
  it('marks exactly the array-formula anchors and adds the metadata part, its content type and its link', async () => {
    const wb = excelOf({
      S: {
        A1: 1, A2: 2, A3: 3, B1: 1, B2: 3, B3: 2,
        D1: { f: '_xldudf_RATCHET_FIT(B1:B3,A1:A3)', array: 'D1:D3' },
        E1: { f: '_xldudf_RATCHET_KNOTS(B1:B3,A1:A3)', array: 'E1:F3' },
        H1: { f: 'SUM(A1:A3)' },
      },
    });
    const plain = new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer);
    const { bytes, marked } = await markDynamicArrays(plain);
    expect(marked).toBe(2);
    const p = await parts(bytes);
    const sheet = p['xl/worksheets/sheet1.xml']!;
    expect([...sheet.matchAll(/<c r="([A-Z]+[0-9]+)"[^>]*cm="1"/g)].map((m) => m[1])).toEqual(['D1', 'E1']);
    expect(p['xl/metadata.xml']).toBe(METADATA_XML);
    expect(p['xl/metadata.xml']).toContain('<xda:dynamicArrayProperties fDynamic="1" fCollapsed="0"/>');
    expect(p['[Content_Types].xml']).toContain('<Override PartName="/xl/metadata.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheetMetadata+xml"/>');
    const rels = p['xl/_rels/workbook.xml.rels']!;
    expect(rels).toContain('Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sheetMetadata" Target="metadata.xml"');
    const ids = [...rels.matchAll(/Id="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(ids).size).toBe(ids.length);
    // Marking twice changes nothing.
    expect((await markDynamicArrays(bytes)).marked).toBe(0);
    // Still a workbook that reads and evaluates the same.
    const w = new ExcelJS.Workbook();
    await w.xlsx.load(bytes as unknown as ArrayBuffer);
    expect(EvaluatedWorkbook.fromExcel(w).result('S!D1')).toEqual([[1], [2.5], [2.5]]);
  });

  it('every sample marks each of its spilled results', async () => {
    const expected = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'samples', 'expected.json'), 'utf8')) as {
      samples: Record<string, { formulas: { cell: string; expected: unknown[][] }[] }>;
    };
    for (const [file, s] of Object.entries(expected.samples)) {
      const p = await parts(readFileSync(join(import.meta.dirname, '..', '..', 'samples', file)));
      const data = Object.entries(p).find(([n, x]) => n.startsWith('xl/worksheets/') && x.includes('_xldudf_'))![1];
      const marked = [...data.matchAll(/<c r="([A-Z]+[0-9]+)"[^>]*cm="1"/g)].map((m) => m[1]).sort();
      const spilled = s.formulas.filter((f) => f.expected.length > 1 || f.expected[0]!.length > 1).map((f) => f.cell).sort();
      expect(marked, file).toEqual(spilled);
      expect(p['xl/metadata.xml'], file).toBe(METADATA_XML);
    }
  });
});
