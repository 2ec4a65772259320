// The layering rule (DEVELOPERS.md "Pure core, thin shell"): protocol/ and host/analysis/ import no I/O, no clock
// and no terminal; nothing in host/ or sim/ imports a test oracle. (Function lengths: test/docs/function-length.test.ts.)
import { describe, expect, it } from 'vitest';
import { codeOnly, importsOf, sourceFiles } from './source-files.ts';

/** Packages the pure core may use: computation only. */
const PURE_PACKAGES = new Set(['zod']);
/** Globals that read a clock, a random source, the process or the terminal. */
const IMPURE_GLOBALS = /\b(Date\s*\.\s*now|new\s+Date\s*\(\s*\)|performance\s*\.|setTimeout|setInterval|setImmediate|process\s*\.|console\s*\.|Math\s*\.\s*random|require\s*\()/;

/** Where a relative import of `from` lands, as a root-relative path. */
function resolved(from: string, spec: string): string {
  const parts = from.split('/').slice(0, -1);
  for (const s of spec.split('/')) {
    if (s === '..') parts.pop();
    else if (s !== '.') parts.push(s);
  }
  return parts.join('/');
}

function coreViolations(folder: string, allowedPrefixes: readonly string[]): string[] {
  const out: string[] = [];
  for (const f of sourceFiles(folder)) {
    for (const spec of importsOf(f.path, f.text)) {
      if (spec.startsWith('.')) {
        const to = resolved(f.path, spec);
        if (!allowedPrefixes.some((p) => to.startsWith(p))) out.push(`${f.path} imports ${to}`);
      } else if (!PURE_PACKAGES.has(spec)) out.push(`${f.path} imports ${spec}`);
    }
    const m = IMPURE_GLOBALS.exec(codeOnly(f.text));
    if (m) out.push(`${f.path} uses ${m[1]}`);
  }
  return out;
}

describe('layering', () => {
  it('protocol/ imports only itself and pure packages, and reads no clock, process or terminal', () => {
    expect(coreViolations('protocol', ['protocol/'])).toEqual([]);
  });

  it('host/analysis/ imports only itself, protocol/ and pure packages, and reads no clock, process or terminal', () => {
    expect(coreViolations('host/analysis', ['host/analysis/', 'protocol/'])).toEqual([]);
  });

  it('the rule catches what it is meant to catch', () => {
    const bad = "import { readFileSync } from 'node:fs';\nimport { x } from '../tui/view.ts';\nconst t = Date.now();\n// Date.now() in a comment is fine\n";
    expect(importsOf('host/analysis/x.ts', bad)).toEqual(['node:fs', '../tui/view.ts']);
    expect(resolved('host/analysis/x.ts', '../tui/view.ts')).toBe('host/tui/view.ts');
    expect(IMPURE_GLOBALS.exec(codeOnly(bad))?.[1]?.replace(/\s/g, '')).toBe('Date.now');
    expect(IMPURE_GLOBALS.exec(codeOnly("// Date.now()\nconst s = 'process.env';\n"))).toBeNull();
  });

  it('nothing in host/ or sim/ imports the test folder (its oracles stay independent)', () => {
    const out: string[] = [];
    for (const folder of ['host', 'sim'])
      for (const f of sourceFiles(folder)) for (const spec of importsOf(f.path, f.text)) if (spec.startsWith('.') && resolved(f.path, spec).startsWith('test/')) out.push(`${f.path} imports ${spec}`);
    expect(out).toEqual([]);
  });
});
