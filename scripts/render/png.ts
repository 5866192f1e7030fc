/**
 * A small reader for the PNG files pdftoppm writes (8-bit greyscale, RGB or RGBA, not interlaced), enough to look at
 * pixels: the chunk layout, zlib stream and the five scanline filters of the PNG specification (W3C PNG, 2nd edition,
 * §11.2 IHDR, §9 filtering, §9.4 the Paeth predictor).
 */
import { inflateSync } from 'node:zlib';

export interface Image {
  readonly width: number;
  readonly height: number;
  /** RGB, 3 bytes a pixel, rows top to bottom. */
  readonly rgb: Uint8Array;
}

export function readPng(file: Uint8Array): Image {
  const view = new DataView(file.buffer, file.byteOffset, file.byteLength);
  const idat: Uint8Array[] = [];
  let width = 0;
  let height = 0;
  let channels = 0;
  for (let at = 8; at < file.length; ) {
    const length = view.getUint32(at);
    const type = String.fromCharCode(...file.subarray(at + 4, at + 8));
    const data = file.subarray(at + 8, at + 8 + length);
    if (type === 'IHDR') {
      const d = new DataView(data.buffer, data.byteOffset, data.byteLength);
      width = d.getUint32(0);
      height = d.getUint32(4);
      const depth = data[8]!;
      const colour = data[9]!;
      channels = colour === 0 ? 1 : colour === 2 ? 3 : colour === 6 ? 4 : 0;
      if (depth !== 8 || channels === 0 || data[12] !== 0) throw new Error(`readPng: only 8-bit grey, RGB or RGBA, not interlaced (depth ${depth}, colour type ${colour})`);
    } else if (type === 'IDAT') {
      idat.push(data);
    }
    at += 12 + length;
  }
  const raw = inflateSync(Buffer.concat(idat));
  const stride = width * channels;
  const pixels = new Uint8Array(stride * height);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)]!;
    const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    const out = y * stride;
    for (let x = 0; x < stride; x++) {
      const a = x >= channels ? pixels[out + x - channels]! : 0;
      const b = y > 0 ? pixels[out - stride + x]! : 0;
      const c = x >= channels && y > 0 ? pixels[out - stride + x - channels]! : 0;
      let p = 0;
      if (filter === 1) p = a;
      else if (filter === 2) p = b;
      else if (filter === 3) p = (a + b) >> 1;
      else if (filter === 4) {
        const e = a + b - c;
        const pa = Math.abs(e - a);
        const pb = Math.abs(e - b);
        const pc = Math.abs(e - c);
        p = pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
      }
      pixels[out + x] = (line[x]! + p) & 0xff;
    }
  }
  const rgb = new Uint8Array(width * height * 3);
  for (let i = 0; i < width * height; i++) {
    for (let k = 0; k < 3; k++) rgb[i * 3 + k] = pixels[i * channels + (channels === 1 ? 0 : k)]!;
  }
  return { width, height, rgb };
}

/** Pixels in a rectangle whose colour is clearly not grey (largest minus smallest channel above 60): chart series,
 * not text, grid lines or white paper. */
export function colouredPixels(img: Image, left: number, top: number, right: number, bottom: number): number {
  let n = 0;
  for (let y = Math.max(0, top); y < Math.min(img.height, bottom); y++) {
    for (let x = Math.max(0, left); x < Math.min(img.width, right); x++) {
      const i = (y * img.width + x) * 3;
      const r = img.rgb[i]!;
      const g = img.rgb[i + 1]!;
      const b = img.rgb[i + 2]!;
      if (Math.max(r, g, b) - Math.min(r, g, b) > 60) n++;
    }
  }
  return n;
}
