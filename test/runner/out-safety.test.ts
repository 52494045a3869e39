/**
 * `npm run sheet -- in.xlsx --out X` never destroys an input: X a symbolic link or a hard link to
 * the input, a path through a linked folder, an input given as a link to X, and an existing X
 * (without --force) are each refused with exit code 2, the input byte-identical afterwards; a new
 * X is written through a temporary file in its folder that leaves nothing behind. The rules are
 * the project's own (README, "npm run sheet"); the checks use only the file system.
 */
import { createHash } from 'node:crypto';
import { copyFileSync, linkSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import '../../src/runner/ratchet.js';
import { runSheet } from '../../src/runner/cli.js';
import { checkOutput, OutputRefusedError, writeOutputSafely } from '../../src/runner/safe-write.js';

const SMALL = join(import.meta.dirname, 'fixtures', 'small.xlsx');
const sha = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');

function capture() {
  const err: string[] = [];
  return { io: { out: () => undefined, err: (s: string) => err.push(s) }, err };
}

/** A fresh folder holding a copy of the small workbook as in.xlsx. */
function folder(): { dir: string; input: string } {
  const dir = mkdtempSync(join(tmpdir(), 'ratchet-out-'));
  const input = join(dir, 'in.xlsx');
  copyFileSync(SMALL, input);
  return { dir, input };
}

async function refused(argv: string[], protect: string, needle: string): Promise<void> {
  const before = sha(protect);
  const c = capture();
  expect(await runSheet(argv, c.io)).toBe(2);
  expect(c.err.join('')).toContain(needle);
  expect(sha(protect)).toBe(before);
}

describe('--out never destroys an input', () => {
  it('refuses X when X is a symbolic link to the input', async () => {
    const { dir, input } = folder();
    symlinkSync(input, join(dir, 'link.xlsx'));
    await refused([input, '--out', join(dir, 'link.xlsx')], input, 'is the input workbook');
  });

  it('refuses X when X is a hard link to the input, even with --force', async () => {
    const { dir, input } = folder();
    linkSync(input, join(dir, 'hard.xlsx'));
    await refused([input, '--out', join(dir, 'hard.xlsx')], input, 'is the input workbook');
    await refused([input, '--out', join(dir, 'hard.xlsx'), '--force'], input, 'is the input workbook');
  });

  it('refuses X when X names the input through a linked folder', async () => {
    const { dir, input } = folder();
    symlinkSync(dir, join(dir, 'same-folder'));
    await refused([input, '--out', join(dir, 'same-folder', 'in.xlsx'), '--force'], input, 'is the input workbook');
  });

  it('refuses X when the input is given as a symbolic link to X', async () => {
    const { dir, input } = folder();
    symlinkSync(input, join(dir, 'alias.xlsx'));
    await refused([join(dir, 'alias.xlsx'), '--out', input, '--force'], input, 'is the input workbook');
  });

  it('refuses an existing X without --force, leaving it unchanged, and replaces it with --force', async () => {
    const { dir, input } = folder();
    const other = join(dir, 'other.xlsx');
    writeFileSync(other, 'keep me');
    await refused([input, '--out', other], other, 'already exists');
    expect(readFileSync(other, 'utf8')).toBe('keep me');
    const c = capture();
    expect(await runSheet([input, '--out', other, '--force'], c.io)).toBe(0);
    expect(readFileSync(other).subarray(0, 2).toString('latin1')).toBe('PK');
  });

  it('writes a new X and leaves no temporary file in its folder', async () => {
    const { dir, input } = folder();
    const before = sha(input);
    const c = capture();
    expect(await runSheet([input, '--out', join(dir, 'copy.xlsx')], c.io)).toBe(0);
    expect(readdirSync(dir).sort()).toEqual(['copy.xlsx', 'in.xlsx']);
    expect(sha(input)).toBe(before);
  });

  it('writeOutputSafely refuses a name that appears after the check and removes its temporary file', () => {
    const { dir, input } = folder();
    const sub = join(dir, 'sub');
    mkdirSync(sub);
    const out = join(sub, 'late.xlsx');
    checkOutput(out, [input]);
    writeFileSync(out, 'arrived first');
    expect(() => writeOutputSafely(out, new Uint8Array([1, 2, 3]), [input])).toThrow(OutputRefusedError);
    expect(readFileSync(out, 'utf8')).toBe('arrived first');
    expect(readdirSync(sub)).toEqual(['late.xlsx']);
  });

  it('--force without --out or --freeze is a usage error', async () => {
    const c = capture();
    expect(await runSheet([SMALL, '--force'], c.io)).toBe(2);
    expect(c.err.join('')).toContain('--force only applies to --out and --freeze');
  });

  it('refuses a --freeze file that is a symbolic link to the input, even with --force', async () => {
    const { dir, input } = folder();
    symlinkSync(input, join(dir, 'frozen.xlsx'));
    await refused([input, '--freeze', join(dir, 'frozen.xlsx'), '--force'], input, 'is the input workbook');
  });
});
