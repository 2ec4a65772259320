// Test helper: decodes an 8-bit RGB/RGBA non-interlaced PNG (what Chromium writes) with node:zlib, per the PNG spec (W3C, 2003).
import { inflateSync } from 'node:zlib';

export interface Image {
  readonly width: number;
  readonly height: number;
  /** Bytes per pixel (3 or 4). */
  readonly channels: number;
  readonly data: Uint8Array;
}

function paeth(a: number, b: number, c: number): number {
  const p = a + b - c;
  const pa = Math.abs(p - a);
  const pb = Math.abs(p - b);
  const pc = Math.abs(p - c);
  return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
}

/** Decodes the image; throws on formats Chromium does not produce (palette, 16-bit, interlaced). */
export function decodePng(buf: Buffer): Image {
  if (buf.readUInt32BE(0) !== 0x89504e47) throw new Error('not a PNG');
  let off = 8;
  let width = 0;
  let height = 0;
  let channels = 0;
  const idat: Buffer[] = [];
  while (off < buf.length) {
    const len = buf.readUInt32BE(off);
    const type = buf.toString('latin1', off + 4, off + 8);
    const body = buf.subarray(off + 8, off + 8 + len);
    if (type === 'IHDR') {
      width = body.readUInt32BE(0);
      height = body.readUInt32BE(4);
      const depth = body[8];
      const colour = body[9];
      if (depth !== 8 || (colour !== 2 && colour !== 6) || body[12] !== 0) throw new Error(`unsupported PNG (depth ${depth}, colour ${colour})`);
      channels = colour === 6 ? 4 : 3;
    } else if (type === 'IDAT') idat.push(body);
    else if (type === 'IEND') break;
    off += 12 + len;
  }
  const raw = inflateSync(Buffer.concat(idat));
  const stride = width * channels;
  const out = new Uint8Array(stride * height);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)]!;
    const src = y * (stride + 1) + 1;
    const row = y * stride;
    for (let x = 0; x < stride; x++) {
      const r = raw[src + x]!;
      const a = x >= channels ? out[row + x - channels]! : 0;
      const b = y > 0 ? out[row - stride + x]! : 0;
      const c = x >= channels && y > 0 ? out[row - stride + x - channels]! : 0;
      const v = filter === 0 ? r : filter === 1 ? r + a : filter === 2 ? r + b : filter === 3 ? r + ((a + b) >> 1) : paeth(a, b, c) + r;
      out[row + x] = v & 0xff;
    }
  }
  return { width, height, channels, data: out };
}

/** Fraction of pixels in a row band [y0, y1) dark enough to be ink (text, lines, markers), not a page tint. */
export function inkFraction(img: Image, y0 = 0, y1 = img.height): number {
  let ink = 0;
  let total = 0;
  for (let y = Math.max(0, y0); y < Math.min(img.height, y1); y++) {
    for (let x = 0; x < img.width; x++) {
      const i = (y * img.width + x) * img.channels;
      total++;
      if (img.data[i]! < 160 || img.data[i + 1]! < 160 || img.data[i + 2]! < 160) ink++;
    }
  }
  return total ? ink / total : 0;
}
