/**
 * `npm run sheet -- <workbook.xlsx> [--json] [--out <file.xlsx>] [--set Sheet!A1=value …]`:
 * evaluates a workbook headlessly with the add-in's own functions (see src/runner/cli.ts).
 */
import '../src/runner/ratchet.js';
import { runSheet } from '../src/runner/cli.js';

process.exitCode = await runSheet(process.argv.slice(2));
