import { readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');
const ZONES = 'import/no-restricted-paths';
/** Linting starts the TypeScript resolver once per instance: a few seconds on a busy machine. */
const LINT_TIMEOUT_MS = 60_000;

// Fixture strings are linted as if they sat at the given path; they are not on disk, and the
// cycle rule needs every module on disk, so it is off for these (the cycle case writes files).
const eslint = new ESLint({ cwd: ROOT, overrideConfig: { rules: { 'import/no-cycle': 'off' } } });

async function ruleIds(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: join(ROOT, filePath) });
  return result!.messages.map((m) => m.ruleId ?? `fatal: ${m.message}`);
}

/** Some module of a feature other than `runs` (whichever exists), for the feature-to-feature case. */
function otherFeatureModule(): string {
  const features = join(ROOT, 'src', 'features');
  for (const feature of readdirSync(features, { withFileTypes: true })) {
    if (!feature.isDirectory() || feature.name === 'runs') continue;
    const file = readdirSync(join(features, feature.name), { recursive: true, encoding: 'utf8' }).find((f) => /\.tsx?$/.test(f) && !f.includes('.test.'));
    if (file) return `../${relative(features, join(features, feature.name, file)).replace(/\\/g, '/').replace(/\.tsx?$/, '')}`;
  }
  throw new Error('no second feature with a module under src/features');
}

const use = (spec: string, from: string) => `import ${spec} from '${from}';\nexport const used = [${spec.replace(/[{}]|type /g, '')}];\n`;

describe('ESLint import zones (the lint fails on a forbidden import)', () => {
  it.each([
    ['shared/ importing the server', 'shared/measure/zone-fixture.ts', use('{ startServer }', '../../server/server.js')],
    ['shared/ importing the client', 'shared/measure/zone-fixture.ts', use('{ ApiError }', '../../src/lib/api-client.js')],
    ['the client importing the server', 'src/lib/zone-fixture.ts', use('{ RunsRepo }', '../../server/runs/runs-repo')],
    ['one feature importing another', 'src/features/runs/zone-fixture.ts', `import * as other from '${otherFeatureModule()}';\nexport const used = other;\n`],
    ['domain code importing server/http', 'server/runs/zone-fixture.ts', use('{ HttpError }', '../http/http-error.js')],
    ['domain code importing express', 'server/benches/zone-fixture.ts', use('express', 'express')],
    ['a route file in a domain folder (routes live in server/http/routes)', 'server/runs/zone-fixture-routes.ts', use('{ Router }', 'express')],
    ["runs/ importing the archive's encoding", 'server/runs/zone-fixture.ts', use('{ encodeChunk }', '../archive/chunk-encode.js')],
    ['the recorder publishing into live/', 'server/runs/zone-fixture.ts', use('{ LiveHub }', '../live/live-hub.js')],
    ['the live hub knowing the recorder', 'server/live/zone-fixture.ts', use('{ RunRecorder }', '../runs/run-recorder.js')],
    ['an area importing the composition root', 'server/runs/zone-fixture.ts', use('{ attachRecording }', '../compose/recording-root.js')],
    ['the live hub importing the composition root', 'server/live/zone-fixture.ts', use('{ attachRecording }', '../compose/recording-root.js')],
    ['the benches reaching for the recorder', 'server/benches/zone-fixture.ts', use('{ RunRecorder }', '../runs/run-recorder.js')],
    ['the benches building gateway sources themselves', 'server/benches/zone-fixture.ts', use('{ GatewaySource }', '../mqtt/gateway-source.js')],
    ['the benches publishing into live/', 'server/benches/zone-fixture.ts', use('{ LiveHub }', '../live/live-hub.js')],
    ['the alarms reaching for the recorder', 'server/alarms/zone-fixture.ts', use('{ RunRecorder }', '../runs/run-recorder.js')],
    ['the alarms importing the live hub', 'server/alarms/zone-fixture.ts', use('{ LiveHub }', '../live/live-hub.js')],
    ['the alarms building outbound mail', 'server/alarms/zone-fixture.ts', use('{ MailWorker }', '../mail/mail-worker.js')],
  ])('refuses %s', async (_what, filePath, code) => {
    expect(await ruleIds(filePath, code)).toContain(ZONES);
  }, LINT_TIMEOUT_MS);

  it.each([
    ['a route file using server/http', 'server/http/routes/zone-fixture-routes.ts', use('{ HttpError }', '../http-error.js')],
    ["runs/ using the archive's sink and reader", 'server/runs/zone-fixture.ts', `${use('{ writeRunBatch }', '../archive/run-archive.js')}import { readChunks } from '../archive/archive-reader.js';\nexport const r = readChunks;\n`],
    ['domain code throwing domain errors', 'server/benches/zone-fixture.ts', use('{ ConflictError }', '../domain/domain-errors.js')],
    ['a feature using src/lib', 'src/features/runs/zone-fixture.ts', use('{ queryKeys }', '../../lib/queries/query-keys')],
    ['the server using shared/', 'server/runs/zone-fixture.ts', use('{ FrameSchema }', '../../shared/schemas/frame.js')],
    ['the benches reading runs through the repo', 'server/benches/zone-fixture.ts', use('{ RunsRepo }', '../runs/runs-repo.js')],
    ['the alarms using the shared lease worker', 'server/alarms/zone-fixture.ts', use('{ LeaseWorker }', '../queue/lease-worker.js')],
    ['the composition root wiring recorder, benches, alarms and mail', 'server/compose/zone-fixture.ts',
      `${use('{ RunRecorder }', '../runs/run-recorder.js')}import { alarmSink } from '../alarms/alarm-sink.js';\nimport { createOutboundMail } from '../mail/outbound-mail.js';\nimport { GatewaySource } from '../mqtt/gateway-source.js';\nexport const wired = [alarmSink, createOutboundMail, GatewaySource];\n`],
  ])('allows %s', async (_what, filePath, code) => {
    expect(await ruleIds(filePath, code)).toEqual([]);
  }, LINT_TIMEOUT_MS);
});

describe('ESLint refuses import cycles', () => {
  it('reports two modules that import each other', async () => {
    // The fixture folder is in the config's ignores (its cycle is on purpose): lint it with ignores off.
    const withCycles = new ESLint({ cwd: ROOT, ignore: false });
    const [result] = await withCycles.lintFiles(['tests/lint/fixtures/cycle/cycle-a.ts']);
    expect(result!.messages.map((m) => m.ruleId)).toContain('import/no-cycle');
  }, LINT_TIMEOUT_MS);
});
