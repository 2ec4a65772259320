// The left column: the latest swing and the run's estimates, label, value and unit aligned.
import React from 'react';
import { Box, Text } from 'ink';
import type { NumberRow } from '../view-model.ts';
import { TONE_COLOR } from './palette.ts';

const LABEL_W = 13;

export function NumbersPanel({ rows, width }: { readonly rows: readonly NumberRow[]; readonly width: number }): React.JSX.Element {
  return (
    <Box flexDirection="column" width={width}>
      {rows.map((r) => (
        <Box key={r.label} flexDirection="column">
          <Text wrap="truncate">
            <Text color="gray">{r.label.padEnd(LABEL_W)}</Text>
            <Text color={TONE_COLOR[r.tone]} bold={r.tone === 'accent'}>
              {r.value}
            </Text>
            {r.unit ? <Text color="gray"> {r.unit}</Text> : null}
            {r.note && r.label !== 'gate offset' ? <Text color={TONE_COLOR[r.tone]}> ({r.note})</Text> : null}
          </Text>
          {r.note && r.label === 'gate offset' ? (
            <Text wrap="truncate" color="gray">
              {'  ↳ '}
              {r.note}
            </Text>
          ) : null}
        </Box>
      ))}
    </Box>
  );
}
