// One terminal chart: renders the pure chart helper's lines with the palette's colours.
import React from 'react';
import { Box, Text } from 'ink';
import { renderChart, type ChartSpec } from '../plot/chart.ts';
import { CHART_COLOR } from './palette.ts';

export function ChartBox({ spec }: { readonly spec: ChartSpec }): React.JSX.Element {
  const lines = renderChart(spec);
  return (
    <Box flexDirection="column">
      {lines.map((line, i) => (
        <Text key={i} wrap="truncate">
          {line.map((run, j) => (
            <Text key={j} color={CHART_COLOR[run.tone]}>
              {run.text}
            </Text>
          ))}
        </Text>
      ))}
    </Box>
  );
}
