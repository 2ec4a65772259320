// The room line: the board's sensor reading (temperature, pressure, humidity, air density, age) or its fault.
import React from 'react';
import { Text } from 'ink';
import { fitItems } from '../layout.ts';
import type { RoomLine } from '../view-room.ts';
import { TONE_COLOR } from './palette.ts';

export function RoomLineView({ room, width }: { readonly room: RoomLine; readonly width: number }): React.JSX.Element {
  const items = fitItems(room.items, width);
  return (
    <Text wrap="truncate">
      {items.map((it, i) => (
        <Text key={it.label}>
          {i > 0 ? <Text color="gray"> · </Text> : null}
          <Text color="gray">{it.label} </Text>
          <Text color={TONE_COLOR[room.tone]}>{it.value}</Text>
        </Text>
      ))}
    </Text>
  );
}
