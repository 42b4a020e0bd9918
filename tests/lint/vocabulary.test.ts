import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkRepository, checkVocabulary, isChecked, lineViews, type Violation } from './vocabulary.js';

const ROOT = join(import.meta.dirname, '..', '..');
/** git ls-files and reading a few hundred files: well under a second, but the machine is shared. */
const REPO_TIMEOUT_MS = 60_000;

const rulesOf = (file: string, source: string) => checkVocabulary(file, source).map((v) => `${v.line}:${v.rule}:${v.found}`);
const readable = (violations: Violation[]) => violations.map((v) => `${v.file}:${v.line} ${v.found} (${v.rule}): ${v.say}`).join('\n');

describe('the glossary vocabulary in the repository', () => {
  it('finds no old spelling in the TypeScript of server/, shared/, src/, simulator/ and bench/', () => {
    const violations = checkRepository(ROOT);
    expect(readable(violations)).toBe('');
  }, REPO_TIMEOUT_MS);
});

describe('the vocabulary checker on planted text', () => {
  it('refuses a reading called a sample, as a variable, a parameter, a file-level name or a member', () => {
    const planted = [
      'const samples = state.pending;',
      'export function publish(sample: LiveReading) {}',
      'const SAMPLE_AXIS = {};',
      'send(hub.sampleData);',
    ].join('\n');
    expect(rulesOf('server/live/live-hub.ts', planted)).toEqual([
      '1:sample-for-reading:samples',
      '2:sample-for-reading:sample',
      '3:sample-for-reading:SAMPLE_AXIS',
      '4:sample-for-reading:sampleData',
    ]);
  });

  it('reads the word in comments and string text as English, not as a name', () => {
    const planted = [
      '// the first sample below 2.7 V, as the authors count it',
      "it('keeps a one-sample spike', () => {",
      '  const url = `/api/runs/${id}/samples`; /* the old address */',
      "  const re = /samples?/;",
      '});',
    ].join('\n');
    expect(rulesOf('shared/measure/x.test.ts', planted)).toEqual([]);
  });

  it('still reads names inside a template literal interpolation', () => {
    expect(rulesOf('src/x.ts', 'const label = `${samples.length} readings`;')).toEqual(['1:sample-for-reading:samples']);
  });

  it('allows the words that mean something else: a sample period, resampling, the simulated meter sampling', () => {
    expect(rulesOf('shared/schemas/scenario.ts', 'const samplePeriodSeconds = 1; resample(x);')).toEqual([]);
    expect(rulesOf('simulator/transport/pty-meter.ts', 'write(device.sample(reading));')).toEqual([]);
    // The same method name outside the simulator is a reading called a sample.
    expect(rulesOf('server/ingest/x.ts', 'write(device.sample(reading));')).toEqual(['1:sample-for-reading:sample']);
  });

  it('refuses the old stored names in code and in SQL strings', () => {
    const planted = [
      "await sequelize.query('SELECT MIN(firstElapsed) FROM run_sample_chunks WHERE runId = ?');",
      'const e = cols.elapsed!;',
      "const wanted = ['elapsed', 'volts'];",
      'return { lastElapsed: 3 };',
    ].join('\n');
    expect(rulesOf('server/archive/chunk-store.ts', planted)).toEqual([
      '1:chunk-table:run_sample_chunks',
      '1:chunk-run-time:firstElapsed',
      '2:archive-run-time:.elapsed',
      "3:archive-run-time:'elapsed'",
      '4:chunk-run-time:lastElapsed',
    ]);
    expect(rulesOf('server/archive/chunk-store.ts', "query('SELECT firstElapsedSeconds FROM run_reading_chunks'); cols.elapsedSeconds;")).toEqual([]);
  });

  it('refuses short unit suffixes, a private MS_PER_S and Clock.now()', () => {
    const planted = [
      'const tempC = 25;',
      'if (frame.overTempC > limit) trip();',
      'const cfg = { staleAfterS: 5, durationS: 60 };',
      'const MS_PER_S = 1000;',
      'const at = this.clock.now();',
    ].join('\n');
    expect(rulesOf('server/benches/x.ts', planted)).toEqual([
      '1:temperature-unit:tempC',
      '2:temperature-unit:overTempC',
      '3:seconds-unit:staleAfterS',
      '3:seconds-unit:durationS',
      '4:unit-constant:const MS_PER_S',
      '5:clock-now:clock.now(',
    ]);
    expect(rulesOf('shared/units/time.ts', 'export const MS_PER_S = 1000;')).toEqual([]);
    expect(rulesOf('server/benches/x.ts', 'const at = this.clock.nowMs(); const c = tempCelsius; Date.now();')).toEqual([]);
  });

  it('refuses chargeAh inside ImportSummary and nowhere else', () => {
    const planted = [
      'export const ImportSummarySchema = z.object({',
      '  energyWh: z.number(),',
      '  chargeAh: z.number(),',
      '  dischargeAh: z.number(),',
      '});',
      'export const RunSummarySchema = z.object({ chargeAh: z.number() });',
    ].join('\n');
    expect(rulesOf('shared/schemas/api-runs.ts', planted)).toEqual(['3:import-summary-charge:chargeAh']);
  });

  it('exempts a line marked vocab-rename: keep, and a file marked so on its first line', () => {
    const line = "const old = previous.lastElapsed; // vocab-rename: keep";
    expect(rulesOf('server/runs/run-session.ts', line)).toEqual([]);
    expect(rulesOf('server/runs/run-session.ts', line.replace(' // vocab-rename: keep', ''))).toEqual(['1:chunk-run-time:lastElapsed']);
    expect(rulesOf('shared/schemas/legacy-keys.ts', '// vocab-rename: keep (this file names old spellings)\nconst map = { tempC: 1 };')).toEqual([]);
  });

  it('checks TypeScript in the five folders, and no migration that ran before the storage rename', () => {
    expect(isChecked('server/archive/chunk-store.ts')).toBe(true);
    expect(isChecked('src/features/runs/components/run-compare.tsx')).toBe(true);
    expect(isChecked('server/db/migrations/0200-runs-events-sample-chunks.ts')).toBe(false);
    expect(isChecked('server/db/migrations/1780-run-reading-chunks.ts')).toBe(true);
    expect(isChecked('tests/integration/runs.test.ts')).toBe(false);
    expect(isChecked('docs/api.md')).toBe(false);
  });

  it('blanks comments and string text but keeps code columns in place', () => {
    const [view] = lineViews("const a = 'sample'; // sample");
    expect(view!.code).toBe("const a = '      ';          ");
    expect(view!['code-and-strings']).toBe("const a = 'sample';          ");
  });
});
