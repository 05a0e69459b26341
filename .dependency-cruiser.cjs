// The layer rules of DEVELOPERS.md ("Layers"), checked by `npm test` (npm run depcruise) with no
// exceptions: each folder may import only itself and the folders listed for it, and nothing may
// import in a circle. test/layers.test.ts shows that a wrong import fails this check.
/** folder -> the folders it may import (besides itself). Lower layers come later in the list. */
const LAYERS = {
  'src/cli': ['src/sweep', 'src/report', 'src/gate', 'src/measure', 'src/authoring', 'problems', 'src/methods', 'src/problems', 'src/results', 'src/core'],
  'src/sweep': ['src/measure', 'src/authoring', 'problems', 'src/methods', 'src/problems', 'src/results', 'src/core'],
  'src/report': ['src/results', 'src/core'],
  'src/gate': ['src/results', 'src/core'],
  'src/measure': ['src/methods', 'src/problems', 'src/results', 'src/core'],
  'src/authoring': ['src/methods', 'src/problems', 'src/core'],
  problems: ['src/problems', 'src/core'],
  'src/methods': ['src/core'],
  'src/problems': ['src/core'],
  'src/results': ['src/core'],
  'src/core': [],
};

const folder = (f) => `^${f.replace('/', '\\/')}\\/`;
const layerRules = Object.entries(LAYERS).map(([from, allowed]) => ({
  name: `layer-${from.replace('/', '-')}`,
  comment: `${from}/ may import ${allowed.length ? allowed.map((a) => `${a}/`).join(', ') : 'nothing else'} and itself`,
  severity: 'error',
  from: { path: folder(from) },
  to: { path: '^(src|problems)/', pathNot: [from, ...allowed].map(folder) },
}));

module.exports = {
  forbidden: [
    ...layerRules,
    {
      name: 'no-circular',
      comment: 'an import cycle ties modules that should be layered; move the shared piece down',
      severity: 'error',
      from: {},
      to: { circular: true },
    },
    {
      name: 'not-to-unresolvable',
      severity: 'error',
      from: {},
      to: { couldNotResolve: true },
    },
    {
      name: 'public-api-only-in-index',
      comment: 'src/index.ts is the public API: nothing inside the package imports it',
      severity: 'error',
      from: { path: '^(src|problems)/', pathNot: '^src/index\\.ts$' },
      to: { path: '^src/index\\.ts$' },
    },
  ],
  options: {
    includeOnly: '^(src|problems)/',
    tsPreCompilationDeps: true,
    parser: 'swc',
    tsConfig: { fileName: 'tsconfig.json' },
    enhancedResolveOptions: { extensions: ['.ts', '.js'] },
  },
};
