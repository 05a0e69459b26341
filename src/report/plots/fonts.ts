// One fixed font for every plot, so text metrics (and so the PNG bytes) do not depend on which
// font the system would pick. No font ships in node_modules, so common system paths are tried
// in order; without any of them @napi-rs/canvas falls back to its own default.
import { existsSync } from 'node:fs';
import { GlobalFonts } from '@napi-rs/canvas';

export const FONT_ALIAS = 'StepgaugePlotSans';

/** DejaVu first: it has the superscript digits and minus (U+2070-207B) the tick labels use. */
const CANDIDATES = [
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
  for (const file of CANDIDATES) {
    if (existsSync(file) && GlobalFonts.registerFromPath(file, FONT_ALIAS)) {
      resolved = { family: FONT_ALIAS, file };
      return resolved;
    }
  }
  resolved = { family: 'sans-serif', file: null };
  return resolved;
}
