// A small ABNF (RFC 5234, with RFC 7405 %s"...") to RegExp compiler, so the spec's grammar itself can be tested.

type Rules = ReadonlyMap<string, string>;

/** Parses the rule definitions of ABNF text (comments stripped, continuation lines joined). */
export function parseRules(text: string): Map<string, string> {
  const rules = new Map<string, string>();
  let current: string | undefined;
  for (const raw of text.split('\n')) {
    const line = stripComment(raw);
    if (line.trim() === '') continue;
    const def = /^([A-Za-z][A-Za-z0-9-]*)\s*=(\/?)\s*(.*)$/.exec(line);
    if (def) {
      current = def[1]!;
      const prev = def[2] === '/' ? `${rules.get(current) ?? ''} / ` : '';
      rules.set(current, prev + def[3]!);
    } else if (current !== undefined && /^\s/.test(line)) {
      rules.set(current, `${rules.get(current)!} ${line.trim()}`);
    } else {
      throw new Error(`ABNF: cannot read line '${raw}'`);
    }
  }
  return rules;
}

function stripComment(line: string): string {
  let inQuote = false;
  for (let i = 0; i < line.length; i++) {
    if (line[i] === '"') inQuote = !inQuote;
    else if (line[i] === ';' && !inQuote) return line.slice(0, i);
  }
  return line;
}

const esc = (c: string): string => c.replace(/[\\^$.*+?()[\]{}|/-]/g, '\\$&');
const hexChar = (h: string): string => `\\x${parseInt(h, 16).toString(16).padStart(2, '0')}`;

/** Compiles rule `name` of `rules` into an anchored RegExp (the grammar must not be recursive). */
export function compileRule(rules: Rules, name: string): RegExp {
  return new RegExp(`^(?:${compile(rules, name, [])})$`);
}

function compile(rules: Rules, name: string, stack: readonly string[]): string {
  if (stack.includes(name)) throw new Error(`ABNF: rule ${name} is recursive`);
  const body = rules.get(name);
  if (body === undefined) throw new Error(`ABNF: rule ${name} is not defined`);
  const p = new Parser(body, (r) => compile(rules, r, [...stack, name]));
  const out = p.alternation();
  if (!p.done()) throw new Error(`ABNF: cannot parse rule ${name} at '${body.slice(p.pos)}'`);
  return out;
}

class Parser {
  pos = 0;
  constructor(
    private readonly s: string,
    private readonly ref: (rule: string) => string,
  ) {}

  done(): boolean {
    this.ws();
    return this.pos >= this.s.length;
  }

  private ws(): void {
    while (this.s[this.pos] === ' ') this.pos++;
  }

  alternation(): string {
    const alts = [this.concatenation()];
    for (this.ws(); this.s[this.pos] === '/'; this.ws()) {
      this.pos++;
      alts.push(this.concatenation());
    }
    return alts.length === 1 ? alts[0]! : `(?:${alts.join('|')})`;
  }

  private concatenation(): string {
    const parts: string[] = [];
    for (this.ws(); this.pos < this.s.length && !'/)]'.includes(this.s[this.pos]!); this.ws()) parts.push(this.repetition());
    return parts.join('');
  }

  private repetition(): string {
    const m = /^(\d*)(\*?)(\d*)/.exec(this.s.slice(this.pos))!;
    this.pos += m[0].length;
    const el = this.element();
    if (m[0] === '') return el;
    if (m[2] === '') return `(?:${el}){${m[1]}}`;
    return `(?:${el}){${m[1] || '0'},${m[3]}}`;
  }

  private element(): string {
    const rest = this.s.slice(this.pos);
    let m: RegExpExecArray | null;
    if ((m = /^[A-Za-z][A-Za-z0-9-]*/.exec(rest))) {
      this.pos += m[0].length;
      return `(?:${this.ref(m[0])})`;
    }
    if ((m = /^%s"([^"]*)"/.exec(rest))) {
      this.pos += m[0].length;
      return [...m[1]!].map(esc).join('');
    }
    if ((m = /^"([^"]*)"/.exec(rest))) {
      this.pos += m[0].length;
      return [...m[1]!].map((c) => (/[a-z]/i.test(c) ? `[${c.toLowerCase()}${c.toUpperCase()}]` : esc(c))).join('');
    }
    if ((m = /^%x([0-9A-Fa-f]+)-([0-9A-Fa-f]+)/.exec(rest))) {
      this.pos += m[0].length;
      return `[${hexChar(m[1]!)}-${hexChar(m[2]!)}]`;
    }
    if ((m = /^%x([0-9A-Fa-f]+)/.exec(rest))) {
      this.pos += m[0].length;
      return hexChar(m[1]!);
    }
    if (rest[0] === '(' || rest[0] === '[') {
      const close = rest[0] === '(' ? ')' : ']';
      this.pos++;
      const inner = this.alternation();
      this.ws();
      if (this.s[this.pos] !== close) throw new Error(`ABNF: missing '${close}' in '${this.s}'`);
      this.pos++;
      return close === ')' ? `(?:${inner})` : `(?:${inner})?`;
    }
    throw new Error(`ABNF: unexpected '${rest.slice(0, 10)}' in '${this.s}'`);
  }
}
