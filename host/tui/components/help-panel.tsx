// The help overlay: what each key does, what the numbers mean, and every current warning.
import React from 'react';
import { Box, Text } from 'ink';
import type { ViewWarning } from '../warnings.ts';

const KEY_HELP: readonly [string, string][] = [
  ['q', 'quit (asks first while this process writes a journal); Ctrl+C quits at once, journal flushed'],
  ['n', 'type a note; Enter writes it into the journal with the time'],
  ['p', 'freeze the display; recording and analysis go on underneath'],
  ['r', 'restart the estimates from now, e.g. after a new release'],
  ['?', 'this help; any key closes it'],
];

const TERMS: readonly [string, string][] = [
  ['half-periods', 'the last two times between passes, one on each side of the gate'],
  ['T0', 'the period reduced to zero amplitude with the exact law T = T0·2K(sin(θ0/2))/π'],
  ['g', '4π²·L/T0² with the rig corrections; ± is one standard uncertainty'],
  ['gate offset', 'how far the beam is from the lowest point, from the half-period alternation'],
  ['Q', 'quality factor: π·θ0/Δθ0 per cycle at the median amplitude'],
];

/** Terms of the panels only some runs have: shown only when the run has them. */
const PLANE_TERM: readonly [string, string] = ['top view', 'from above, 0° to the right; newest pass bright; beam lines dotted'];
const ROOM_TERM: readonly [string, string] = ['room', 'the board sensor’s latest reading; air: its density by CIPM-2007'];

export function HelpPanel({ warnings, width, plane = false, room = false }: { readonly warnings: readonly ViewWarning[]; readonly width: number; readonly plane?: boolean; readonly room?: boolean }): React.JSX.Element {
  const terms = [...TERMS, ...(plane ? [PLANE_TERM] : []), ...(room ? [ROOM_TERM] : [])];
  return (
    <Box flexDirection="column" width={width}>
      <Text bold color="cyan">
        keys
      </Text>
      {KEY_HELP.map(([k, t]) => (
        <Text key={k} wrap="truncate">
          {`  ${k}  `}
          <Text color="gray">{t}</Text>
        </Text>
      ))}
      <Text bold color="cyan">
        terms
      </Text>
      {terms.map(([k, t]) => (
        <Text key={k} wrap="truncate">
          {`  ${k.padEnd(13)}`}
          <Text color="gray">{t}</Text>
        </Text>
      ))}
      <Text bold color="cyan">
        warnings
      </Text>
      {warnings.length === 0 ? (
        <Text color="green">  none</Text>
      ) : (
        warnings.map((w) => (
          <Text key={w.kind} wrap="truncate" color="red">
            {`  ! ${w.text}`}
          </Text>
        ))
      )}
    </Box>
  );
}
