// "Download PNG": the view's chart canvases composed onto one canvas with a title,
// a key and the caution notice, then encoded with toBlob.
import {COLOURS, FONT_STACK, addMarker} from './chart_style.js';

function wrap(ctx, text, maxWidth) {
  const lines = [];
  let line = '';
  for (const word of text.split(/\s+/)) {
    const next = line ? `${line} ${word}` : word;
    if (ctx.measureText(next).width > maxWidth && line) { lines.push(line); line = word; } else line = next;
  }
  if (line) lines.push(line);
  return lines;
}

/**
 * rows: arrays of canvases, each row drawn left to right; key: [{label, shape, fill,
 * stroke, line}] drawn under the title. Resolves to a PNG Blob.
 */
export function composePng({title, rows, key, notice}) {
  const pr = window.devicePixelRatio || 1;
  const pad = 16 * pr, gap = 8 * pr;
  const live = rows.map((row) => row.filter((c) => c && c.width > 0 && c.height > 0)).filter((row) => row.length);
  const width = Math.max(...live.map((row) => row.reduce((w, c) => w + c.width, 0) + gap * (row.length - 1)), 600 * pr) + 2 * pad;

  const out = document.createElement('canvas');
  const ctx = out.getContext('2d');
  // Key items flow left to right and wrap onto further lines.
  ctx.font = `${12 * pr}px ${FONT_STACK}`;
  const placed = [];
  let kx = 0, kline = 0;
  for (const item of key) {
    const w = 24 * pr + ctx.measureText(item.label).width + 16 * pr;
    if (kx > 0 && kx + w > width - 2 * pad) { kx = 0; kline++; }
    placed.push({item, x: pad + kx, line: kline});
    kx += w;
  }
  const titleH = 24 * pr, keyH = (kline + 1) * 20 * pr + 4 * pr, lineH = 17 * pr;
  ctx.font = `${13 * pr}px ${FONT_STACK}`;
  const noticeLines = wrap(ctx, notice, width - 2 * pad);
  const chartsH = live.reduce((hgt, row) => hgt + Math.max(...row.map((c) => c.height)) + gap, 0);
  out.width = Math.ceil(width);
  out.height = Math.ceil(pad + titleH + keyH + chartsH + noticeLines.length * lineH + pad);

  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, out.width, out.height);
  ctx.textBaseline = 'alphabetic';
  ctx.fillStyle = COLOURS.ink;
  ctx.font = `600 ${16 * pr}px ${FONT_STACK}`;
  ctx.fillText(title, pad, pad + 16 * pr);

  // Key: a marker, a band or a line, then its label.
  ctx.font = `${12 * pr}px ${FONT_STACK}`;
  for (const {item, x, line} of placed) {
    const ky = pad + titleH + 8 * pr + line * 20 * pr;
    if (item.line) {
      ctx.strokeStyle = item.line; ctx.lineWidth = (item.width || 2) * pr;
      ctx.beginPath(); ctx.moveTo(x, ky); ctx.lineTo(x + 18 * pr, ky); ctx.stroke();
    } else if (item.band) {
      ctx.fillStyle = item.band; ctx.fillRect(x, ky - 6 * pr, 18 * pr, 12 * pr);
    } else {
      const p = new Path2D();
      addMarker(p, item.shape, x + 9 * pr, ky, 3.5 * pr);
      if (item.fill) { ctx.fillStyle = item.fill; ctx.fill(p); }
      if (item.stroke) { ctx.strokeStyle = item.stroke; ctx.lineWidth = 1.5 * pr; ctx.stroke(p); }
    }
    ctx.fillStyle = COLOURS.ink;
    ctx.fillText(item.label, x + 24 * pr, ky + 4 * pr);
  }

  let y = pad + titleH + keyH;
  for (const row of live) {
    let cx = pad;
    for (const c of row) { ctx.drawImage(c, cx, y); cx += c.width + gap; }
    y += Math.max(...row.map((c) => c.height)) + gap;
  }
  ctx.fillStyle = COLOURS.muted;
  ctx.font = `${13 * pr}px ${FONT_STACK}`;
  noticeLines.forEach((line, i) => ctx.fillText(line, pad, y + 13 * pr + i * lineH));

  return new Promise((resolve, reject) => {
    out.toBlob((blob) => (blob ? resolve(blob) : reject(new Error('the browser could not encode the PNG'))), 'image/png');
  });
}
