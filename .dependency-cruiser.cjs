/**
 * Layer rules (docs/architecture.md, "Stages"): the rate engine knows no space, the readers and the geometry
 * kernel know no later stage, the map renderer (src/draw) knows no stage, and nothing in the library reaches into the command line.
 * Run by `npm run lint` (depcruise src --config .dependency-cruiser.cjs).
 */
module.exports = {
  forbidden: [
    {
      name: 'agronomy-not-spatial',
      comment: 'src/agronomy decides per location; it imports no spatial or output stage.',
      severity: 'error',
      from: { path: '^src/agronomy/' },
      to: { path: '^src/(geo|surface|zones|prescription|report|variability|check|io|validate|cli)/' },
    },
    {
      name: 'io-geo-first',
      comment:
        'src/io (readers) and src/geo (geometry and CRS kernel) come first; they import no later stage.',
      severity: 'error',
      from: { path: '^src/(io|geo)/' },
      to: {
        path: '^src/(validate|stats|surface|agronomy|zones|prescription|report|variability|check|draw|cli)/',
      },
    },
    {
      name: 'draw-is-neutral',
      comment:
        'src/draw (the map renderer the report and the variability charts share) imports no pipeline stage: only geo, units and the shared types.',
      severity: 'error',
      from: { path: '^src/draw/' },
      to: { path: '^src/', pathNot: '^src/(draw|geo|units)/|^src/types[.]ts$' },
    },
    {
      name: 'variability-not-report',
      comment:
        'src/variability draws with src/draw and imports nothing of src/report; the orchestrator turns its charts into report entries (src/prescription/sulphurCharts.ts).',
      severity: 'error',
      from: { path: '^src/variability/' },
      to: { path: '^src/report/' },
    },
    {
      name: 'nothing-imports-cli',
      comment: 'the library never depends on the command line (which touches process, console and files).',
      severity: 'error',
      from: { path: '^src/', pathNot: '^src/cli/' },
      to: { path: '^src/cli/' },
    },
    {
      name: 'no-circular',
      severity: 'warn',
      from: {},
      to: { circular: true },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.json' },
  },
};
