// Journal format v1 (protocol/JOURNAL.md): line-level parsing and formatting, no I/O.

/** The first line of every journal. */
export const JOURNAL_MAGIC = '#halfswing-journal 1';

/** Annotation words the recorder writes; readers accept any word. */
export type AnnotationWord = 'connect' | 'disconnect' | 'stop' | 'prehello' | 'note' | 'error' | (string & {});

/** One parsed journal line. */
export type JournalEntry =
  | { readonly kind: 'magic'; readonly version: number }
  | { readonly kind: 'start'; readonly iso: string; readonly epochMs: number }
  | { readonly kind: 'rig'; readonly json: string }
  | { readonly kind: 'source'; readonly text: string }
  | { readonly kind: 'header'; readonly key: string; readonly text: string }
  | { readonly kind: 'data'; readonly hostUs: number; readonly line: string }
  | { readonly kind: 'annotation'; readonly hostUs: number; readonly word: AnnotationWord; readonly text: string }
  | { readonly kind: 'comment'; readonly text: string }
  | { readonly kind: 'malformed'; readonly text: string; readonly why: string };

const DATA = /^(0|[1-9][0-9]{0,15}) (.*)$/s;
const ANNOTATION = /^#@(0|[1-9][0-9]{0,15}) ([A-Za-z][\w-]*)(?: (.*))?$/s;

/** Parses one journal line (without its LF; a trailing CR is dropped). Never throws. */
export function parseJournalLine(raw: string): JournalEntry {
  const text = raw.endsWith('\r') ? raw.slice(0, -1) : raw;
  if (text.startsWith('#@')) {
    const m = ANNOTATION.exec(text);
    if (!m) return { kind: 'malformed', text, why: 'annotation is not "#@<host_us> <word> <text>"' };
    return { kind: 'annotation', hostUs: Number(m[1]), word: m[2]!, text: m[3] ?? '' };
  }
  if (text.startsWith('#')) {
    const sp = text.indexOf(' ');
    const key = sp < 0 ? text.slice(1) : text.slice(1, sp);
    const rest = sp < 0 ? '' : text.slice(sp + 1);
    switch (key) {
      case 'halfswing-journal': {
        const v = Number(rest);
        return Number.isInteger(v) && v > 0 ? { kind: 'magic', version: v } : { kind: 'malformed', text, why: 'bad journal version' };
      }
      case 'start': {
        const ms = Date.parse(rest);
        if (!/^\d{4}-\d{2}-\d{2}T[\d:.]+Z$/.test(rest) || Number.isNaN(ms))
          return { kind: 'malformed', text, why: '#start is not an ISO-8601 UTC time' };
        return { kind: 'start', iso: rest, epochMs: ms };
      }
      case 'rig':
        return { kind: 'rig', json: rest };
      case 'source':
        return { kind: 'source', text: rest };
      default:
        return /^[a-z][\w-]*$/.test(key) ? { kind: 'header', key, text: rest } : { kind: 'comment', text };
    }
  }
  const m = DATA.exec(text);
  if (!m) return { kind: 'malformed', text, why: 'data line is not "<host_us> <device line>"' };
  return { kind: 'data', hostUs: Number(m[1]), line: m[2]! };
}

/** The header block that opens a journal (or a resumed section of one), each line without LF. */
export function journalHeader(opts: { start: Date; rigJson?: string; source: string; withMagic: boolean }): string[] {
  const lines: string[] = [];
  if (opts.withMagic) lines.push(JOURNAL_MAGIC);
  lines.push(`#start ${opts.start.toISOString()}`);
  if (opts.rigJson !== undefined) lines.push(`#rig ${opts.rigJson}`);
  lines.push(`#source ${opts.source.replace(/[\r\n]+/g, ' ')}`);
  return lines;
}

/** A data line: host microseconds and the device line exactly as received. */
export function journalData(hostUs: number, deviceLine: string): string {
  return `${Math.max(0, Math.round(hostUs))} ${deviceLine.replace(/[\r\n]/g, '')}`;
}

/** A host annotation line. */
export function journalAnnotation(hostUs: number, word: AnnotationWord, text = ''): string {
  const t = text.replace(/[\r\n]+/g, ' ');
  return `#@${Math.max(0, Math.round(hostUs))} ${word}${t ? ` ${t}` : ''}`;
}

/** The `baud=N` field a `connect` annotation ends with: the serial rate the host opened the port at. */
export function connectBaudField(baud: number): string {
  return `baud=${baud}`;
}

/** The serial rate a `connect` annotation states (`baud=N`), or null when its writer did not say (older journals). */
export function connectBaud(text: string): number | null {
  const m = /(?:^| )baud=([1-9][0-9]{2,7})(?: |$)/.exec(text);
  return m ? Number(m[1]) : null;
}

/** True when the first line of a file marks it as a journal of a version this code reads. */
export function isJournalMagic(firstLine: string): boolean {
  const e = parseJournalLine(firstLine);
  return e.kind === 'magic' && e.version === 1;
}
