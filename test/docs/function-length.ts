// Lists the functions in host/ longer than the project's limit (~80 lines), using the TypeScript parser.
// test/docs/function-length.test.ts fails on any.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import ts from 'typescript';

/** The limit from the owners' rules: no function in host/ longer than about 80 lines. */
export const MAX_FUNCTION_LINES = 80;

export interface LongFunction {
  readonly file: string;
  readonly line: number;
  readonly name: string;
  readonly lines: number;
}

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    if (statSync(p).isDirectory()) return sourceFiles(p);
    return /\.tsx?$/.test(n) ? [p] : [];
  });
}

function nameOf(node: ts.Node, sf: ts.SourceFile): string {
  const named = node as { name?: ts.Node };
  if (named.name) return named.name.getText(sf);
  const p = node.parent;
  if (p && (ts.isVariableDeclaration(p) || ts.isPropertyAssignment(p) || ts.isPropertyDeclaration(p))) return p.name.getText(sf);
  return '(anonymous)';
}

/** Every function-like node (declarations, methods, arrows, function expressions) of host/ over `max` lines. */
export function longFunctions(root: string, max = MAX_FUNCTION_LINES): LongFunction[] {
  const out: LongFunction[] = [];
  for (const file of sourceFiles(join(root, 'host'))) {
    const sf = ts.createSourceFile(file, readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, true);
    const visit = (node: ts.Node): void => {
      if (ts.isFunctionLike(node) && (node as { body?: ts.Node }).body) {
        const start = sf.getLineAndCharacterOfPosition(node.getStart(sf)).line;
        const end = sf.getLineAndCharacterOfPosition(node.getEnd()).line;
        const lines = end - start + 1;
        if (lines > max) out.push({ file: relative(root, file), line: start + 1, name: nameOf(node, sf), lines });
      }
      ts.forEachChild(node, visit);
    };
    visit(sf);
  }
  return out.sort((a, b) => b.lines - a.lines);
}
