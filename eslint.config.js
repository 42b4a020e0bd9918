import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import importPlugin from 'eslint-plugin-import';
import globals from 'globals';

const FEATURES_DIR = './src/features';
/** Every feature folder; each is its own zone (bulletproof-react's restricted paths). */
const features = readdirSync(join(import.meta.dirname, FEATURES_DIR), { withFileTypes: true })
  .filter((entry) => entry.isDirectory())
  .map((entry) => entry.name);

/**
 * Import zones: which folders may import which. The architecture in DEVELOPERS.md says why;
 * tests/lint/import-zones.test.ts proves a forbidden import fails the lint.
 */
export const IMPORT_ZONES = [
  { target: './shared', from: ['./server', './src', './simulator'], message: 'shared/ is imported by every side and imports none of them.' },
  { target: './src', from: ['./server', './simulator'], message: 'The client reaches the server over HTTP and WebSocket only.' },
  { target: './server', from: ['./src'], message: 'The server never imports the client.' },
  { target: './simulator', from: ['./server', './src'], message: 'The simulator imports shared/ only.' },
  ...features.map((feature) => ({
    target: `${FEATURES_DIR}/${feature}`,
    from: FEATURES_DIR,
    except: [`./${feature}`],
    message: 'Features do not import each other: move what two features need to src/components or src/lib.',
  })),
  {
    // Domain code (everything but the HTTP layer with its route files in server/http/routes,
    // sign-in middleware and the composition root) throws domain errors and knows no HTTP.
    target: './server/!(http|auth|compose)/**/*.ts',
    from: ['./server/http', './node_modules/express', './node_modules/@types/express', './node_modules/multer'],
    message: 'Domain code knows no HTTP: throw an error from server/domain/domain-errors.ts; server/http maps it to a status.',
  },
  {
    target: './server/runs',
    from: './server/archive',
    except: ['./run-archive.ts', './archive-reader.ts'],
    message: "runs/ hands readings to the archive's sink and reads through archive-reader.ts; the archive encodes its own blocks.",
  },
  { target: './server/runs', from: './server/live', message: 'The recorder does not publish into live/: the composition root wires the hub as a sink.' },
  {
    target: './server/live',
    from: ['./server/runs', './server/archive', './server/journal'],
    message: 'The live hub is a sink: it knows readings, not the recorder, the archive or the journal (server/compose wires them).',
  },
  {
    target: './server/benches',
    from: ['./server/runs/run-recorder.ts', './server/runs/run-session.ts', './server/live', './server/mqtt', './server/alarms'],
    message: 'The benches area stores benches and exposes factories: server/compose builds the bench manager and connects its frames to the recorder and the hub.',
  },
  {
    target: './server/alarms',
    from: ['./server/runs/run-recorder.ts', './server/runs/run-session.ts', './server/live', './server/mail', './server/ingest/bench-manager.ts'],
    message: 'The alarms are a sink: they expose a factory and sink functions, and server/compose connects them to the recorder and to outbound mail.',
  },
  {
    // Only server.ts (and the old live/attach-live.ts alias) take the composition root; the areas it wires never do.
    target: ['./server/!(compose|live)/**/*.ts', './server/live/!(attach-live).ts'],
    from: './server/compose',
    message: 'The composition root wires the areas; they do not import it back.',
  },
];

export default tseslint.config(
  // tests/lint/fixtures holds a deliberate import cycle; import-zones.test.ts lints it with ignores off.
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**', 'tests/lint/fixtures/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
    },
  },
  {
    files: ['shared/**/*.ts', 'server/**/*.ts', 'src/**/*.{ts,tsx}', 'simulator/**/*.ts', 'tests/lint/fixtures/**/*.ts'],
    plugins: { import: importPlugin },
    settings: {
      'import/parsers': { '@typescript-eslint/parser': ['.ts', '.tsx'] },
      'import/resolver': { typescript: { project: ['./tsconfig.json', './tsconfig.node.json'], noWarnOnMultipleProjects: true } },
    },
    rules: {
      'import/no-restricted-paths': ['error', { zones: IMPORT_ZONES }],
      'import/no-cycle': ['error', { ignoreExternal: true }],
    },
  },
);
