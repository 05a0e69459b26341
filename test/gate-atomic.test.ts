// Atomic writes leave either the old or the new content, never a temporary or a partial folder.
import { describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeFileAtomic, writeFolderAtomically } from '../src/results/atomic.js';
import { OUTPUT_MARKER } from '../src/results/ownership.js';

describe('atomic writes', () => {
  it('replaces a file and leaves no temporary', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-atomic-'));
    const f = join(dir, 'sub', 'a.txt');
    await writeFileAtomic(f, 'one');
    await writeFileAtomic(f, 'two');
    expect(readFileSync(f, 'utf8')).toBe('two');
    expect(readdirSync(join(dir, 'sub'))).toEqual(['a.txt']);
  });

  it('replaces a folder it wrote and keeps it intact when filling fails', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-atomic-'));
    const target = join(dir, 'report');
    mkdirSync(target);
    writeFileSync(join(target, 'old.txt'), 'old');
    writeFileSync(join(target, OUTPUT_MARKER), 'x');
    await expect(
      writeFolderAtomically(target, async (tmp) => {
        writeFileSync(join(tmp, 'half.txt'), 'half');
        throw new Error('interrupted');
      }),
    ).rejects.toThrow('interrupted');
    expect(readdirSync(target).sort()).toEqual([OUTPUT_MARKER, 'old.txt']);
    expect(readdirSync(dir)).toEqual(['report']);
    await writeFolderAtomically(target, async (tmp) => {
      expect(existsSync(target)).toBe(true); // the old report stays readable while filling
      writeFileSync(join(tmp, 'new.txt'), 'new');
    });
    expect(readdirSync(target).sort()).toEqual([OUTPUT_MARKER, 'new.txt']);
    expect(readdirSync(dir)).toEqual(['report']);
  });

  it('refuses a non-empty folder it did not write, before filling, and leaves it as it was', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-atomic-'));
    const target = join(dir, 'mine');
    mkdirSync(target);
    writeFileSync(join(target, 'notes.txt'), 'keep');
    let filled = false;
    await expect(
      writeFolderAtomically(target, async () => {
        filled = true;
      }),
    ).rejects.toThrow(/is a folder stepgauge did not write/);
    expect(filled).toBe(false);
    expect(readdirSync(target)).toEqual(['notes.txt']);
    expect(readdirSync(dir)).toEqual(['mine']);
  });
});
