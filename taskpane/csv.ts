/**
 * A small RFC 4180 CSV reader for the browser preview.
 *
 * Rules (RFC 4180 §2, plus the usual relaxations of files written by spreadsheets):
 * - records end with CRLF, LF or a lone CR; a final line break does not start an empty record;
 * - a field may be enclosed in double quotes; inside quotes, commas, line breaks and doubled
 *   quotes ("") are data; text after the closing quote up to the next separator is an error;
 * - a quote inside an unquoted field is kept as a literal character (lenient);
 * - a UTF-8 byte-order mark at the start is dropped;
 * - the separator (",", ";" or tab) and the decimal mark ("." or ",") are detected from the
 *   text ({@link readCsv}), or given by the caller.
 *
 * Cost O(length of the text). Records may have different numbers of fields; callers pad.
 */

/** A CSV problem with its 1-based line number. */
export class CsvError extends Error {
  readonly line: number;
  constructor(message: string, line: number) {
    super(`CSV line ${line}: ${message}`);
    this.name = 'CsvError';
    this.line = line;
  }
}

/** Field separators the reader recognises. */
export type CsvSeparator = ',' | ';' | '\t';

/** Decimal marks the reader recognises: "." (25.3) or "," (25,3). */
export type DecimalMark = '.' | ',';

/** How a CSV file is written: its field separator and its decimal mark. */
export interface CsvFormat {
  readonly separator: CsvSeparator;
  readonly decimal: DecimalMark;
}

const SEPARATORS: readonly CsvSeparator[] = [',', ';', '\t'];
/** Lines the detection looks at (outside quotes, blank lines skipped). */
const SNIFF_LINES = 50;

/** The first non-blank lines of `text`, each split by `sep` outside quotes (quotes kept). */
function splitLines(text: string, sep: string): string[][] {
  const lines: string[][] = [];
  let fields: string[] = [];
  let field = '';
  let inQuotes = false;
  const end = (): void => {
    fields.push(field);
    if (fields.length > 1 || fields[0]!.trim() !== '') lines.push(fields);
    fields = [];
    field = '';
  };
  for (let i = 0; i < text.length && lines.length < SNIFF_LINES; i++) {
    const ch = text[i]!;
    if (ch === '"') inQuotes = !inQuotes;
    if (!inQuotes && (ch === '\n' || ch === '\r')) {
      end();
      continue;
    }
    if (!inQuotes && ch === sep) {
      fields.push(field);
      field = '';
      continue;
    }
    field += ch;
  }
  if (lines.length < SNIFF_LINES && (field !== '' || fields.length > 0)) end();
  return lines;
}

const DOT_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const COMMA_NUMBER = /^[+-]?(\d+,?\d*|,\d+)([eE][+-]?\d+)?$/;

/**
 * The separator a file most likely uses: ",", ";" or "\t". Each candidate splits the first 50
 * non-blank lines outside quotes; the winner splits the most lines into the same number (≥ 2) of
 * fields — so a title line above the table or a header written without separators does not
 * mislead it — and, on a tie, yields the most fields that read as numbers (a decimal comma then
 * points at ";" or tab rather than ","). A file with no separator at all is read with ",".
 * Cost O(length of the first 50 lines).
 * @example sniffSeparator('Stunden;Verschleiß (µm)\n0;25,3\n10;27,9\n') // → ';'
 */
export function sniffSeparator(text: string): CsvSeparator {
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let best: CsvSeparator = ',';
  let bestScore = [0, 0];
  for (const sep of SEPARATORS) {
    const lines = splitLines(src, sep);
    const counts = new Map<number, number>();
    for (const l of lines) if (l.length >= 2) counts.set(l.length, (counts.get(l.length) ?? 0) + 1);
    let agree = 0;
    for (const c of counts.values()) agree = Math.max(agree, c);
    let numbers = 0;
    for (const l of lines) for (const f of l) if (DOT_NUMBER.test(f.trim()) || (sep !== ',' && COMMA_NUMBER.test(f.trim()))) numbers++;
    const score = [agree, numbers];
    if (score[0]! > bestScore[0]! || (score[0] === bestScore[0] && score[1]! > bestScore[1]!)) {
      best = sep;
      bestScore = score;
    }
  }
  return best;
}

