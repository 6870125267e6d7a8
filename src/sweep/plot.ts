/**
 * The Kt chart of a sweep, drawn by the same scene renderer as the solution pictures (PNG and
 * SVG): Kt (net) against the swept parameter, one curve per value of a second varied name,
 * error bars from the certified band, and the published curve (dashed, same colour) where the
 * model's chart family has one.
 */
import type { Rgb } from '../render/raster.js';
import { drawChart, type Band, type Series } from '../render/chart.js';
import { newScene, type Scene } from '../render/scene.js';
import { frame, type FooterSource } from '../report/pictures.js';
import type { Vary } from './cases.js';
import type { CaseRow } from './solve-case.js';

const COLOURS: Rgb[] = [
  [27, 79, 114],
  [185, 119, 14],
  [30, 132, 73],
  [125, 60, 152],
  [169, 50, 38],
  [17, 122, 101],
];

export type SweepPoint = CaseRow & { x: number };

/**
 * What the chart is of: the family of parts the sweep ran over, not one of its cases.
 * `family` names the parts (a chart family's title, or the model's title), `fixed` the
 * dimensions held; the varied names are given with their ranges from `vary`.
 */
export interface SweepTitle {
  family: string;
  fixed: Record<string, number>;
}

const short = (v: number) => Number(v.toPrecision(4)).toString();

/** "d from 10 to 50 (5 values)" for each varied name. */
function describeVary(vary: Vary[]): string {
  return vary.map((v) => (v.values.length > 1 ? `${v.name} from ${short(Math.min(...v.values))} to ${short(Math.max(...v.values))} (${v.values.length} values)` : `${v.name} = ${short(v.values[0])}`)).join(', ');
}

export function sweepScene(rows: SweepPoint[], vary: Vary[], xLabel: string, title: SweepTitle, footer: FooterSource, width = 1400, height = 900): Scene {
  const s = newScene(width, height, `Kt chart: ${title.family}`);
  const second = vary[1]?.name;
  const solved = rows.filter((r) => r.ktNet !== null).length;
  const xs = rows.map((r) => r.x).filter(Number.isFinite);
  const xRange = xs.length > 1 ? `, ${xLabel} ${short(Math.min(...xs))} to ${short(Math.max(...xs))}` : '';
  const held = Object.entries(title.fixed)
    .filter(([k]) => !vary.some((v) => v.name === k))
    .map(([k, v]) => `${k} = ${short(v)}`);
  const fr = frame(
    s,
    footer,
    `Kt against ${xLabel}: ${title.family}`,
    `swept ${describeVary(vary)}${xRange}${held.length ? `; held ${held.join(', ')}` : ''}; ${solved} of ${rows.length} cases certified; bars are the error band of each case${rows.some((r) => r.chartKt !== null) ? '; dashed: the published chart' : ''}`,
    false,
  );
  const groups = new Map<string, SweepPoint[]>();
  for (const r of rows) {
    const g = second ? `${second} = ${Number(r.values[second].toPrecision(6))}` : 'raiser, certified';
    if (!groups.has(g)) groups.set(g, []);
    groups.get(g)!.push(r);
  }
  const series: Series[] = [];
  const bands: Band[] = [];
  let k = 0;
  for (const [label, list] of groups) {
    const colour = COLOURS[k++ % COLOURS.length];
    const sorted = list.filter((r) => r.ktNet !== null).sort((a, b) => a.x - b.x);
    series.push({ name: label, points: sorted.flatMap((r) => [r.x, r.ktNet!]), colour, markers: true });
    for (const r of sorted) if (r.error !== null && r.error > 0) bands.push({ x: r.x, lo: r.ktNet! * (1 - r.error), hi: r.ktNet! * (1 + r.error), colour });
    const chart = list.filter((r) => r.chartKt !== null).sort((a, b) => a.x - b.x);
    if (chart.length > 0) series.push({ name: `${second ? `${label}: ` : ''}published chart`, points: chart.flatMap((r) => [r.x, r.chartKt!]), colour, dash: [9, 6], width: 1.5 });
  }
  drawChart(s, fr.draw, { xLabel, yLabel: 'Kt (net section)', series, bands }, fr.size);
  return s;
}
