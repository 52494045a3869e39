/**
 * `npm run sheet -- <workbook.xlsx> [--json] [--out <file.xlsx>] [--set Sheet!A1=value …]`
 *
 * Evaluates every formula of a workbook headlessly and prints the results (a table per sheet, or
 * JSON with --json); --out writes a copy with computed values cached; --set changes input cells
 * first. The input file is never modified.
 */
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { writeFrozenCopy } from './freeze.js';
import { checkOutput, OutputRefusedError } from './safe-write.js';
import { parseInputValue, EvaluatedWorkbook, WorkbookReadError, type InputValue, type JsonCell, type FormulaResult } from './workbook.js';

/** Parsed command line. */
export interface SheetArgs {
  readonly file: string;
  readonly json: boolean;
  readonly out: string | undefined;
  /** Replace an existing --out file (never an input). */
  readonly force: boolean;
  readonly set: Readonly<Record<string, InputValue>>;
  /** --freeze: where to write a copy with every RATCHET formula replaced by its values (freeze.ts). */
  readonly freeze?: string | undefined;
}

/** Usage text printed on --help or a bad command line. */
export const USAGE = `usage: npm run sheet -- <workbook.xlsx> [--json] [--out <copy.xlsx> [--force]] [--freeze <frozen.xlsx>] [--set Sheet!A1=value ...]

  --json            print one JSON object: "Sheet!A1" -> value of every formula cell and of every
                    cell its result spills into, plus "messages" with each error's message
  --out <file>      write a copy with the computed values cached (formulas kept); the file
                    must be new and must not be the input under another name (link)
  --force           let --out and --freeze replace an existing file (never the input workbook)
  --freeze <file>   write a copy for colleagues without the add-in: every RATCHET formula
                    replaced by its values, and a sheet listing what was replaced
  --set S!A1=value  change an input cell before evaluating; repeat --set, or list several
                    changes after one --set; a value starting with "=" is a formula, TRUE/FALSE
                    are logicals, an empty value makes the cell blank
The input workbook is never modified.`;

/** A change as typed after --set: Sheet!A1=value (the sheet name may be quoted). */
const SET_SPEC = /^[^=]+![$]?[A-Za-z]{1,3}[$]?[0-9]+=/;

/** Thrown for a bad command line; the message is for users. */
export class UsageError extends Error {}

/** Parses the arguments after `npm run sheet --`. @throws UsageError. */
export function parseSheetArgs(argv: readonly string[]): SheetArgs {
  let file: string | undefined;
  let json = false;
  let out: string | undefined;
  let force = false;
  let freeze: string | undefined;
  const set: Record<string, InputValue> = {};
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a === '--json') json = true;
    else if (a === '--force') force = true;
    else if (a === '--out') {
      out = argv[++i];
      if (out === undefined || out.startsWith('--')) throw new UsageError('--out needs a file name');
    } else if (a === '--freeze') {
      freeze = argv[++i];
      if (freeze === undefined || freeze.startsWith('--')) throw new UsageError('--freeze needs a file name');
    } else if (a === '--set' || a.startsWith('--set=')) {
      const spec = a === '--set' ? argv[++i] : a.slice('--set='.length);
      const eq = spec?.indexOf('=') ?? -1;
      if (spec === undefined || eq <= 0) throw new UsageError(`--set needs Sheet!A1=value; got ${spec === undefined ? 'nothing' : `"${spec}"`}`);
      set[spec.slice(0, eq)] = parseInputValue(spec.slice(eq + 1));
      // More changes may follow one --set: --set Data!B2=5 Data!B3=6
      while (i + 1 < argv.length && SET_SPEC.test(argv[i + 1]!)) {
        const more = argv[++i]!;
        const at = more.indexOf('=');
        set[more.slice(0, at)] = parseInputValue(more.slice(at + 1));
      }
    } else if (a.startsWith('--')) throw new UsageError(`unknown option ${a}`);
    else if (file === undefined) file = a;
    else throw new UsageError(`only one workbook, please; got "${file}" and "${a}"`);
  }
  if (file === undefined) throw new UsageError('name the workbook to evaluate');
  if (out !== undefined && resolve(out) === resolve(file)) throw new UsageError('--out must name a new file; the input workbook is never modified');
  if (force && out === undefined && freeze === undefined) throw new UsageError('--force only applies to --out and --freeze');
  if (freeze !== undefined && [file, out].some((f) => f !== undefined && resolve(f) === resolve(freeze))) throw new UsageError('--freeze must name a new file of its own');
  return { file, json, out, force, set, freeze };
}

