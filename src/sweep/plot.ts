/**
 * The Kt chart of a sweep as SVG: Kt (net) against the dimensionless parameter, one curve per
 * value of a second varied name, error bars from the certified band, and the published curve
 * (dashed) where the model's chart family has one.
 */
import type { Vary } from './cases.js';
import type { CaseRow } from './solve-case.js';

const W = 760;
const H = 480;
const M = { left: 70, right: 170, top: 50, bottom: 60 };
const COLOURS = ['#1b4f72', '#b9770e', '#1e8449', '#7d3c98', '#a93226', '#117a65'];

function ticks(lo: number, hi: number, n = 6): number[] {
  const span = hi - lo || Math.abs(hi) || 1;
  const raw = span / n;
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 2.5, 5, 10].map((k) => k * mag).find((s) => span / s <= n) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + 1e-9 * step; v += step) out.push(Number(v.toPrecision(12)));
  return out;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

export function sweepSvg(rows: (CaseRow & { x: number })[], vary: Vary[], xLabel: string, title: string): string {
  const pts = rows.filter((r) => r.ktNet !== null);
  const ys = pts.flatMap((r) => [r.ktNet! * (1 + (r.error ?? 0)), r.ktNet! * (1 - (r.error ?? 0)), ...(r.chartKt !== null ? [r.chartKt] : [])]);
  const xs = rows.map((r) => r.x);
  const x0 = Math.min(...xs);
  const x1 = Math.max(...xs);
  let y0 = Math.min(...ys, Infinity);
  let y1 = Math.max(...ys, -Infinity);
  if (!Number.isFinite(y0)) {
    y0 = 1;
    y1 = 2;
  }
  const pad = 0.06 * (y1 - y0 || 1);
  y0 -= pad;
  y1 += pad;
  const px = (x: number) => M.left + ((x - x0) / (x1 - x0 || 1)) * (W - M.left - M.right);
  const py = (y: number) => H - M.bottom - ((y - y0) / (y1 - y0 || 1)) * (H - M.top - M.bottom);
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="DejaVu Sans, Verdana, sans-serif" font-size="12">`);
  out.push(`<rect width="${W}" height="${H}" fill="#fbfaf7"/>`);
  out.push(`<text x="${M.left}" y="24" font-size="15" fill="#222">${esc(title)}: Kt against ${esc(xLabel)}</text>`);
  // Grid and axes.
  for (const t of ticks(x0, x1)) {
    out.push(`<line x1="${px(t)}" y1="${M.top}" x2="${px(t)}" y2="${H - M.bottom}" stroke="#e3e0d8"/>`);
    out.push(`<text x="${px(t)}" y="${H - M.bottom + 18}" text-anchor="middle" fill="#444">${t}</text>`);
  }
  for (const t of ticks(y0, y1)) {
    out.push(`<line x1="${M.left}" y1="${py(t)}" x2="${W - M.right}" y2="${py(t)}" stroke="#e3e0d8"/>`);
    out.push(`<text x="${M.left - 8}" y="${py(t) + 4}" text-anchor="end" fill="#444">${t}</text>`);
  }
  out.push(`<rect x="${M.left}" y="${M.top}" width="${W - M.left - M.right}" height="${H - M.top - M.bottom}" fill="none" stroke="#555"/>`);
  out.push(`<text x="${(M.left + W - M.right) / 2}" y="${H - 18}" text-anchor="middle" fill="#222">${esc(xLabel)}</text>`);
  out.push(`<text transform="translate(20 ${(M.top + H - M.bottom) / 2}) rotate(-90)" text-anchor="middle" fill="#222">Kt (net)</text>`);
  // Curves: grouped by the second varied name.
  const second = vary[1]?.name;
  const groups = new Map<string, (CaseRow & { x: number })[]>();
  for (const r of rows) {
    const g = second ? `${second} = ${Number(r.values[second].toPrecision(6))}` : 'computed';
    if (!groups.has(g)) groups.set(g, []);
    groups.get(g)!.push(r);
  }
  let k = 0;
  for (const [label, list] of groups) {
    const c = COLOURS[k % COLOURS.length];
    const sorted = list.filter((r) => r.ktNet !== null).sort((a, b) => a.x - b.x);
    if (sorted.length > 1) out.push(`<polyline fill="none" stroke="${c}" stroke-width="2" points="${sorted.map((r) => `${px(r.x).toFixed(1)},${py(r.ktNet!).toFixed(1)}`).join(' ')}"/>`);
    for (const r of sorted) {
      const e = r.error ?? 0;
      out.push(`<line x1="${px(r.x)}" y1="${py(r.ktNet! * (1 - e))}" x2="${px(r.x)}" y2="${py(r.ktNet! * (1 + e))}" stroke="${c}"/>`);
      out.push(`<circle cx="${px(r.x).toFixed(1)}" cy="${py(r.ktNet!).toFixed(1)}" r="3.5" fill="${c}"/>`);
    }
    const chart = list.filter((r) => r.chartKt !== null).sort((a, b) => a.x - b.x);
    if (chart.length > 1) out.push(`<polyline fill="none" stroke="${c}" stroke-width="1.5" stroke-dasharray="6 4" points="${chart.map((r) => `${px(r.x).toFixed(1)},${py(r.chartKt!).toFixed(1)}`).join(' ')}"/>`);
    const ly = M.top + 18 * k + 8;
    out.push(`<circle cx="${W - M.right + 18}" cy="${ly}" r="3.5" fill="${c}"/><text x="${W - M.right + 28}" y="${ly + 4}" fill="#222">${esc(label)}</text>`);
    k++;
  }
  if (rows.some((r) => r.chartKt !== null)) {
    const ly = M.top + 18 * k + 8;
    out.push(`<line x1="${W - M.right + 10}" y1="${ly}" x2="${W - M.right + 26}" y2="${ly}" stroke="#555" stroke-dasharray="6 4"/><text x="${W - M.right + 28}" y="${ly + 4}" fill="#222">published chart</text>`);
    k++;
  }
  out.push(`<text x="${W - M.right + 10}" y="${M.top + 18 * k + 12}" fill="#666" font-size="10">bars: error band</text>`);
  out.push(`<text x="${M.left}" y="${H - 4}" fill="#777" font-size="10">Linear elastic Kt; check with a qualified engineer before use in design.</text>`);
  out.push('</svg>');
  return out.join('\n') + '\n';
}
