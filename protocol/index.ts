// Public surface of the protocol package: records, codec, sequence tracking, journal and rig formats.
export * from './records.ts';
export { crc8, crc8Bytes } from './crc8.ts';
export { encodeRecord, seal, hex } from './encode.ts';
export { decodeLine, decodeBytes } from './decode.ts';
export { SequenceTracker } from './sequence.ts';
export type { TrackedRecord, SequenceCounts } from './sequence.ts';
export * from './journal.ts';
export * from './rig.ts';
