// Test helper: reads the numbers a report shows (by data-key) and checks each against the JSON value it
// stands for, to the precision shown (a shown "9.8012" must be within 0.00005 of the JSON number).
import { expect } from 'vitest';

/** Every data-key → its shown texts, in page order. */
export function shownByKey(html: string): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const m of html.matchAll(/data-key="([^"]+)">([^<]*)</g)) {
    const list = out.get(m[1]!) ?? [];
    list.push(m[2]!);
    out.set(m[1]!, list);
  }
  return out;
}

/** A shown number (typographic minus allowed) and the half-unit of its last shown digit. */
export function parseShown(text: string): { value: number; halfUlp: number } {
  const full = text.trim().replace('\u2212', '-');
  expect(full, `"${text}" is a decimal number, with a power of ten from a million up`).toMatch(/^-?\d+(\.\d+)?(e\d+)?$/);
  const [t, exp] = full.split('e') as [string, string | undefined];
  const e = exp === undefined ? 0 : Number(exp);
  const dec = t.includes('.') ? t.length - t.indexOf('.') - 1 : 0;
  // Integers that end in zeros may be rounded to tens or hundreds (an uncertainty of 120 shows 12 345 as 12350).
  const zeros = dec === 0 && exp === undefined ? /(0*)$/.exec(t)![1]!.length : 0;
  return { value: Number(full), halfUlp: 0.5 * 10 ** (zeros - dec + e) };
}

/** Asserts that the report shows `key` once or more and each shown value rounds from `expected`. */
export function expectShown(shown: Map<string, string[]>, key: string, expected: number): void {
  const texts = shown.get(key);
  expect(texts, `report shows ${key}`).toBeDefined();
  for (const text of texts!) {
    const { value, halfUlp } = parseShown(text);
    expect(Math.abs(value - expected), `${key}: shown ${text}, JSON ${expected}`).toBeLessThanOrEqual(halfUlp * (1 + 1e-9) + Math.abs(expected) * 1e-12);
  }
}

/** The JSON keys (as `analyze --json` prints them) and how the report shows each: key in the page, scale. */
export const SHOWN_FIELDS: readonly { json: string; key: string; scale: number; exact?: true }[] = [
  { json: 'T0_s', key: 'T0_s', scale: 1 },
  { json: 'T0_u_s', key: 'T0_u_s', scale: 1 },
  { json: 'g_m_s2', key: 'g_m_s2', scale: 1 },
  { json: 'g_u_m_s2', key: 'g_u_m_s2', scale: 1 },
  { json: 'clock_ppm', key: 'clock_ppm', scale: 1 },
  { json: 'clock_u_ppm', key: 'clock_u_ppm', scale: 1 },
  { json: 'gate_offset_m', key: 'gate_offset_mm', scale: 1000 },
  { json: 'B', key: 'B', scale: 1 },
  { json: 'B_u', key: 'B_u', scale: 1 },
  { json: 'C', key: 'C', scale: 1 },
  { json: 'C_u', key: 'C_u', scale: 1 },
  { json: 'amplitude_start_deg', key: 'amplitude_start_deg', scale: 1 },
  { json: 'amplitude_end_deg', key: 'amplitude_end_deg', scale: 1 },
  { json: 'Q', key: 'Q', scale: 1 },
  { json: 'expected_g_m_s2', key: 'expected_g_m_s2', scale: 1 },
  { json: 'g_diff_sigma', key: 'g_diff_sigma', scale: 1 },
  { json: 'passes', key: 'passes', scale: 1, exact: true },
  { json: 'periods', key: 'periods', scale: 1, exact: true },
];

/** Checks every number the report shows against the parsed `--json` object; returns how many were compared. */
export function expectReportMatchesJson(html: string, json: Record<string, unknown>): number {
  const shown = shownByKey(html);
  let compared = 0;
  for (const f of SHOWN_FIELDS) {
    const v = json[f.json];
    if (typeof v !== 'number') {
      expect(shown.has(f.key), `${f.key} is not shown when JSON has ${String(v)}`).toBe(false);
      continue;
    }
    if (f.exact) expect(shown.get(f.key), f.key).toEqual([String(v)]);
    else expectShown(shown, f.key, v * f.scale);
    compared++;
  }
  if (typeof json.g_u_m_s2 === 'number') {
    expectShown(shown, 'g_U_k2', 2 * json.g_u_m_s2);
    compared++;
  }
  compared += expectNestedShown(shown, json);
  const counts = json.counts as Record<string, number>;
  for (const [k, v] of Object.entries(counts)) {
    const m = new RegExp(`data-count="${k}">(\\d+)<`).exec(html);
    expect(m, `count ${k} shown`).not.toBeNull();
    expect(Number(m![1]), `count ${k}`).toBe(v);
    compared++;
  }
  for (const b of json.budget as { name: string; u_rel_g: number }[]) {
    const row = new RegExp(`data-budget="${escRe(b.name)}">.*?data-key="u_rel_g">([^<]*)<`).exec(html);
    expect(row, `budget row ${b.name}`).not.toBeNull();
    const { value, halfUlp } = parseShown(row![1]!);
    expect(Math.abs(value - b.u_rel_g * 1e6), `budget ${b.name}`).toBeLessThanOrEqual(halfUlp * (1 + 1e-9));
    compared++;
  }
  return compared;
}

function escRe(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;').replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

/** Units a shown nested key may be scaled to: the page's key suffix, the JSON's, and the factor. */
const NESTED_UNITS: readonly [string, string, number][] = [
  ['_hPa', '_Pa', 0.01],
  ['_mm', '_m', 1000],
];

/**
 * The numbers of the JSON's nested objects (`plane`, `environment`): every shown `object.field` key rounds from
 * the JSON's field (scaled when the page shows another unit); none is shown when the object is null.
 */
function expectNestedShown(shown: Map<string, string[]>, json: Record<string, unknown>): number {
  let compared = 0;
  for (const key of shown.keys()) {
    const dot = key.indexOf('.');
    if (dot < 0) continue;
    const obj = json[key.slice(0, dot)] as Record<string, unknown> | null | undefined;
    expect(obj, `${key} is shown, so JSON has ${key.slice(0, dot)}`).toBeTruthy();
    let field = key.slice(dot + 1);
    let scale = 1;
    const unit = NESTED_UNITS.find(([page]) => field.endsWith(page) && !(field in obj!));
    if (unit) [field, scale] = [field.slice(0, -unit[0].length) + unit[1], unit[2]];
    const v = obj![field];
    expect(typeof v, `${key}: JSON ${field} is a number`).toBe('number');
    expectShown(shown, key, (v as number) * scale);
    compared++;
  }
  return compared;
}
