// The layer rules of harness/, checked by dependency-cruiser in `npm test` (npm run layers).
// LAYERS is the one place the allowed direction of every folder is written: each folder may import
// itself and the folders listed for it, nothing else of harness/. The list reads bottom-up, as the
// data path does (DEVELOPERS.md draws it). Subfolders belong to their top folder (builds/process
// is builds). Any cycle, between files or between folders, fails too.

/** folder → the harness folders it may import (besides itself). */
const LAYERS = {
  // Foundations: imported by all, importing no other harness folder.
  files: [], // validated files (YAML/JSON positions, schema, issues, did-you-mean), atomic writes
  contract: [], // the tick contract: Observation, Action, gait names, stance/swing
  plant: ['contract'],
  scenario: ['contract', 'plant', 'files'],
  builds: ['contract', 'plant', 'files'],
  score: ['contract', 'plant', 'scenario', 'files'],
  results: ['score', 'scenario', 'plant', 'contract', 'files'],
  // Engines: each knows the layers below, none knows a command.
  run: ['results', 'score', 'builds', 'scenario', 'plant', 'contract', 'files'],
  gate: ['results', 'score', 'scenario', 'files'],
  margin: ['run', 'results', 'score', 'scenario', 'builds', 'files'],
  bench: ['run', 'results', 'score', 'builds', 'scenario', 'plant', 'contract', 'files'],
  report: ['gate', 'results', 'score', 'scenario', 'plant', 'contract', 'files'],
  config: ['gate', 'builds', 'scenario', 'files'],
  // One function per command over the engines; the CLI is a yargs table over the commands.
  commands: ['config', 'report', 'bench', 'margin', 'gate', 'run', 'results', 'score', 'builds', 'scenario', 'plant', 'contract', 'files'],
  // Nights remembered and the bisect over commits: built on whole commands (a bisect step is a run).
  history: ['commands', 'config', 'report', 'bench', 'gate', 'run', 'results', 'score', 'builds', 'scenario', 'plant', 'contract', 'files'],
  // Robot logs into scenarios, and replays against them: import and replay are whole commands.
  recorded: ['commands', 'config', 'report', 'bench', 'gate', 'run', 'results', 'score', 'builds', 'scenario', 'plant', 'contract', 'files'],
  cli: ['history', 'recorded', 'commands', 'config'],
};

const FOLDERS = Object.keys(LAYERS);
/** Files at the top of harness/ (version.ts) import nothing of harness/ and are open to all. */
const ROOT_FILE = '[^/]+\\.ts$';

const layerRules = FOLDERS.map((folder) => ({
  name: `layer-${folder}`,
  comment: `harness/${folder} may import only ${LAYERS[folder].length ? LAYERS[folder].join(', ') : 'no other harness folder'} (.dependency-cruiser.cjs LAYERS)`,
  severity: 'error',
  from: { path: `^harness/${folder}/` },
  to: { path: '^harness/', pathNot: `^harness/(${[folder, ...LAYERS[folder]].join('|')})/|^harness/${ROOT_FILE}` },
}));

/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    ...layerRules,
    {
      name: 'folder-unknown',
      comment: 'every folder of harness/ has its place in LAYERS',
      severity: 'error',
      from: { path: '^harness/', pathNot: `^harness/(${FOLDERS.join('|')})/|^harness/${ROOT_FILE}` },
      to: {},
    },
    {
      name: 'root-file-imports',
      comment: 'files at the top of harness/ are open to all, so they import nothing of harness/',
      severity: 'error',
      from: { path: `^harness/${ROOT_FILE}` },
      to: { path: '^harness/' },
    },
    {
      name: 'no-file-cycle',
      comment: 'no cycle between files',
      severity: 'error',
      from: { path: '^harness/' },
      to: { circular: true },
    },
    {
      name: 'no-folder-cycle',
      comment: 'no cycle between folders',
      severity: 'error',
      scope: 'folder',
      from: { path: '^harness/' },
      to: { circular: true },
    },
  ],
  options: {
    includeOnly: '^harness/',
    tsConfig: { fileName: 'tsconfig.json' },
    // Type-only imports are dependencies too: a contract in the wrong folder is still a wrong arrow.
    tsPreCompilationDeps: true,
    enhancedResolveOptions: { extensions: ['.ts', '.mts', '.js', '.mjs', '.json'] },
  },
};
