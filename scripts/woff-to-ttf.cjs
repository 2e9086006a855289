// Development helper: WOFF 1.0 → TrueType (sfnt) by unpacking its zlib-compressed tables.
// pdfkit (fontkit) re-inflates WOFF tables on every glyph lookup, so lib/pdf uses the .ttf files
// this writes next to the committed .woff ones:  node scripts/woff-to-ttf.cjs
const fs = require('fs');
const zlib = require('zlib');
function convert(src, dst) {
  const w = fs.readFileSync(src);
  if (w.toString('latin1', 0, 4) !== 'wOFF') throw new Error('not WOFF');
  const flavor = w.readUInt32BE(4),
    numTables = w.readUInt16BE(12);
  const tables = [];
  for (let i = 0; i < numTables; i++) {
    const o = 44 + i * 20;
    const tag = w.toString('latin1', o, o + 4),
      offset = w.readUInt32BE(o + 4),
      compLength = w.readUInt32BE(o + 8),
      origLength = w.readUInt32BE(o + 12),
      checksum = w.readUInt32BE(o + 16);
    const raw = w.subarray(offset, offset + compLength);
    const data = compLength < origLength ? zlib.inflateSync(raw) : Buffer.from(raw);
    if (data.length !== origLength) throw new Error(`bad length for ${tag}`);
    tables.push({ tag, checksum, data });
  }
  tables.sort((a, b) => (a.tag < b.tag ? -1 : 1));
  let pow = 1,
    log = 0;
  while (pow * 2 <= numTables) {
    pow *= 2;
    log++;
  }
  const head = Buffer.alloc(12 + 16 * numTables);
  head.writeUInt32BE(flavor, 0);
  head.writeUInt16BE(numTables, 4);
  head.writeUInt16BE(pow * 16, 6);
  head.writeUInt16BE(log, 8);
  head.writeUInt16BE(numTables * 16 - pow * 16, 10);
  let offset = head.length;
  const bodies = [];
  tables.forEach((t, i) => {
    const r = 12 + i * 16;
    head.write(t.tag, r, 'latin1');
    head.writeUInt32BE(t.checksum, r + 4);
    head.writeUInt32BE(offset, r + 8);
    head.writeUInt32BE(t.data.length, r + 12);
    const padded = Buffer.alloc((t.data.length + 3) & ~3);
    t.data.copy(padded);
    bodies.push(padded);
    offset += padded.length;
  });
  fs.writeFileSync(dst, Buffer.concat([head, ...bodies]));
}
for (const w of ['400', '700']) convert(`fonts/inter-latin-${w}-normal.woff`, `fonts/inter-latin-${w}-normal.ttf`);
