/**
 * Writing the runner's `--out` copy without ever destroying an input.
 *
 * An output is refused when it is, or would become, one of the inputs, however it is named: the
 * same path, a symbolic link to an input (or an input that is a link to the output), a path
 * through a linked folder, or a hard link (same device and inode). An existing file is refused
 * unless `force` is set. The bytes go to a temporary file in the output's own folder, created
 * exclusively, which then takes the output's name: by a hard link (fails if the name appeared in
 * the meantime) without `force`, by a rename with it. A reader never sees a half-written copy.
 */
import { randomBytes } from 'node:crypto';
import { closeSync, fsyncSync, linkSync, lstatSync, openSync, realpathSync, renameSync, statSync, unlinkSync, writeSync, type Stats } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';

/** Thrown when the output must not be written; the message names the file and the reason. */
export class OutputRefusedError extends Error {
  override readonly name = 'OutputRefusedError';
}

/** `stat` that returns undefined for a missing path instead of throwing. */
function statOrUndefined(path: string, follow: boolean): Stats | undefined {
  try {
    return follow ? statSync(path) : lstatSync(path);
  } catch (e) {
    if ((e as { code?: string }).code === 'ENOENT') return undefined;
    throw e;
  }
}

/** The real path a new file at `path` would have: the real folder plus the name. */
function realTarget(path: string): string {
  const abs = resolve(path);
  const st = statOrUndefined(abs, true);
  if (st !== undefined) return realpathSync(abs);
  let dir: string;
  try {
    dir = realpathSync(dirname(abs));
  } catch {
    throw new OutputRefusedError(`--out "${path}": its folder does not exist.`);
  }
  return join(dir, basename(abs));
}

/**
 * Checks that writing `out` cannot touch any of `inputs`, and that `out` does not exist unless
 * `force`. Compares real paths (links in the path and the file resolved) and device + inode.
 * O(number of inputs) file-system calls.
 * @param out the output path as given.
 * @param inputs the input files as given (each must exist).
 * @param force true to allow replacing an existing file that is not an input; default false.
 * @throws OutputRefusedError naming the reason: it is an input, it exists, or its folder is missing.
 * @example checkOutput('copy.xlsx', ['in.xlsx'], false) // → undefined (no error) when copy.xlsx is new
 */
export function checkOutput(out: string, inputs: readonly string[], force = false): void {
  const target = realTarget(out);
  const outStat = statOrUndefined(target, true);
  const outLink = statOrUndefined(resolve(out), false);
  for (const input of inputs) {
    const inReal = realpathSync(resolve(input));
    const inStat = statSync(inReal);
    const sameFile = outStat !== undefined && outStat.dev === inStat.dev && outStat.ino === inStat.ino;
    if (inReal === target || sameFile) {
      throw new OutputRefusedError(`--out "${out}" is the input workbook "${input}" (under another name); the input is never modified. Name a new file.`);
    }
  }
  if (outLink !== undefined && !force) {
    throw new OutputRefusedError(`--out "${out}" already exists; name a new file, or add --force to replace it.`);
  }
  if (outStat !== undefined && !outStat.isFile()) {
    throw new OutputRefusedError(`--out "${out}" exists and is not a regular file; name a new file.`);
  }
}

/**
 * Writes `bytes` to `out` after {@link checkOutput}: to a temporary file created exclusively in
 * the output's real folder, flushed, then given the output's name (a hard link without `force`,
 * so an output that appeared meanwhile is never replaced; a rename with `force`). The temporary
 * file is removed on every failure. O(bytes).
 * @param out the output path; @param bytes the file's content; @param inputs files that must not be touched;
 * @param force replace an existing output (default false).
 * @throws OutputRefusedError as {@link checkOutput}, or when the output appeared while writing.
 * @example writeOutputSafely('copy.xlsx', bytes, ['in.xlsx']) // → copy.xlsx holds bytes; in.xlsx untouched
 */
export function writeOutputSafely(out: string, bytes: Uint8Array, inputs: readonly string[], force = false): void {
  checkOutput(out, inputs, force);
  const target = realTarget(out);
  const linkPath = resolve(out);
  const tmp = join(dirname(target), `.${basename(target)}.${randomBytes(6).toString('hex')}.tmp`);
  const fd = openSync(tmp, 'wx', 0o644);
  try {
    try {
      for (let off = 0; off < bytes.length; ) off += writeSync(fd, bytes, off, bytes.length - off);
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    // Checked again just before the name is taken: the inputs may have been linked meanwhile.
    checkOutput(out, inputs, force);
    if (force) renameSync(tmp, statOrUndefined(linkPath, false)?.isSymbolicLink() ? linkPath : target);
    else {
      try {
        linkSync(tmp, target);
      } catch (e) {
        const code = (e as { code?: string }).code;
        if (code === 'EEXIST') throw new OutputRefusedError(`--out "${out}" appeared while the copy was written; nothing was replaced.`);
        // A file system without hard links: rename after one more check that the name is free.
        if (code !== 'EPERM' && code !== 'ENOTSUP' && code !== 'EOPNOTSUPP') throw e;
        if (statOrUndefined(linkPath, false) !== undefined) throw new OutputRefusedError(`--out "${out}" appeared while the copy was written; nothing was replaced.`);
        renameSync(tmp, target);
        return;
      }
      unlinkSync(tmp);
    }
  } catch (e) {
    try {
      unlinkSync(tmp);
    } catch {
      // already gone (renamed or never linked)
    }
    throw e;
  }
}
