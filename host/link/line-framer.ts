// Byte-stream framing of device lines with a hard length cap: the readline parser never bounds its buffer.
import { decodeLine } from '../../protocol/decode.ts';
import { MAX_LINE_BYTES } from '../../protocol/records.ts';

/** Running counts of what the framer dropped; lines it passes on are not counted here. */
export interface FramerCounts {
  /** Lines longer than the protocol limit: only their first bytes were passed on (as a line the decoder rejects). */
  readonly overLong: number;
  /** Partial lines left at close that did not carry a valid CRC, discarded. */
  readonly tailsDiscarded: number;
}

const LF = 0x0a;
const CR = 0x0d;

/**
 * Splits raw bytes into lines at LF, strips one trailing CR, and never holds more than the protocol's
 * 80 bytes: of a line that grows past the cap only the first 80 bytes are kept, the rest is discarded up to
 * the LF (SPEC section 6), and it is counted. Lines are latin1 text, so any byte survives to the decoder,
 * which rejects non-ASCII itself.
 */
export class LineFramer {
  private readonly buf: Buffer;
  private len = 0;
  private overflowing = false;
  private overLong = 0;
  private tailsDiscarded = 0;

  /**
   * `maxBytes` is the protocol limit, LF included. One byte more is held so that a full-length line sent
   * with CR LF still reaches the decoder, which applies the exact limit after stripping the CR.
   */
  constructor(private readonly maxBytes = MAX_LINE_BYTES) {
    this.buf = Buffer.alloc(maxBytes);
  }

  /** Feeds one chunk; calls `emit` for each complete line (without CR LF), in order. */
  push(chunk: Uint8Array, emit: (line: string) => void): void {
    let start = 0;
    while (start < chunk.length) {
      const lf = chunk.indexOf(LF, start);
      const end = lf < 0 ? chunk.length : lf;
      this.take(chunk, start, end);
      if (lf < 0) return;
      this.endLine(emit);
      start = lf + 1;
    }
  }

  /**
   * Ends the stream: a held partial line is passed on only when it decodes (a whole record whose LF was
   * lost at close); any other tail is discarded and counted.
   */
  flush(emit: (line: string) => void): void {
    if (this.overflowing) {
      this.overLong++;
      this.tailsDiscarded++;
    } else if (this.len > 0) {
      const line = this.text();
      if (decodeLine(line).ok) emit(line);
      else this.tailsDiscarded++;
    }
    this.len = 0;
    this.overflowing = false;
  }

  /** Bytes currently held (a partial line); never more than the cap. */
  held(): number {
    return this.len;
  }

  counts(): FramerCounts {
    return { overLong: this.overLong, tailsDiscarded: this.tailsDiscarded };
  }

  private take(chunk: Uint8Array, start: number, end: number): void {
    if (this.overflowing || start === end) return;
    const n = end - start;
    const room = this.maxBytes - this.len;
    this.buf.set(chunk.subarray(start, start + Math.min(n, room)), this.len);
    this.len += Math.min(n, room);
    if (n > room) this.overflowing = true;
  }

  private endLine(emit: (line: string) => void): void {
    if (this.overflowing) {
      // The kept head is passed on (and journaled): the decoder rejects it as too-long, so the journal
      // replays to the same rejection count as the live link saw. The rest up to the LF is gone.
      this.overLong++;
      emit(this.buf.toString('latin1', 0, this.len));
    } else {
      // An empty line (a bare LF, or CR LF) is passed on too: the decoder counts it as 'empty'.
      emit(this.text());
    }
    this.len = 0;
    this.overflowing = false;
  }

  private text(): string {
    let n = this.len;
    if (n > 0 && this.buf[n - 1] === CR) n--;
    return this.buf.toString('latin1', 0, n);
  }
}
