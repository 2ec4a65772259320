// The serial speed the host uses unless told otherwise; must equal the firmware's.
// TODO(link-defaults): re-export DEFAULT_BAUD from protocol/link-defaults.ts once the firmware side lands it.
export const DEFAULT_BAUD = 250_000;
