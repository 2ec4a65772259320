// Source files of the repository below a folder, for the layering tests (read as text, never run).
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';

/** The repository root. */
export const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Every .ts/.tsx file below `folder` (relative to the root), with its text, as root-relative paths. */
export function sourceFiles(folder: string): { path: string; text: string }[] {
  const out: { path: string; text: string }[] = [];
  const walk = (dir: string): void => {
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      const p = join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (/\.tsx?$/.test(e.name)) out.push({ path: relative(ROOT, p).split('\\').join('/'), text: readFileSync(p, 'utf8') });
    }
  };
  walk(join(ROOT, folder));
  return out;
}

/** The module specifiers a file imports or re-exports (static and dynamic). */
export function importsOf(path: string, text: string): string[] {
  const sf = ts.createSourceFile(path, text, ts.ScriptTarget.Latest, true);
  const out: string[] = [];
  const visit = (n: ts.Node): void => {
    if ((ts.isImportDeclaration(n) || ts.isExportDeclaration(n)) && n.moduleSpecifier && ts.isStringLiteral(n.moduleSpecifier)) out.push(n.moduleSpecifier.text);
    if (ts.isCallExpression(n) && n.expression.kind === ts.SyntaxKind.ImportKeyword && n.arguments[0] && ts.isStringLiteral(n.arguments[0])) out.push(n.arguments[0].text);
    ts.forEachChild(n, visit);
  };
  visit(sf);
  return out;
}

/** The code of a file without its comments and string contents (for looking for global names). */
export function codeOnly(text: string): string {
  const scanner = ts.createScanner(ts.ScriptTarget.Latest, true, ts.LanguageVariant.Standard, text);
  let out = '';
  for (let k = scanner.scan(); k !== ts.SyntaxKind.EndOfFileToken; k = scanner.scan()) {
    if (k === ts.SyntaxKind.StringLiteral || k === ts.SyntaxKind.NoSubstitutionTemplateLiteral) out += '""';
    else out += scanner.getTokenText();
    out += ' ';
  }
  return out;
}
