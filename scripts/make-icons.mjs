// The page's icons (web app manifest, tab icon): a trace with one peak, drawn here,
// no image program needed. Run: node scripts/make-icons.mjs (writes public/icons/).
import { writeFileSync } from 'node:fs';
import { deflateSync } from 'node:zlib';

const BG = [10, 90, 140];
const INK = [255, 255, 255];
const MUTED = [120, 170, 205];

/** The trace as y(t) for t in [0, 1]: a low baseline with one peak and a small shoulder. */
const traceY = (t) => 0.78 - 0.55 * Math.exp(-((t - 0.5) ** 2) / 0.006) - 0.12 * Math.exp(-((t - 0.68) ** 2) / 0.002);

function draw(size) {
  const px = new Uint8Array(size * size * 4);
  const r = size * 0.18;
  const inside = (x, y) => {
    const cx = Math.min(Math.max(x, r), size - r), cy = Math.min(Math.max(y, r), size - r);
    return (x - cx) ** 2 + (y - cy) ** 2 <= r * r;
  };
  // A polyline of the trace in pixel coordinates, margins 14 %.
  const m = size * 0.14, pts = [];
  for (let k = 0; k <= 400; k++) { const t = k / 400; pts.push([m + t * (size - 2 * m), m + traceY(t) * (size - 2 * m)]); }
  const dist = (x, y) => {
    let best = Infinity;
    for (let k = 1; k < pts.length; k++) {
      const [ax, ay] = pts[k - 1], [bx, by] = pts[k];
      const dx = bx - ax, dy = by - ay;
      const u = Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / (dx * dx + dy * dy)));
      best = Math.min(best, Math.hypot(x - ax - u * dx, y - ay - u * dy));
    }
    return best;
  };
  const half = size * 0.035, axis = size * 0.012;
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const o = (y * size + x) * 4;
      if (!inside(x + 0.5, y + 0.5)) continue;
      let c = BG;
      if (Math.abs(y + 0.5 - (size - m)) < axis && x > m * 0.8 && x < size - m * 0.8) c = MUTED;
      // Only near the line is the distance worth computing.
      if (y > m * 0.6 && y < size - m * 0.6) { const d = dist(x + 0.5, y + 0.5); if (d < half) c = INK; }
      px[o] = c[0]; px[o + 1] = c[1]; px[o + 2] = c[2]; px[o + 3] = 255;
    }
  }
  return png(size, size, px);
}

function crc32(buf) {
  let c, crc = 0xffffffff;
  for (let n = 0; n < buf.length; n++) {
    c = (crc ^ buf[n]) & 0xff;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    crc = (crc >>> 8) ^ c;
  }
  return (crc ^ 0xffffffff) >>> 0;
}

/** A PNG (ISO/IEC 15948): RGBA, 8 bits, no filtering. */
function png(w, h, rgba) {
  const chunk = (type, data) => {
    const out = Buffer.alloc(12 + data.length);
    out.writeUInt32BE(data.length, 0);
    out.write(type, 4, 'ascii');
    Buffer.from(data).copy(out, 8);
    out.writeUInt32BE(crc32(Buffer.concat([Buffer.from(type, 'ascii'), Buffer.from(data)])), 8 + data.length);
    return out;
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(w, 0); ihdr.writeUInt32BE(h, 4); ihdr[8] = 8; ihdr[9] = 6;
  const raw = Buffer.alloc((w * 4 + 1) * h);
  for (let y = 0; y < h; y++) Buffer.from(rgba.buffer, y * w * 4, w * 4).copy(raw, y * (w * 4 + 1) + 1);
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(raw, { level: 9 })), chunk('IEND', Buffer.alloc(0))]);
}

const dir = new URL('../public/icons/', import.meta.url);
for (const size of [32, 192, 512]) writeFileSync(new URL(`icon-${size}.png`, dir), draw(size));
console.log('wrote public/icons/icon-{32,192,512}.png');
