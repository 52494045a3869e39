/**
 * `npm run samples`: writes the sample workbooks to samples/ and their expected values to
 * samples/expected.json. The data are invented and seeded; the expected values come from the
 * core directly (scripts/samples/samples.ts), never from the runner.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { buildSamples } from './samples/samples.js';
import { writeSampleWorkbook } from './samples/sample-workbook.js';

const dir = join(import.meta.dirname, '..', 'samples');
mkdirSync(dir, { recursive: true });
const samples = buildSamples();
for (const s of samples) {
  const written = await writeSampleWorkbook(s, join(dir, s.file));
  console.log(`${written ? 'wrote' : 'unchanged'} samples/${s.file} (${s.formulas.length} formulas)`);
}
const expected = {
  about:
    'Expected values of the sample workbooks, computed by scripts/make-samples.ts calling src/core directly (not the runner). Cells are on the sheet "Data"; "inputs" are the data columns from row 2 (null = blank cell); each formula lists the block its result fills, top-left first.',
  samples: Object.fromEntries(samples.map((s) => [s.file, { title: s.title, data: s.data, inputs: s.columns, formulas: s.formulas }])),
};
writeFileSync(join(dir, 'expected.json'), `${JSON.stringify(expected, null, 1)}\n`);
console.log('wrote samples/expected.json');
