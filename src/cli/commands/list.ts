// `stepgauge list`: the built-in problems and methods, as a table or as JSON.
// Command modules load what their action needs when it runs (see DEVELOPERS.md, "CLI start-up").
import type { RegisterCommand } from './register.js';

export const registerList: RegisterCommand = (program) => {
  program
    .command('list')
    .description('list built-in problems and methods with family, order and source')
    .option('--json', 'print { methods, problems } as JSON')
    .action(async (flags: { json?: boolean }) => {
      const { builtinMethods } = await import('../../methods/registry.js');
      const { catalogue } = await import('../../../problems/index.js');
      const { methodRecord, problemRecord } = await import('../../sweep/run.js');
      const builtins = builtinMethods();
      const methods = builtins.map(methodRecord);
      const problems = catalogue.map((p) => problemRecord(p));
      if (flags.json) {
        process.stdout.write(`${JSON.stringify({ methods, problems }, null, 2)}\n`);
        return;
      }
      // One column width for every id, so long method names keep the table aligned.
      const width = Math.max(26, ...problems.map((p) => p.id.length), ...builtins.map((m) => m.id.length));
      const out: string[] = ['Problems'];
      for (const p of problems) {
        const ref = p.reference.kind + (p.reference.digits ? `, ${p.reference.digits} digits` : '');
        const ratio = p.stiffnessRatio ? `stiffness ratio ${p.stiffnessRatio.toExponential(1)}` : 'stiffness ratio n/a';
        out.push(`  ${p.id.padEnd(width)} ${p.stiff ? 'stiff    ' : 'non-stiff'} ${String(p.dimension).padStart(2)} states  reference ${ref}; ${ratio}`);
        out.push(`  ${''.padEnd(width)} ${p.title}; ${String(p.source)}`);
      }
      out.push('', 'Methods');
      builtins.forEach((b, i) => {
        const m = methods[i]!;
        const only = b.needsSecondOrder ? "; second-order problems only (q' = v)" : b.needsSeparable ? '; separable problems only' : b.needsLinear ? '; linear problems only' : '';
        out.push(`  ${String(m.id).padEnd(width)} ${String(m.family).padEnd(18)} order ${String(m.order).padEnd(3)} ${m.stiff ? 'stiff ' : '      '} ${String(m.name)}${only}`);
        out.push(`  ${''.padEnd(width)} ${String(m.source)}`);
      });
      if (methods.length === 0) out.push('  (none registered)');
      process.stdout.write(`${out.join('\n')}\n`);
    });
};
