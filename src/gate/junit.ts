// JUnit XML for CI test tabs: one testsuite per problem, one testcase per run (classname =
// problem, name = method and setting), one <failure> per regression. Runs missing with
// --allow-missing are <skipped>; new runs pass (they have nothing to be checked against).
import type { Comparison, RunComparison } from './compare.js';
import { settingText } from './format.js';
import { thresholdsText } from './report-text.js';

// XML 1.0 forbids most control characters even when escaped.
const INVALID_XML = /[^\u0009\u000A\u000D\u0020-\uD7FF\uE000-\uFFFD\u{10000}-\u{10FFFF}]/gu;

export function xmlText(s: string): string {
  return s.replace(INVALID_XML, '\uFFFD').replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

/** Attribute value (double-quoted); newlines and tabs are kept as character references. */
export function xmlAttr(s: string): string {
  return xmlText(s).replace(/"/g, '&quot;').replace(/'/g, '&apos;').replace(/\n/g, '&#10;').replace(/\r/g, '&#13;').replace(/\t/g, '&#9;');
}

export function testcaseName(r: Pick<RunComparison, 'method' | 'setting'>): string {
  return `${r.method} ${settingText(r.setting)}`;
}

export function junitXml(c: Comparison, options: { suiteName?: string; timestamp?: string } = {}): string {
  const name = options.suiteName ?? 'stepgauge check';
  const byProblem = new Map<string, RunComparison[]>();
  for (const r of c.runs) {
    const list = byProblem.get(r.problem) ?? [];
    list.push(r);
    byProblem.set(r.problem, list);
  }
  const failures = (rs: RunComparison[]) => rs.filter((r) => r.regressions.length > 0).length;
  const skipped = (rs: RunComparison[]) => rs.filter((r) => (r.state === 'missing' || r.state === 'not-comparable') && r.regressions.length === 0).length;
  const lines: string[] = ['<?xml version="1.0" encoding="UTF-8"?>'];
  lines.push(
    `<testsuites name="${xmlAttr(name)}" tests="${c.runs.length}" failures="${failures(c.runs)}" errors="0" skipped="${skipped(c.runs)}" time="0">`,
  );
  for (const [problem, runs] of byProblem) {
    const ts = options.timestamp ? ` timestamp="${xmlAttr(options.timestamp)}"` : '';
    lines.push(
      `  <testsuite name="${xmlAttr(problem)}" tests="${runs.length}" failures="${failures(runs)}" errors="0" skipped="${skipped(runs)}" time="0"${ts}>`,
    );
    if (problem === c.runs[0]?.problem) {
      lines.push(`    <properties><property name="thresholds" value="${xmlAttr(thresholdsText(c))}"/></properties>`);
    }
    for (const r of runs) {
      const open = `    <testcase classname="${xmlAttr(problem)}" name="${xmlAttr(testcaseName(r))}" time="0"`;
      const body: string[] = [];
      for (const f of r.regressions) {
        const detail = [f.text, `run: ${r.key}`, `old: ${String(f.old)}`, `new: ${String(f.new)}`, `factor: ${f.factor === null ? 'n/a' : String(f.factor)}`, `limit: ${f.limit}`].join('\n');
        body.push(`      <failure message="${xmlAttr(f.text)}" type="${xmlAttr(f.kind)}">${xmlText(detail)}</failure>`);
      }
      if ((r.state === 'missing' || r.state === 'not-comparable') && r.regressions.length === 0) body.push(`      <skipped message="${xmlAttr(r.notes.join('; '))}"/>`);
      const notes = [...r.improvements.map((f) => `improved: ${f.text}`), ...r.notes];
      if (notes.length > 0) body.push(`      <system-out>${xmlText(notes.join('\n'))}</system-out>`);
      lines.push(body.length === 0 ? `${open}/>` : `${open}>\n${body.join('\n')}\n    </testcase>`);
    }
    lines.push('  </testsuite>');
  }
  lines.push('</testsuites>');
  return `${lines.join('\n')}\n`;
}
