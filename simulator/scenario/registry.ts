import { readFileSync } from 'node:fs';
import { BUILT_IN_SCENARIOS } from '../scenarios/index.js';
import { withCurrentKeys } from '../../shared/schemas/legacy-keys.js';
import { ScenarioSchema, type Scenario } from './schema.js';

/** Name, title and description of a built-in scenario. */
export interface ScenarioInfo {
  name: string;
  title: string;
  description: string;
}

/** Lists the built-in scenarios. */
export function listScenarios(): ScenarioInfo[] {
  return BUILT_IN_SCENARIOS.map(({ name, title, description }) => ({ name, title, description }));
}

/**
 * Loads a built-in scenario by name, or a scenario file (a path ending in .json), and
 * validates it; throws a readable error naming the bad fields.
 */
export function loadScenario(nameOrPath: string): Scenario {
  const builtIn = BUILT_IN_SCENARIOS.find((s) => s.name === nameOrPath);
  const raw: unknown = builtIn ?? (nameOrPath.endsWith('.json') ? readJson(nameOrPath) : undefined);
  if (raw === undefined) {
    throw new Error(`Unknown scenario "${nameOrPath}". Known: ${listScenarios().map((s) => s.name).join(', ')}`);
  }
  const parsed = ScenarioSchema.safeParse(raw);
  if (!parsed.success) {
    const fields = parsed.error.issues.map((i) => `${i.path.join('.') || '(root)'}: ${i.message}`);
    throw new Error(`Invalid scenario "${nameOrPath}": ${fields.join('; ')}`);
  }
  return parsed.data;
}

function readJson(path: string): unknown {
  try {
    return withCurrentKeys(JSON.parse(readFileSync(path, 'utf8')));
  } catch (error) {
    throw new Error(`Cannot read scenario file ${path}: ${(error as Error).message}`);
  }
}
