// Finding and reading scenario and session files: the named ones in sim/scenarios/ and sim/sessions/, or any JSON file by path.
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseScenario, ScenarioError, type Scenario } from '../scenario.ts';
import { parseSession, type SessionSpec } from '../session.ts';

/** The folder of the named scenarios. */
export const SCENARIO_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'scenarios');
/** The scenario `halfswing demo` and `npm start` run. */
export const DEFAULT_SCENARIO = 'demo-low-q';

/** The folder of the named sessions (several runs with shared unknowns). */
export const SESSION_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'sessions');

const namesIn = (dir: string): string[] =>
  readdirSync(dir)
    .filter((f) => f.endsWith('.json'))
    .map((f) => f.slice(0, -5))
    .sort();

/** Names of the bundled scenarios, sorted. */
export function listScenarios(): string[] {
  return namesIn(SCENARIO_DIR);
}

/** Names of the bundled sessions, sorted. */
export function listSessions(): string[] {
  return namesIn(SESSION_DIR);
}

/** Loads a bundled scenario by name, or a scenario file by path. Throws ScenarioError with a one-line message. */
export function loadScenario(nameOrPath: string, cwd = process.cwd()): Scenario {
  return loadNamed(SCENARIO_DIR, 'scenario', listScenarios, parseScenario, nameOrPath, cwd);
}

/** Loads a bundled session by name, or a session file by path. Throws ScenarioError with a one-line message. */
export function loadSession(nameOrPath: string, cwd = process.cwd()): SessionSpec {
  return loadNamed(SESSION_DIR, 'session', listSessions, parseSession, nameOrPath, cwd);
}

function loadNamed<T>(dir: string, kind: string, list: () => string[], parse: (v: unknown, name: string) => T, nameOrPath: string, cwd: string): T {
  const looksLikePath = nameOrPath.includes('/') || nameOrPath.includes('\\') || nameOrPath.endsWith('.json');
  const file = looksLikePath ? resolve(cwd, nameOrPath) : join(dir, `${nameOrPath}.json`);
  if (!existsSync(file)) {
    if (looksLikePath) throw new ScenarioError(`no ${kind} file ${nameOrPath}`);
    throw new ScenarioError(`unknown ${kind} "${nameOrPath}" (known: ${list().join(', ')})`);
  }
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    throw new ScenarioError(`cannot read ${kind} ${nameOrPath} (${(e as NodeJS.ErrnoException).code ?? 'error'})`);
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    throw new ScenarioError(`${kind} ${nameOrPath} is not valid JSON (${(e as Error).message})`);
  }
  try {
    return parse(value, basename(file, '.json'));
  } catch (e) {
    if (e instanceof ScenarioError) throw new ScenarioError(`${kind} ${nameOrPath}: ${e.message}`);
    throw e;
  }
}
