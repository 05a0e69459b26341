// One fixed font for every plot, so text metrics (and so the PNG bytes) do not depend on which
// font the system would pick, or on whether it has any. DejaVu Sans ships with the tool (the
// dejavu-fonts-ttf package, the DejaVu fonts' own TrueType files); common system paths are the
// fallback when that package cannot be found (a bundled or pruned install), and without any of
// them @napi-rs/canvas falls back to its own default.
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { GlobalFonts } from '@napi-rs/canvas';

export const FONT_ALIAS = 'StepgaugePlotSans';

/** The packaged DejaVu Sans, or null when the package is not installed. */
export function packagedFont(): string | null {
  try {
    return createRequire(import.meta.url).resolve('dejavu-fonts-ttf/ttf/DejaVuSans.ttf');
  } catch {
    return null;
  }
}

/** DejaVu first: it has the superscript digits and minus (U+2070-207B) the tick labels use. */
const SYSTEM_FONTS = [
  '/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf',
  '/usr/share/fonts/TTF/DejaVuSans.ttf',
  '/usr/share/fonts/dejavu/DejaVuSans.ttf',
  '/usr/share/fonts/dejavu-sans-fonts/DejaVuSans.ttf',
  '/usr/share/fonts/truetype/liberation/LiberationSans-Regular.ttf',
  '/usr/share/fonts/liberation/LiberationSans-Regular.ttf',
  '/System/Library/Fonts/Supplemental/Arial.ttf',
  'C:\\Windows\\Fonts\\arial.ttf',
];

let resolved: { family: string; file: string | null } | null = null;

/** The font family to name in chart options, registering it on first use. */
export function plotFont(): { family: string; file: string | null } {
  if (resolved) return resolved;
  const packaged = packagedFont();
  for (const file of packaged ? [packaged, ...SYSTEM_FONTS] : SYSTEM_FONTS) {
    if (existsSync(file) && GlobalFonts.registerFromPath(file, FONT_ALIAS)) {
      resolved = { family: FONT_ALIAS, file };
      return resolved;
    }
  }
  resolved = { family: 'sans-serif', file: null };
  return resolved;
}
