// Matching what a user typed against known ids: case-insensitive, with close spellings offered
// when nothing matches ("did you mean ...").

/** Edit distance (insertions, deletions, substitutions), Levenshtein's. */
export function editDistance(a: string, b: string): number {
  const prev = new Array<number>(b.length + 1);
  for (let j = 0; j <= b.length; j++) prev[j] = j;
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0]!;
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const up = prev[j]!;
      prev[j] = Math.min(up + 1, prev[j - 1]! + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = up;
    }
  }
  return prev[b.length]!;
}

/**
 * Up to three known names closest to `typed` (case-insensitive): those within a third of the
 * longer name's length in edits, or that contain it or are contained in it.
 */
export function closestNames(typed: string, known: readonly string[]): string[] {
  const t = typed.toLowerCase();
  return known
    .map((k) => {
      const l = k.toLowerCase();
      const d = editDistance(t, l);
      const near = d <= Math.max(2, Math.floor(Math.max(t.length, l.length) / 3)) || (t.length >= 3 && (l.includes(t) || t.includes(l)));
      return { k, d, near };
    })
    .filter((x) => x.near)
    .sort((a, b) => a.d - b.d || (a.k < b.k ? -1 : 1))
    .slice(0, 3)
    .map((x) => x.k);
}
