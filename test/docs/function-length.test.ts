// No function in host/ longer than about 80 lines (the owners' rules): a long one fails, with its file and line.
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { longFunctions, MAX_FUNCTION_LINES } from './function-length.ts';

const ROOT = join(import.meta.dirname, '..', '..');

describe('function length in host/', () => {
  it('the check finds long functions: main.ts has one over 5 lines, and every one found is over the limit given', () => {
    const over5 = longFunctions(ROOT, 5);
    expect(over5.some((f) => f.file === join('host', 'cli', 'main.ts'))).toBe(true);
    expect(over5.every((f) => f.lines > 5)).toBe(true);
  });

  it(`no function is over ${MAX_FUNCTION_LINES} lines`, () => {
    expect(longFunctions(ROOT).map((f) => `${f.lines} lines  ${f.file}:${f.line}  ${f.name}`)).toEqual([]);
  });
});
