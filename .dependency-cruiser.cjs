/** Layering rules (STYLE.md): core imports no adapter and no platform; nothing imports in a cycle. */
module.exports = {
  forbidden: [
    {
      name: 'no-cycles',
      severity: 'error',
      comment: 'Import cycles make the data flow intake -> schedule -> model -> report impossible to follow.',
      from: {},
      to: { circular: true },
    },
    {
      name: 'core-imports-no-adapter',
      severity: 'error',
      comment: 'src/core is pure: it never imports the Excel adapter, the pane, the page or the command line.',
      from: { path: '^src/core/' },
      to: { path: '^src/(excel|taskpane|web|cli)/' },
    },
    {
      name: 'core-imports-no-platform',
      severity: 'error',
      comment: 'src/core uses no node:* module, no React and no Office.',
      from: { path: '^src/core/' },
      to: { dependencyTypes: ['core'] },
    },
    {
      name: 'core-imports-no-ui-or-io-packages',
      severity: 'error',
      from: { path: '^src/core/' },
      to: { path: 'node_modules/(react|react-dom|@fluentui|@microsoft/office-js|exceljs|papaparse)/' },
    },
    {
      name: 'flow-one-way-intake',
      severity: 'error',
      comment: 'intake is the first layer: it imports none of the later ones.',
      from: { path: '^src/core/intake/' },
      to: { path: '^src/core/(schedule|model|report|pipeline)/' },
    },
    {
      name: 'flow-one-way-schedule',
      severity: 'error',
      from: { path: '^src/core/schedule/' },
      to: { path: '^src/core/(model|report|pipeline)/' },
    },
    {
      name: 'flow-one-way-model',
      severity: 'error',
      from: { path: '^src/core/model/' },
      to: { path: '^src/core/(schedule|report|pipeline)/' },
    },
    {
      name: 'flow-one-way-report',
      severity: 'error',
      from: { path: '^src/core/report/' },
      to: { path: '^src/core/pipeline/' },
    },
    {
      name: 'adapters-do-not-import-each-other',
      severity: 'error',
      from: { path: '^src/(excel|cli)/' },
      to: { path: '^src/(web|cli|excel)/', pathNot: '^src/$1/' },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    tsConfig: { fileName: 'tsconfig.json' },
    tsPreCompilationDeps: true,
    exclude: { path: '(^test/|^bench/|\\.d\\.ts$)' },
  },
};
