// Writes `choose --out DIR`: decision.json, decision.md, decision.html and the plot PNG the
// Markdown links to, all at once (a temporary folder renamed into place).
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { ControllerKind, Problem } from '../core/types.js';
import type { Choice } from '../sweep/choose.js';
import { decisionRecord } from './decision-record.js';
import { environmentFingerprint } from '../measure/environment.js';
import { writeFolderAtomically } from '../results/atomic.js';
import { decisionHtml, decisionMarkdown, decisionPlotSpec } from '../report/decision.js';
import { renderPlot } from '../report/plots/render.js';

export async function writeDecisionFolder(dir: string, choice: Choice, problem: Problem, context: { commandLine: string; maxSteps: number; controller: ControllerKind }): Promise<void> {
  const record = decisionRecord(choice, problem, { environment: await environmentFingerprint(), ...context });
  const spec = decisionPlotSpec(record);
  const png = spec ? renderPlot(spec) : undefined;
  await writeFolderAtomically(dir, async (tmp) => {
    await writeFile(join(tmp, 'decision.json'), `${JSON.stringify(record, null, 2)}\n`);
    await writeFile(join(tmp, 'decision.md'), decisionMarkdown(record, png && spec ? spec.file : undefined));
    await writeFile(join(tmp, 'decision.html'), decisionHtml(record, png));
    if (png && spec) await writeFile(join(tmp, spec.file), png);
  });
}