function show(v: JsonCell): string {
  if (v === null) return '';
  if (typeof v === 'number') return Number.isInteger(v) ? String(v) : String(Number(v.toPrecision(10)));
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  return v;
}

/** The readable table: per sheet, each formula, then its value or its spilled block aligned in columns. */
export function formatTable(results: readonly FormulaResult[]): string {
  const lines: string[] = [];
  let sheet: string | undefined;
  for (const r of results) {
    if (r.sheet !== sheet) {
      sheet = r.sheet;
      lines.push('', `== ${sheet} ==`);
    }
    const scalar = r.values.length === 1 && r.values[0]!.length === 1;
    if (scalar) {
      lines.push(`${r.cell.padEnd(6)} ${r.formula}  →  ${show(r.values[0]![0]!)}`);
    } else {
      lines.push(`${r.cell.padEnd(6)} ${r.formula}  →  ${r.values.length} × ${r.values[0]!.length}`);
      const cells = r.values.map((row) => row.map(show));
      const widths = cells[0]!.map((_c, j) => Math.max(...cells.map((row) => (row[j] ?? '').length)));
      for (const row of cells) lines.push(`       ${row.map((c, j) => (/^[-\d.]/.test(c) ? c.padStart(widths[j]!) : c.padEnd(widths[j]!))).join('  ')}`);
    }
    for (const [at, m] of Object.entries(r.messages)) lines.push(`       ${at}: ${m}`);
  }
  return lines.join('\n').replace(/^\n/, '');
}

/** Runs the command; returns the exit code. Output goes to the given writers. */
export async function runSheet(
  argv: readonly string[],
  io: { out: (s: string) => void; err: (s: string) => void } = { out: (s) => process.stdout.write(s), err: (s) => process.stderr.write(s) },
): Promise<number> {
  if (argv.includes('--help') || argv.includes('-h')) {
    io.out(`${USAGE}\n`);
    return 0;
  }
  let args: SheetArgs;
  try {
    args = parseSheetArgs(argv);
  } catch (e) {
    io.err(`sheet: ${(e as Error).message}\n\n${USAGE}\n`);
    return 2;
  }
  try {
    // Refused before the work, and checked again when the copy is written.
    if (existsSync(args.file)) for (const target of [args.out, args.freeze]) if (target !== undefined) checkOutput(target, [args.file], args.force);
    const book = await EvaluatedWorkbook.fromFile(args.file);
    if (Object.keys(args.set).length > 0) book.set(args.set);
    io.out(args.json ? `${JSON.stringify(book.toJson(), null, 2)}\n` : `${formatTable(book.results())}\n`);
    const unknown = book.uncomputable();
    if (unknown.length > 0) {
      const list = unknown.length > 20 ? `${unknown.slice(0, 20).join(', ')} and ${unknown.length - 20} more` : unknown.join(', ');
      io.err(
        `sheet: ${unknown.length} formula cell${unknown.length === 1 ? '' : 's'} cannot be calculated here (a function the engine does not know, or a cell that reads one): ${list}.` +
          `${args.out !== undefined ? ' The copy keeps the values stored in the workbook for them.' : ''}\n`,
      );
    }
    if (args.out !== undefined) {
      await book.writeCopy(args.out, { inputs: [args.file], force: args.force });
      io.err(`sheet: wrote ${args.out}\n`);
    }
    if (args.freeze !== undefined) {
      const f = await writeFrozenCopy(book, args.freeze, new Date(), { inputs: [args.file, ...(args.out === undefined ? [] : [args.out])], force: args.force });
      io.err(`sheet: wrote ${args.freeze} (${f.replaced} RATCHET formulas replaced by values; see its sheet "${f.noteSheet}")\n`);
      if (f.unresolved.length > 0) io.err(`sheet: warning: frozen as errors that are not answers: ${f.unresolved.join(', ')}\n`);
    }
    return 0;
  } catch (e) {
    if (e instanceof OutputRefusedError) {
      io.err(`sheet: ${e.message}\n`);
      return 2;
    }
    if (e instanceof WorkbookReadError) {
      io.err(`sheet: ${e.message}\n`);
      return 1;
    }
    io.err(`sheet: ${(e as Error).message}\n`);
    return 1;
  }
}