/**
 * The decimal mark of parsed records: "," when more fields read as numbers with a decimal comma
 * ("25,3", "-0,5") than with a decimal point ("25.3"); "." otherwise. Whole numbers count for
 * neither. A field such as "1,234" (a comma and three digits) counts as a decimal comma, as it does
 * in a file written with that convention. Cost O(fields).
 * @example sniffDecimal([['h', 'w'], ['0', '25,3'], ['10', '27,9']]) // → ','
 */
export function sniffDecimal(records: readonly (readonly string[])[]): DecimalMark {
  let comma = 0;
  let dot = 0;
  for (const r of records) {
    for (const f of r) {
      const t = f.trim();
      if (/^[+-]?\d*,\d+([eE][+-]?\d+)?$/.test(t)) comma++;
      else if (/^[+-]?\d*\.\d+([eE][+-]?\d+)?$/.test(t)) dot++;
    }
  }
  return comma > dot ? ',' : '.';
}

/**
 * Reads CSV text with its format detected ({@link sniffSeparator}, {@link sniffDecimal}) unless
 * given: `options.separator` and `options.decimal` override the detection (the pane's control).
 * Cost O(length of the text).
 * @throws CsvError as {@link parseCsv}.
 * @example readCsv('x;y\n1;2,5\n') // → { records: [['x', 'y'], ['1', '2,5']], format: { separator: ';', decimal: ',' } }
 */
export function readCsv(text: string, options: Partial<CsvFormat> = {}): { records: string[][]; format: CsvFormat } {
  const separator = options.separator ?? sniffSeparator(text);
  const records = parseCsv(text, separator);
  const decimal = options.decimal ?? sniffDecimal(records);
  return { records, format: { separator, decimal } };
}

/**
 * Parses CSV text into records of fields (strings, unquoted and unescaped).
 * @param text the file's text.
 * @param separator field separator; default: {@link sniffSeparator}.
 * @throws CsvError for an unterminated quoted field or text after a closing quote.
 * @example parseCsv('a,"b ""c"""\r\n1,2\n') // → [['a', 'b "c"'], ['1', '2']]
 */
export function parseCsv(text: string, separator: string = sniffSeparator(text)): string[][] {
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const records: string[][] = [];
  let record: string[] = [];
  let field = '';
  let line = 1;
  let i = 0;
  const n = src.length;
  // state: at the start of a field (true) or inside an unquoted field (false)
  let fieldStart = true;
  let recordHasContent = false;
  const endField = (): void => {
    record.push(field);
    field = '';
    fieldStart = true;
  };
  const endRecord = (): void => {
    endField();
    records.push(record);
    record = [];
    recordHasContent = false;
  };
  while (i < n) {
    const ch = src[i]!;
    if (fieldStart && ch === '"') {
      // quoted field
      const startLine = line;
      i++;
      let closed = false;
      while (i < n) {
        const c = src[i]!;
        if (c === '"') {
          if (src[i + 1] === '"') {
            field += '"';
            i += 2;
            continue;
          }
          i++;
          closed = true;
          break;
        }
        if (c === '\r') {
          line++;
          if (src[i + 1] === '\n') {
            field += '\r\n';
            i += 2;
            continue;
          }
        } else if (c === '\n') line++;
        field += c;
        i++;
      }
      if (!closed) throw new CsvError('a quoted field is not closed (opened on this line)', startLine);
      recordHasContent = true;
      fieldStart = false;
      // after the closing quote: separator, line break or end
      const next = src[i];
      if (next !== undefined && next !== separator && next !== '\n' && next !== '\r') {
        throw new CsvError(`unexpected text after a closing quote: ${JSON.stringify(src.slice(i, i + 10))}`, line);
      }
      continue;
    }
    if (ch === separator) {
      recordHasContent = true;
      endField();
      i++;
      continue;
    }
    if (ch === '\r' || ch === '\n') {
      endRecord();
      i += ch === '\r' && src[i + 1] === '\n' ? 2 : 1;
      line++;
      continue;
    }
    field += ch;
    recordHasContent = true;
    fieldStart = false;
    i++;
  }
  if (recordHasContent || field !== '' || record.length > 0) endRecord();
  return records;
}
