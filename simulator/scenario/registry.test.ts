import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { LEGACY_KEYS } from '../../shared/schemas/legacy-keys.js';
import { listScenarios, loadScenario } from './registry.js';

describe('scenario registry', () => {
  it('lists twelve built-in scenarios (five of them protection checks, one a controlled bench), each of which validates', () => {
    const names = listScenarios().map((s) => s.name);
    expect(names).toHaveLength(12);
    expect(names.filter((n) => n.startsWith('check-'))).toHaveLength(5);
    expect(new Set(names).size).toBe(names.length);
    for (const name of names) expect(loadScenario(name).name).toBe(name);
  });

  it('loads a scenario JSON file and names the fields of a bad one', () => {
    const dir = mkdtempSync(join(tmpdir(), 'kneepoint-scenario-'));
    const good = { ...loadScenario('lfp-12v-weak-cell'), name: 'my-pack' };
    writeFileSync(join(dir, 'good.json'), JSON.stringify(good));
    expect(loadScenario(join(dir, 'good.json')).name).toBe('my-pack');
    const bad = { ...good, pack: { ...good.pack, chemistry: 'nickel-iron', heater: { watts: 50, ratedVolts: 12, onBelowCelsius: 5, offAboveCelsius: 0 } } };
    writeFileSync(join(dir, 'bad.json'), JSON.stringify(bad));
    expect(() => loadScenario(join(dir, 'bad.json'))).toThrow(/pack\.chemistry.*pack\.heater/);
    writeFileSync(join(dir, 'broken.json'), '{ "name": ');
    expect(() => loadScenario(join(dir, 'broken.json'))).toThrow(/Cannot read scenario file/);
    expect(() => loadScenario('no-such-scenario')).toThrow(/Unknown scenario/);
  });

  it('reads a scenario file written with the old key names as the same scenario', () => {
    const dir = mkdtempSync(join(tmpdir(), 'kneepoint-scenario-'));
    const current = loadScenario(listScenarios().find((s) => s.name.startsWith('check-'))!.name);
    // The file as it was written before the renames: every renamed key in its old spelling.
    const oldName = new Map(Object.entries(LEGACY_KEYS).map(([old, current]) => [current, old]));
    const oldText = JSON.stringify(current).replace(/"(\w+)":/g, (m, key: string) => (oldName.has(key) ? `"${oldName.get(key)}":` : m));
    expect(oldText).toMatch(/"overTempC":/); // vocab-rename: keep
    expect(oldText).toMatch(/"maxS":/); // vocab-rename: keep
    writeFileSync(join(dir, 'old.json'), oldText);
    expect(loadScenario(join(dir, 'old.json'))).toEqual(current);
  });
});
