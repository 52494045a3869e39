// Writes the add-in's icons (assets/icon-<size>.png): a rising staircase — the shape of a monotone
// fit — in white on a teal rounded square. Run: node assets/make-icons.mjs. No dependencies.
import { deflateSync } from 'node:zlib';
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));

const crcTable = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
function crc32(buf) {
  let c = 0xffffffff;
  for (const b of buf) c = crcTable[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
function chunk(type, data) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const td = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(td));
  return Buffer.concat([len, td, crc]);
}
function png(size, pixel) {
  const raw = Buffer.alloc(size * (size * 4 + 1));
  for (let y = 0; y < size; y++) {
    raw[y * (size * 4 + 1)] = 0;
    for (let x = 0; x < size; x++) {
      const [r, g, b, a] = pixel(x + 0.5, y + 0.5, size);
      const o = y * (size * 4 + 1) + 1 + x * 4;
      raw[o] = r;
      raw[o + 1] = g;
      raw[o + 2] = b;
      raw[o + 3] = a;
    }
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(size, 0);
  ihdr.writeUInt32BE(size, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // RGBA
  return Buffer.concat([Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(raw)), chunk('IEND', Buffer.alloc(0))]);
}
// Unit-square design: rounded square background, three-step staircase rising to the right.
function pixel(px, py, size) {
  const u = px / size;
  const v = 1 - py / size; // upwards
  const r = 0.18;
  const dx = Math.max(r - u, 0, u - (1 - r));
  const dy = Math.max(r - v, 0, v - (1 - r));
  if (dx * dx + dy * dy > r * r) return [0, 0, 0, 0];
  const steps = [
    [0.14, 0.36, 0.22],
    [0.36, 0.6, 0.44],
    [0.6, 0.86, 0.7],
  ];
  const t = Math.max(0.045, 1.2 / size);
  for (const [a, b, h] of steps) {
    if (u >= a && u <= b && Math.abs(v - h) <= t) return [255, 255, 255, 255];
  }
  for (let i = 0; i + 1 < steps.length; i++) {
    const x = steps[i][1];
    if (Math.abs(u - x) <= t && v >= steps[i][2] - t && v <= steps[i + 1][2] + t) return [255, 255, 255, 255];
  }
  return [17, 120, 110, 255];
}
for (const size of [16, 32, 64, 80, 128]) writeFileSync(join(here, `icon-${size}.png`), png(size, pixel));
console.log('icons written');
