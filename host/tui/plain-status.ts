// The plain fallback when there is no terminal (a pipe, CI, a service): one status line at a time, no escape codes.
import type { ViewModel } from './view-model.ts';

/** One line with the numbers that matter, `key=value` separated by two spaces; warnings follow after `!`. */
export function plainStatusLine(vm: ViewModel): string {
  const num = (label: string): string => {
    const r = vm.numbers.find((n) => n.label === label);
    return r ? `${r.value}${r.unit ? ` ${r.unit}` : ''}`.replace(/ ± /g, '±') : '—';
  };
  const status = (label: string): string | undefined => vm.status.find((s) => s.label === label)?.value;
  const counts = vm.health.map((h) => `${h.label.replace(/ /g, '_')}=${h.count}`).join(' ');
  const parts = [
    `run=${status('run') ?? '—'}`,
    `${vm.status.find((s) => s.label === 'link' || s.label === 'mode')?.value ?? ''}`,
    `passes=${num('passes')}`,
    `period=${num('period')}`,
    `amplitude=${num('amplitude')}`,
    `T0=${num('T0')}`,
    `g=${num('g')}`,
    `Q=${num('Q')}`,
    // Two beams: the swing's axis and its turning rate; a room sensor: its line as on screen.
    ...(vm.plane ? vm.plane.rows.filter((r) => r.label !== 'box').map((r) => `${r.label.replace('°/h', '')}=${r.value.replace(/ ± /g, '±')}${r.label.endsWith('°/h') ? ' °/h' : ''}`) : []),
    ...(vm.room ? [`room=${vm.room.items.map((it) => `${it.label} ${it.value}`).join(', ')}`] : []),
    counts,
  ];
  const warn = vm.warnings.map((w) => `! ${w.text}`).join('  ');
  return `${parts.filter(Boolean).join('  ')}${warn ? `  ${warn}` : ''}`;
}
