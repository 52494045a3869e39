import { it } from 'vitest';
import '../../src/runner/ratchet.js';
import { EvaluatedWorkbook } from '../../src/runner/workbook.js';
it('x', async () => {
  const b = await EvaluatedWorkbook.fromFile('test/runner/fixtures/small.xlsx');
  try { b.set({ 'Lab data!B7': 7 }); } catch (e) { console.log((e as Error).stack); }
});
