import { describe, expect, it } from 'vitest';
import { readSource, type BenchRow } from './bench-model.js';

const row = (source: string) => ({ id: 1, name: 'Bench 1', source, enabled: true }) as unknown as BenchRow;

describe('a bench source stored before the vocabulary renames', () => {
  it('reads staleAfterS as staleAfterSeconds, so nothing configured before is lost', () => { // vocab-rename: keep
    const stored = JSON.stringify({ kind: 'simulator', scenario: 'lfp-12v-weak-cell', speed: 1, seed: 1, staleAfterS: 42 }); // vocab-rename: keep
    const { source, problem } = readSource(row(stored));
    expect(problem).toBeUndefined();
    expect(source).toMatchObject({ kind: 'simulator', staleAfterSeconds: 42 });
  });
  it('a row in the current spelling reads unchanged', () => {
    const stored = JSON.stringify({ kind: 'simulator', scenario: 'lfp-12v-weak-cell', speed: 1, seed: 1, staleAfterSeconds: 7 });
    expect(readSource(row(stored)).source).toMatchObject({ staleAfterSeconds: 7 });
  });
});
