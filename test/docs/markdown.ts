// Small Markdown readers for the doc tests: fenced blocks, relative links and GitHub-style heading anchors.

/** A fenced code block: its info string (language) and its lines. */
export interface FencedBlock {
  readonly info: string;
  readonly lines: readonly string[];
  /** 1-based line number of the opening fence. */
  readonly line: number;
}

/** An opening fence: up to 4 spaces of indent, 3 or more backticks, an info word without backticks. */
const FENCE = /^( {0,4})(`{3,})\s*([^`\s]*)\s*$/;

/** The fenced (```) blocks of a Markdown text, in order; a fence may be indented (inside a list item). */
export function fencedBlocks(md: string): FencedBlock[] {
  const out: FencedBlock[] = [];
  const lines = md.split('\n');
  for (let i = 0; i < lines.length; i++) {
    const open = FENCE.exec(lines[i]!);
    if (!open) continue;
    const indent = open[1]!.length;
    const body: string[] = [];
    let j = i + 1;
    while (j < lines.length && !lines[j]!.trimStart().startsWith(open[2]!)) body.push(lines[j++]!.slice(indent));
    out.push({ info: open[3]!, lines: body, line: i + 1 });
    i = j;
  }
  return out;
}

/** The text with fenced blocks blanked out (and inline code too unless kept), so code is not read as prose. */
function prose(md: string, keepInlineCode: boolean): string {
  let fence: string | null = null;
  return md
    .split('\n')
    .map((l) => {
      const m = FENCE.exec(l);
      if (fence !== null) {
        if (l.trimStart().startsWith(fence)) fence = null;
        return '';
      }
      if (m) {
        fence = m[2]!;
        return '';
      }
      return keepInlineCode ? l : l.replace(/`[^`]*`/g, '');
    })
    .join('\n');
}

/** Link targets of `[text](target)` in the prose that are relative (no URL scheme). */
export function relativeLinks(md: string): string[] {
  const out: string[] = [];
  for (const m of prose(md, false).matchAll(/\]\(([^)\s]+)(?:\s+"[^"]*")?\)/g)) {
    if (!/^[a-z][a-z0-9+.-]*:/i.test(m[1]!)) out.push(m[1]!);
  }
  return out;
}

/** GitHub's anchor for each heading of a document (repeats get -1, -2, ...), and each explicit `<a id="…">`. */
export function headingAnchors(md: string): Set<string> {
  const seen = new Map<string, number>();
  const out = new Set<string>();
  for (const line of prose(md, true).split('\n')) {
    for (const a of line.matchAll(/<a id="([^"]+)"><\/a>/g)) out.add(a[1]!);
    const m = /^#{1,6}\s+(.*?)\s*#*\s*$/.exec(line);
    if (!m) continue;
    const base = m[1]!
      .toLowerCase()
      .replace(/[^\p{L}\p{N}\s_-]/gu, '')
      .replace(/ /g, '-');
    const n = seen.get(base) ?? 0;
    seen.set(base, n + 1);
    out.add(n === 0 ? base : `${base}-${n}`);
  }
  return out;
}
