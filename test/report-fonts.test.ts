// The plot font ships with the tool, so PNG text does not depend on the machine's fonts.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { FONT_ALIAS, packagedFont, plotFont } from '../src/report/plots/fonts.js';

describe('plot font', () => {
  it('is the packaged DejaVu Sans, a TrueType file', () => {
    const file = packagedFont();
    expect(file).not.toBeNull();
    expect(file!).toMatch(/dejavu-fonts-ttf[\\/]ttf[\\/]DejaVuSans\.ttf$/);
    // sfnt version 0x00010000 opens a TrueType-outline font (OpenType spec, "Organization of an
    // OpenType font", table directory).
    expect([...readFileSync(file!).subarray(0, 4)]).toEqual([0, 1, 0, 0]);
  });

  it('is the one the plots register and name', () => {
    expect(plotFont()).toEqual({ family: FONT_ALIAS, file: packagedFont() });
  });
});
