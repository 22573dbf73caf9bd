/**
 * The layering of src/, checked in CI (`npm run lint:layers`, also run by the test suite).
 * Rooms from the bottom up; a file may import from its own room and from rooms below it, never from one
 * above. A strict order also means that no two rooms import each other.
 */
const ROOMS = [
  'core', // the one bad-input error type; numerical methods with no physics (quadrature, interpolation)
  'units', // quantity strings ⇄ SI numbers
  'conductors', // geometry and materials → L′, R′, armature mass and resistance; heating of conductors
  'scenario', // schema, loading, validation, defaults → Scenario
  'model', // the equations of the shot model
  'solve', // the hybrid integrator → Shot
  'checks', // engineering verdicts and warnings on a finished shot
  'output', // terminal text, CSV, provenance, atomic no-clobber files
  'report', // every HTML page
  'pipeline', // scenario → Shot → assessment → record, computed once, used by every command
  'measure', // measured records, overlay, calibration
  'study', // sweeps, shards, merge, compare, sizing
  'design', // the design page: its browser simulator (bundled by scripts/build.mjs) and the page that carries it
  'cli', // commander wiring only
];

/** Rooms that compute and must not touch files, processes or the network. */
const PURE = ['core', 'conductors', 'model', 'solve', 'checks'];

const upward = ROOMS.map((room, rank) => ({
  name: `no-upward-import-from-${room}`,
  comment: `src/${room}/ may import only from its own room and from ${ROOMS.slice(0, rank).join(', ') || 'no other room'}`,
  severity: 'error',
  from: { path: `^src/${room}/` },
  to: { path: `^src/(${ROOMS.slice(rank + 1).join('|') || '$^'})/` },
})).filter((rule) => !rule.to.path.includes('($^)'));

module.exports = {
  forbidden: [
    ...upward,
    {
      name: 'no-io-in-pure-rooms',
      comment: `${PURE.join(', ')} compute; reading and writing belong to output, report, pipeline, study, measure and cli`,
      severity: 'error',
      from: { path: `^src/(${PURE.join('|')})/` },
      to: { dependencyTypes: ['core'], path: '^(node:)?(fs|fs/promises|child_process|worker_threads|net|http|https|readline)$' },
    },
    {
      name: 'no-unknown-room',
      comment: `every source file lives in one of the rooms: ${ROOMS.join(', ')} (or is src/version.ts)`,
      severity: 'error',
      from: { path: '^src/', pathNot: `^src/((${ROOMS.join('|')})/|version\\.ts$)` },
      to: {},
    },
    {
      name: 'no-circular',
      comment: 'modules do not import each other in a cycle',
      severity: 'error',
      from: { path: '^src/' },
      to: { circular: true },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    tsPreCompilationDeps: true,
    enhancedResolveOptions: { exportsFields: ['exports'], conditionNames: ['import', 'require', 'node', 'default'], extensions: ['.ts', '.js', '.mjs', '.json'] },
  },
};
