// The bottom lines: health counts, the warning line, and the keys (or the note prompt / quit question).
import React from 'react';
import { Box, Text } from 'ink';
import type { HealthItem } from '../view-model.ts';
import type { ViewWarning } from '../warnings.ts';
import type { UiState } from '../keys.ts';

export function HealthLine({ items }: { readonly items: readonly HealthItem[] }): React.JSX.Element {
  return (
    <Text wrap="truncate">
      <Text color="gray">health </Text>
      {items.map((h, i) => (
        <Text key={h.label}>
          {i > 0 ? <Text color="gray"> · </Text> : null}
          <Text color="gray">{h.label} </Text>
          <Text color={h.count > 0 ? 'yellow' : 'green'}>{h.count}</Text>
        </Text>
      ))}
    </Text>
  );
}

export function WarningLine({ warnings }: { readonly warnings: readonly ViewWarning[] }): React.JSX.Element {
  if (warnings.length === 0)
    return (
      <Text wrap="truncate" color="green">
        ✓ nothing to act on
      </Text>
    );
  const more = warnings.length > 1 ? ` (+${warnings.length - 1} more, ? lists them)` : '';
  return (
    <Text wrap="truncate" color="red" bold>
      ! {warnings[0]!.text}
      <Text color="gray" bold={false}>
        {more}
      </Text>
    </Text>
  );
}

const KEYS: readonly [string, string][] = [
  ['q', 'quit'],
  ['n', 'note'],
  ['p', 'pause'],
  ['r', 'restart estimates'],
  ['?', 'help'],
];

export function Footer({ ui }: { readonly ui: UiState }): React.JSX.Element {
  const m = ui.mode;
  if (m.kind === 'note')
    return (
      <Text wrap="truncate">
        <Text color="black" backgroundColor="yellow">
          {' note '}
        </Text>{' '}
        {m.text}
        <Text color="yellow">▏</Text>
        <Text color="gray"> Enter adds it to the journal · Esc cancels</Text>
      </Text>
    );
  if (m.kind === 'confirm-quit')
    return (
      <Text wrap="truncate">
        <Text color="black" backgroundColor="red">
          {' quit? '}
        </Text>{' '}
        This stops the recording and closes the journal. Press y to quit, any other key to stay.
      </Text>
    );
  return (
    <Text wrap="truncate">
      {KEYS.map(([k, what]) => (
        <Text key={k}>
          <Text color="black" backgroundColor="cyan">{` ${k} `}</Text>
          <Text color="gray">{` ${what}  `}</Text>
        </Text>
      ))}
      {ui.flash ? <Text color="yellow">{ui.flash}</Text> : null}
    </Text>
  );
}
