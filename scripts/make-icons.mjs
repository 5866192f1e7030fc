// Writes the add-in's icons (assets/icon-<size>.png) as plain RGBA PNGs using only node's zlib.
// Design (our own): a teal rounded square, a pale band for a visit window, and a white rising line with dots.
// Run: node scripts/make-icons.mjs
import { deflateSync } from 'node:zlib';
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const SIZES = [16, 32, 64, 80, 128];
const here = dirname(fileURLToPath(import.meta.url));
const outDir = join(here, '..', 'assets');

/** CRC-32 as PNG uses it (ISO 3309 polynomial), table-driven. */
const CRC_TABLE = new Uint32Array(256).map((_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
function crc32(bytes) {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
function chunk(type, data) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const typeAndData = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(typeAndData));
  return Buffer.concat([len, typeAndData, crc]);
}

/** Distance from point p to segment a-b. */
function segDist(px, py, ax, ay, bx, by) {
  const dx = bx - ax;
  const dy = by - ay;
  const t = Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / (dx * dx + dy * dy)));
  return Math.hypot(px - (ax + t * dx), py - (ay + t * dy));
}

function pixel(x, y, s) {
  // Coordinates in a unit square, sampled at the pixel centre.
  const u = (x + 0.5) / s;
  const v = (y + 0.5) / s;
  const r = 0.18; // corner radius
  const cx = Math.min(Math.max(u, r), 1 - r);
  const cy = Math.min(Math.max(v, r), 1 - r);
  if (Math.hypot(u - cx, v - cy) > r) return [0, 0, 0, 0];
  const pts = [
    [0.18, 0.74],
    [0.42, 0.56],
    [0.62, 0.6],
    [0.84, 0.3],
  ];
  const line = Math.max(0.045, 1.2 / s);
  for (const [px, py] of pts) if (Math.hypot(u - px, v - py) < line * 1.9) return [255, 255, 255, 255];
  for (let i = 0; i + 1 < pts.length; i++) {
    const [ax, ay] = pts[i];
    const [bx, by] = pts[i + 1];
    if (segDist(u, v, ax, ay, bx, by) < line) return [255, 255, 255, 255];
  }
  if (u > 0.52 && u < 0.72) return [86, 170, 168, 255]; // the visit-window band
  return [20, 110, 120, 255];
}

function png(size) {
  const raw = Buffer.alloc(size * (size * 4 + 1));
  let o = 0;
  for (let y = 0; y < size; y++) {
    raw[o++] = 0; // filter type 0 (none)
    for (let x = 0; x < size; x++) for (const c of pixel(x, y, size)) raw[o++] = c;
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(size, 0);
  ihdr.writeUInt32BE(size, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // colour type RGBA
  ihdr[10] = 0;
  ihdr[11] = 0;
  ihdr[12] = 0;
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  return Buffer.concat([signature, chunk('IHDR', ihdr), chunk('IDAT', deflateSync(raw, { level: 9 })), chunk('IEND', Buffer.alloc(0))]);
}

mkdirSync(outDir, { recursive: true });
for (const s of SIZES) writeFileSync(join(outDir, `icon-${s}.png`), png(s));
