import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
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
    const bad = { ...good, pack: { ...good.pack, chemistry: 'nickel-iron', heater: { watts: 50, ratedVolts: 12, onBelowC: 5, offAboveC: 0 } } };
    writeFileSync(join(dir, 'bad.json'), JSON.stringify(bad));
    expect(() => loadScenario(join(dir, 'bad.json'))).toThrow(/pack\.chemistry.*pack\.heater/);
    writeFileSync(join(dir, 'broken.json'), '{ "name": ');
    expect(() => loadScenario(join(dir, 'broken.json'))).toThrow(/Cannot read scenario file/);
    expect(() => loadScenario('no-such-scenario')).toThrow(/Unknown scenario/);
  });
});
