// Draws Straightaway's app icon (a straight road running to the horizon, with an amber centre line) and
// writes the PNGs in public/icons. Run once: `node scripts/make-icons.mjs`. Node's zlib is the only tool.
import fs from "node:fs"
import path from "node:path"
import zlib from "node:zlib"

const out = path.join(import.meta.dirname, "..", "public", "icons")
fs.mkdirSync(out, { recursive: true })

// Shapes in a 32 x 32 box, as in components/shell/logo.tsx.
const ROAD = [
  [6, 28],
  [14.5, 6],
  [17.5, 6],
  [26, 28],
]
const DASHES = [
  [
    [15.4, 26],
    [16.6, 26],
    [16.3, 21],
    [15.7, 21],
  ],
  [
    [15.6, 18],
    [16.4, 18],
    [16.2, 14.5],
    [15.8, 14.5],
  ],
  [
    [15.8, 12],
    [16.2, 12],
    [16.1, 9.5],
    [15.9, 9.5],
  ],
]
const COLORS = { bg: [0x27, 0x2c, 0x33], road: [0x5d, 0x67, 0x73], line: [0xff, 0xbf, 0x3d], sky: [0x17, 0x18, 0x1a] }

function inside(poly, x, y) {
  let c = false
  for (let i = 0, j = poly.length - 1; i < poly.length; j = i++) {
    const [xi, yi] = poly[i],
      [xj, yj] = poly[j]
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) c = !c
  }
  return c
}

function inRoundedSquare(x, y, r) {
  const cx = Math.min(Math.max(x, r), 32 - r),
    cy = Math.min(Math.max(y, r), 32 - r)
  return (x - cx) ** 2 + (y - cy) ** 2 <= r * r
}

/** `safe` shrinks the drawing into the centre (maskable icons keep content inside an 80 % circle). */
function draw(size, { safe = 1, rounded = true } = {}) {
  const px = Buffer.alloc(size * size * 4)
  const ss = 4
  for (let py = 0; py < size; py++) {
    for (let pxi = 0; pxi < size; pxi++) {
      let acc = [0, 0, 0, 0]
      for (let sy = 0; sy < ss; sy++) {
        for (let sx = 0; sx < ss; sx++) {
          const X = ((pxi + (sx + 0.5) / ss) / size) * 32
          const Y = ((py + (sy + 0.5) / ss) / size) * 32
          if (rounded && !inRoundedSquare(X, Y, 7)) continue
          const x = 16 + (X - 16) / safe,
            y = 16 + (Y - 16) / safe
          let c = COLORS.bg
          if (y < 6) c = COLORS.sky
          if (inside(ROAD, x, y)) c = COLORS.road
          if (DASHES.some((d) => inside(d, x, y))) c = COLORS.line
          acc = [acc[0] + c[0], acc[1] + c[1], acc[2] + c[2], acc[3] + 255]
        }
      }
      const n = ss * ss,
        o = (py * size + pxi) * 4
      const a = acc[3] / n
      px[o] = a ? Math.round(acc[0] / (acc[3] / 255)) : 0
      px[o + 1] = a ? Math.round(acc[1] / (acc[3] / 255)) : 0
      px[o + 2] = a ? Math.round(acc[2] / (acc[3] / 255)) : 0
      px[o + 3] = Math.round(a)
    }
  }
  return png(size, px)
}

function crc32(buf) {
  let c,
    crc = 0xffffffff
  for (let n = 0; n < buf.length; n++) {
    c = (crc ^ buf[n]) & 0xff
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1
    crc = (crc >>> 8) ^ c
  }
  return (crc ^ 0xffffffff) >>> 0
}

function chunk(type, data) {
  const len = Buffer.alloc(4)
  len.writeUInt32BE(data.length)
  const td = Buffer.concat([Buffer.from(type), data])
  const crc = Buffer.alloc(4)
  crc.writeUInt32BE(crc32(td))
  return Buffer.concat([len, td, crc])
}

function png(size, rgba) {
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(size, 0)
  ihdr.writeUInt32BE(size, 4)
  ihdr[8] = 8
  ihdr[9] = 6
  ihdr[10] = 0
  ihdr[11] = 0
  ihdr[12] = 0
  const raw = Buffer.alloc((size * 4 + 1) * size)
  for (let y = 0; y < size; y++) rgba.copy(raw, y * (size * 4 + 1) + 1, y * size * 4, (y + 1) * size * 4)
  return Buffer.concat([
    Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]),
    chunk("IHDR", ihdr),
    chunk("IDAT", zlib.deflateSync(raw, { level: 9 })),
    chunk("IEND", Buffer.alloc(0)),
  ])
}

fs.writeFileSync(path.join(out, "icon-192.png"), draw(192))
fs.writeFileSync(path.join(out, "icon-512.png"), draw(512))
fs.writeFileSync(path.join(out, "icon-maskable-512.png"), draw(512, { safe: 0.72, rounded: false }))
fs.writeFileSync(path.join(out, "apple-touch-icon.png"), draw(180, { rounded: false }))
console.log("icons written to public/icons")

// The browser tab's icon: /favicon.ico (asked for by every browser on a first page) holding a 32 px and a 48 px
// PNG (an ICO file may carry PNG images as they are: a 6-byte header, a 16-byte entry per image, the bytes).
function ico(images) {
  const header = Buffer.alloc(6)
  header.writeUInt16LE(0, 0)
  header.writeUInt16LE(1, 2) // 1 = icon
  header.writeUInt16LE(images.length, 4)
  let offset = 6 + 16 * images.length
  const entries = images.map(({ size, data }) => {
    const e = Buffer.alloc(16)
    e.writeUInt8(size >= 256 ? 0 : size, 0)
    e.writeUInt8(size >= 256 ? 0 : size, 1)
    e.writeUInt16LE(1, 4) // colour planes
    e.writeUInt16LE(32, 6) // bits per pixel
    e.writeUInt32LE(data.length, 8)
    e.writeUInt32LE(offset, 12)
    offset += data.length
    return e
  })
  return Buffer.concat([header, ...entries, ...images.map((i) => i.data)])
}
fs.writeFileSync(path.join(out, "..", "favicon.ico"), ico([32, 48].map((size) => ({ size, data: draw(size) }))))
