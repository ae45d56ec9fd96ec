// Draws the extension icon (128×128 PNG) from geometry: an open ring (the feedback loop) with an
// arrowhead, a set-point dot at its centre, on a rounded square. Run: node client/media/make-icon.mjs
import { writeFileSync } from 'node:fs';
import { deflateSync } from 'node:zlib';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const size = 128;
const samples = 4; // supersampling per axis for smooth edges
const background = [27, 58, 75];
const ring = [120, 214, 190];
const dot = [255, 196, 92];

function insideRoundedSquare(x, y) {
  const r = 26;
  const cx = Math.min(Math.max(x, r), size - r);
  const cy = Math.min(Math.max(y, r), size - r);
  return (x - cx) ** 2 + (y - cy) ** 2 <= r * r;
}

// Ring centred at (64, 64), radius 38, width 11, open between −40° and +10° (angles from +x, y down).
const centre = 64;
const radius = 38;
const halfWidth = 5.5;
const gapFrom = (-40 * Math.PI) / 180;
const gapTo = (10 * Math.PI) / 180;
function onRing(x, y) {
  const dx = x - centre;
  const dy = y - centre;
  const distance = Math.hypot(dx, dy);
  if (Math.abs(distance - radius) > halfWidth) return false;
  const angle = Math.atan2(dy, dx);
  return !(angle > gapFrom && angle < gapTo);
}
// Arrowhead at the ring's end (angle gapFrom), pointing along the direction of travel (clockwise on screen = decreasing angle).
function inArrow(x, y) {
  const tipAngle = gapFrom + 0.02;
  const base = [centre + radius * Math.cos(tipAngle + 0.05), centre + radius * Math.sin(tipAngle + 0.05)];
  const tangent = [Math.sin(tipAngle), -Math.cos(tipAngle)]; // direction of decreasing angle
  const normal = [Math.cos(tipAngle), Math.sin(tipAngle)];
  const tip = [base[0] + tangent[0] * 20, base[1] + tangent[1] * 20];
  const left = [base[0] + normal[0] * 14, base[1] + normal[1] * 14];
  const right = [base[0] - normal[0] * 14, base[1] - normal[1] * 14];
  const sign = (p, a, b) => (p[0] - b[0]) * (a[1] - b[1]) - (a[0] - b[0]) * (p[1] - b[1]);
  const p = [x, y];
  const d1 = sign(p, tip, left);
  const d2 = sign(p, left, right);
  const d3 = sign(p, right, tip);
  return !((d1 < 0 || d2 < 0 || d3 < 0) && (d1 > 0 || d2 > 0 || d3 > 0));
}
function onDot(x, y) {
  return (x - centre) ** 2 + (y - centre) ** 2 <= 12 * 12;
}

const rows = [];
for (let py = 0; py < size; py++) {
  const row = Buffer.alloc(1 + size * 4);
  row[0] = 0; // filter: none
  for (let px = 0; px < size; px++) {
    const sum = [0, 0, 0, 0];
    for (let sy = 0; sy < samples; sy++) {
      for (let sx = 0; sx < samples; sx++) {
        const x = px + (sx + 0.5) / samples;
        const y = py + (sy + 0.5) / samples;
        if (!insideRoundedSquare(x, y)) continue;
        const colour = onRing(x, y) || inArrow(x, y) ? ring : onDot(x, y) ? dot : background;
        sum[0] += colour[0];
        sum[1] += colour[1];
        sum[2] += colour[2];
        sum[3] += 255;
      }
    }
    const covered = sum[3] / 255;
    const n = samples * samples;
    const offset = 1 + px * 4;
    row[offset] = covered ? Math.round(sum[0] / covered) : 0;
    row[offset + 1] = covered ? Math.round(sum[1] / covered) : 0;
    row[offset + 2] = covered ? Math.round(sum[2] / covered) : 0;
    row[offset + 3] = Math.round(sum[3] / n);
  }
  rows.push(row);
}

const crcTable = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
function crc32(buffer) {
  let c = 0xffffffff;
  for (const byte of buffer) c = crcTable[(c ^ byte) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
function chunk(type, data) {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}
const header = Buffer.alloc(13);
header.writeUInt32BE(size, 0);
header.writeUInt32BE(size, 4);
header[8] = 8; // bit depth
header[9] = 6; // RGBA
const png = Buffer.concat([
  Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
  chunk('IHDR', header),
  chunk('IDAT', deflateSync(Buffer.concat(rows), { level: 9 })),
  chunk('IEND', Buffer.alloc(0)),
]);
writeFileSync(join(dirname(fileURLToPath(import.meta.url)), 'icon.png'), png);
