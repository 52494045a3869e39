/**
 * A small RFC 4180 CSV reader for the browser preview.
 *
 * Rules (RFC 4180 §2, plus the usual relaxations of files written by spreadsheets):
 * - records end with CRLF, LF or a lone CR; a final line break does not start an empty record;
 * - a field may be enclosed in double quotes; inside quotes, commas, line breaks and doubled
 *   quotes ("") are data; text after the closing quote up to the next separator is an error;
 * - a quote inside an unquoted field is kept as a literal character (lenient);
 * - a UTF-8 byte-order mark at the start is dropped;
 * - the separator is a comma unless {@link sniffSeparator} finds that the first record is split
 *   only by semicolons or tabs (files saved with a comma as the decimal mark use ";").
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

/** The separator a file most likely uses: ",", ";" or "\t", judged from its first line outside quotes. */
export function sniffSeparator(text: string): ',' | ';' | '\t' {
  let inQuotes = false;
  const counts = { ',': 0, ';': 0, '\t': 0 };
  for (let i = 0; i < text.length; i++) {
    const ch = text[i]!;
    if (ch === '"') inQuotes = !inQuotes;
    else if (!inQuotes && (ch === '\n' || ch === '\r')) break;
    else if (!inQuotes && (ch === ',' || ch === ';' || ch === '\t')) counts[ch]++;
  }
  if (counts[','] === 0 && counts[';'] > 0 && counts[';'] >= counts['\t']) return ';';
  if (counts[','] === 0 && counts['\t'] > 0) return '\t';
  return ',';
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
