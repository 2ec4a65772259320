// CRC-8/SMBUS (poly 0x07, init 0x00, not reflected, xorout 0x00), the line checksum of protocol v1.

const TABLE: Uint8Array = (() => {
  const t = new Uint8Array(256);
  for (let i = 0; i < 256; i++) {
    let c = i;
    for (let b = 0; b < 8; b++) c = c & 0x80 ? ((c << 1) ^ 0x07) & 0xff : (c << 1) & 0xff;
    t[i] = c;
  }
  return t;
})();

/** CRC-8/SMBUS of the char codes of `text` from `start` to `end` (exclusive); codes must be < 256. */
export function crc8(text: string, start = 0, end = text.length): number {
  let c = 0;
  for (let i = start; i < end; i++) c = TABLE[(c ^ text.charCodeAt(i)) & 0xff]!;
  return c;
}

/** CRC-8/SMBUS of raw bytes. */
export function crc8Bytes(bytes: Uint8Array): number {
  let c = 0;
  for (const b of bytes) c = TABLE[c ^ b]!;
  return c;
}
