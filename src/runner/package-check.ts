/**
 * Checks made on a file's bytes before the runner unpacks it as an .xlsx package, so that the
 * files it cannot read get a message that says why:
 *
 * - an encrypted (password-protected) workbook is not a zip package but an OLE compound file
 *   holding the streams "EncryptionInfo" and "EncryptedPackage" (MS-OFFCRYPTO, section 2.3.4);
 * - an Excel 97–2003 workbook (.xls) is an OLE compound file without them (MS-CFB signature
 *   D0 CF 11 E0 A1 B1 1A E1);
 * - a package that would unpack to more than {@link MAX_UNPACKED_BYTES} (a "zip bomb", or a
 *   workbook too large to hold in memory) is refused before anything is unpacked: the sizes
 *   declared in the zip central directory are added up (APPNOTE.TXT 4.3.12), ZIP64 entries
 *   count as oversized, and every deflated entry is then inflated with an output limit of its
 *   declared size, so an entry that lies about its size is caught as well.
 */
import { inflateRawSync } from 'node:zlib';

/** Most bytes a workbook package may unpack to (all parts together): 1 GiB. */
export const MAX_UNPACKED_BYTES = 1024 * 1024 * 1024;

/** Why a file cannot be read as a workbook, in words for users. */
export interface PackageProblem {
  readonly kind: 'encrypted' | 'legacy' | 'oversized' | 'damaged';
  /** Completes "Cannot read "<file>": …". */
  readonly reason: string;
}

const CFB_MAGIC = [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1];

/** True when `bytes` contains `text` in UTF-16LE (stream names in a compound file directory). */
function hasUtf16(bytes: Uint8Array, text: string): boolean {
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).includes(Buffer.from(text, 'utf16le'));
}

const mib = (n: number) => `${Math.ceil(n / (1024 * 1024))} MB`;

/**
 * What stands in the way of reading `bytes` as an .xlsx package, or undefined when nothing
 * does (the package may still be damaged in ways only unpacking finds). Cost: O(size) for a
 * compound file; for a zip, O(entries) plus one bounded inflation of the entries.
 * @param bytes the whole file.
 * @param limit most unpacked bytes (default {@link MAX_UNPACKED_BYTES}; tests pass a small one).
 * @example packageProblem(readFileSync('locked.xlsx'))?.kind // → 'encrypted'
 */
export function packageProblem(bytes: Uint8Array, limit = MAX_UNPACKED_BYTES): PackageProblem | undefined {
  if (bytes.length >= 8 && CFB_MAGIC.every((b, i) => bytes[i] === b)) {
    if (hasUtf16(bytes, 'EncryptedPackage') || hasUtf16(bytes, 'EncryptionInfo')) {
      return { kind: 'encrypted', reason: 'it is encrypted (protected with a password to open). Open it in Excel, remove the password (File ▸ Info ▸ Protect Workbook ▸ Encrypt with Password) and save a copy' };
    }
    return { kind: 'legacy', reason: 'it is an Excel 97–2003 workbook (.xls) or another OLE file, not an .xlsx workbook. Save it as .xlsx (Excel Workbook) first' };
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  // End of central directory record: signature 0x06054b50, searched from the end (comment ≤ 65535 bytes).
  let eocd = -1;
  for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 22 - 65535); i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) return undefined; // not a zip: the unpacker says "not an .xlsx workbook"
  const entries = view.getUint16(eocd + 10, true);
  const cdSize = view.getUint32(eocd + 12, true);
  const cdOffset = view.getUint32(eocd + 16, true);
  const oversized = (total: number): PackageProblem => ({
    kind: 'oversized',
    reason: `it would unpack to ${total >= 0xffffffff ? 'more than 4 GB' : mib(total)}, more than the runner's limit of ${mib(limit)} (a damaged file, a "zip bomb", or a workbook too large to calculate in memory)`,
  });
  if (entries === 0xffff || cdOffset === 0xffffffff || cdSize === 0xffffffff) return oversized(0xffffffff);
  if (cdOffset + cdSize > bytes.length) return { kind: 'damaged', reason: 'it is damaged (its zip directory points past the end of the file)' };
  const parts: { method: number; compressed: number; size: number; local: number }[] = [];
  let total = 0;
  let at = cdOffset;
  for (let e = 0; e < entries; e++) {
    if (at + 46 > bytes.length || view.getUint32(at, true) !== 0x02014b50) return { kind: 'damaged', reason: 'it is damaged (its zip directory is broken)' };
    const method = view.getUint16(at + 10, true);
    const compressed = view.getUint32(at + 20, true);
    const size = view.getUint32(at + 24, true);
    const local = view.getUint32(at + 42, true);
    if (size === 0xffffffff || compressed === 0xffffffff || local === 0xffffffff) return oversized(0xffffffff);
    total += size;
    if (total > limit) return oversized(total);
    parts.push({ method, compressed, size, local });
    at += 46 + view.getUint16(at + 28, true) + view.getUint16(at + 30, true) + view.getUint16(at + 32, true);
  }
  // Inflate each deflated entry with its declared size as the limit: a lying entry fails here.
  for (const p of parts) {
    if (p.method !== 8 || p.local + 30 > bytes.length || view.getUint32(p.local, true) !== 0x04034b50) continue;
    const start = p.local + 30 + view.getUint16(p.local + 26, true) + view.getUint16(p.local + 28, true);
    if (start + p.compressed > bytes.length) return { kind: 'damaged', reason: 'it is damaged (a part is cut short)' };
    try {
      inflateRawSync(bytes.subarray(start, start + p.compressed), { maxOutputLength: Math.max(1, p.size) });
    } catch (e) {
      if (e instanceof RangeError || (e as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE') {
        return { kind: 'oversized', reason: 'a part of it unpacks to more than the size its zip directory declares (a damaged file or a "zip bomb")' };
      }
      return { kind: 'damaged', reason: 'it is damaged (a part cannot be unpacked)' };
    }
  }
  return undefined;
}
