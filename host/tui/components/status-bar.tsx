// The top lines: where the data comes from, the device, the link, the clock, run time and journal.
import React from 'react';
import { Box, Text } from 'ink';
import type { StatusItem } from '../view-model.ts';
import { fitItems } from '../layout.ts';
import { TONE_COLOR } from './palette.ts';

export function StatusBar({ title, items, width }: { readonly title: string; readonly items: readonly StatusItem[]; readonly width: number }): React.JSX.Element {
  const head = `▌${title} `;
  const packed = ([1, 2] as const).map((line) => fitItems(items.filter((it) => it.line === line), width - head.length - 1));
  return (
    <Box flexDirection="column">
      {packed.map((_, i) => (
        <Text key={i} wrap="truncate">
          <Text color="black" backgroundColor="cyan">
            {i === 0 ? head : ' '.repeat(head.length)}
          </Text>
          {(packed[i] ?? []).map((it, j) => (
            <Text key={j}>
              {j > 0 ? <Text color="gray"> · </Text> : ' '}
              <Text color="gray">{it.label} </Text>
              <Text color={TONE_COLOR[it.tone]}>{it.value}</Text>
            </Text>
          ))}
        </Text>
      ))}
    </Box>
  );
}
