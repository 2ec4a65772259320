// Finding and reading scenario files: the named ones in sim/scenarios/, or any JSON file by path.
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseScenario, ScenarioError, type Scenario } from '../scenario.ts';

/** The folder of the named scenarios. */
export const SCENARIO_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'scenarios');
/** The scenario `halfswing demo` and `npm start` run. */
export const DEFAULT_SCENARIO = 'demo-low-q';

/** Names of the bundled scenarios, sorted. */
export function listScenarios(): string[] {
  return readdirSync(SCENARIO_DIR)
    .filter((f) => f.endsWith('.json'))
    .map((f) => f.slice(0, -5))
    .sort();
}

/** Loads a bundled scenario by name, or a scenario file by path. Throws ScenarioError with a one-line message. */
export function loadScenario(nameOrPath: string, cwd = process.cwd()): Scenario {
  const looksLikePath = nameOrPath.includes('/') || nameOrPath.includes('\\') || nameOrPath.endsWith('.json');
  const file = looksLikePath ? resolve(cwd, nameOrPath) : join(SCENARIO_DIR, `${nameOrPath}.json`);
  if (!existsSync(file)) {
    if (looksLikePath) throw new ScenarioError(`no scenario file ${nameOrPath}`);
    throw new ScenarioError(`unknown scenario "${nameOrPath}" (known: ${listScenarios().join(', ')})`);
  }
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    throw new ScenarioError(`cannot read scenario ${nameOrPath} (${(e as NodeJS.ErrnoException).code ?? 'error'})`);
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    throw new ScenarioError(`scenario ${nameOrPath} is not valid JSON (${(e as Error).message})`);
  }
  try {
    return parseScenario(value, basename(file, '.json'));
  } catch (e) {
    if (e instanceof ScenarioError) throw new ScenarioError(`scenario ${nameOrPath}: ${e.message}`);
    throw e;
  }
}
