// A two-beam run's plane under the numbers: a small top view of the recent passes beside the axis, turning rate and minor axis.
import React from 'react';
import { Box, Text } from 'ink';
import { renderTopView } from '../plot/top-view.ts';
import type { PlaneView } from '../view-plane.ts';
import { colourLine } from './chart-box.tsx';

/** Cells of the top view's drawing: a square of 16×16 dots, beside 27 columns of figures (8 of labels) in the narrowest numbers column (38). */
const VIEW_COLS = 8;
const VIEW_ROWS = 4;
const LABEL_W = 8;

export function PlanePanel({ plane }: { readonly plane: PlaneView }): React.JSX.Element {
  const lines = renderTopView({ cols: VIEW_COLS, rows: VIEW_ROWS, halfSpan_m: plane.halfSpan_m, beamLines_rad: plane.beamLines_rad, paths: plane.paths });
  return (
    <Box flexDirection="row">
      <Box borderStyle="single" borderColor="gray" flexDirection="column" width={VIEW_COLS + 2} flexShrink={0}>
        {lines.map((l, i) => (
          <Text key={i}>{colourLine(l)}</Text>
        ))}
      </Box>
      <Box flexDirection="column" marginLeft={1} paddingTop={1}>
        {plane.rows.map((r) => (
          <Text key={r.label} wrap="truncate">
            <Text color="gray">{r.label.padEnd(LABEL_W)}</Text>
            {r.value}
          </Text>
        ))}
      </Box>
    </Box>
  );
}
