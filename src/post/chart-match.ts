/**
 * A raiser against the published chart of its shape: which chart family it belongs to, and its
 * computed Kt beside the chart's (src/charts/library.ts).
 */
import { compareWithChart, type ChartComparison } from '../charts/library.js';
import type { Domain } from '../geometry/domain.js';
import { distanceToEdge } from '../geometry/project.js';
import type { RaiserEvaluation } from './evaluate.js';

/** A chart family with the dimensions of one case of it. */
export interface ChartCase {
  family: string;
  dims: Record<string, number>;
}

/**
 * The chart family a raiser's own shape belongs to, on any model: a circular hole centred in a
 * prismatic strip whose net section carries tension alone (its two ligaments equal within 1% of
 * the width, the bending part of its nominal stress under 1%) is Howland's hole in a strip.
 * Null when no family's shape and loading hold.
 */
function recogniseChart(domain: Domain, ev: RaiserEvaluation): ChartCase | null {
  if (ev.raiser.kind !== 'hole' || ev.raiser.edges.length !== 1 || !ev.section || !ev.gross || !ev.loads || ev.section.mirror) return null;
  const c = domain.edges[ev.raiser.edges[0]].curve;
  if (c.kind !== 'arc' || Math.abs(Math.abs(c.sweep) - 2 * Math.PI) > 1e-9) return null;
  const lig = ev.section.ligaments;
  if (lig.length !== 4) return null;
  const W = ev.gross.cut.length;
  if (Math.abs(lig[1] - lig[0] - (lig[3] - lig[2])) > 0.01 * W) return null;
  const net = ev.kt.find((k) => k.kind === 'net');
  if (!net || net.value === null) return null;
  const membrane = ev.loads.N / ev.section.area;
  if (Math.abs(net.nominal - membrane) > 0.01 * Math.abs(net.nominal)) return null;
  return { family: 'plate-with-hole-tension', dims: { W, d: 2 * c.r } };
}

/**
 * Why the part around a recognised hole is not the long plain strip Howland's chart assumes, or
 * null: an edge of the boundary other than the hole and the strip's two sides (an end, a step, a
 * notch, another hole) nearer the hole's centre than one strip width. The disturbance a hole
 * makes in a strip dies out within about one width of it (Saint-Venant's principle; taking one
 * width as the distance is common practice), so a feature, a support or a load nearer than that
 * changes the peak and the chart does not describe the part.
 */
function strayFromStrip(domain: Domain, ev: RaiserEvaluation, W: number): string | null {
  const hole = ev.raiser.edges[0];
  const c = domain.edges[hole].curve;
  if (c.kind !== 'arc' || !ev.gross) return null;
  const sides = new Set(ev.gross.cut.ligamentEdges);
  let nearest: { edge: number; d: number } | null = null;
  for (const e of domain.edges) {
    if (e.id === hole || sides.has(e.id)) continue;
    const d = distanceToEdge(domain, e.id, c.cx, c.cy);
    if (d < W * (1 - 1e-9) && (!nearest || d < nearest.d)) nearest = { edge: e.id, d };
  }
  if (!nearest) return null;
  const e = domain.edges[nearest.edge];
  const what = e.label || 'an edge of the part';
  return `${what} lies ${Number(nearest.d.toPrecision(3))} from the hole's centre, within one strip width (${Number(W.toPrecision(3))}); the chart is for a hole in a long plain strip`;
}

/**
 * Why the model's own chart (written by a template) does not describe the part as loaded, or
 * null: its width W differs by more than 1% from the gross width the analysis found across the
 * flow at the raiser (a whole symmetric section where the cut is half of one). A template's
 * model whose loads were changed to pull across the strip keeps the chart of the strip.
 */
function widthDiffers(ev: RaiserEvaluation, chart: ChartCase): string | null {
  const W = chart.dims.W;
  if (!(W > 0) || !ev.gross) return null;
  const width = ev.gross.cut.length * (ev.gross.cut.mirror ? 2 : 1);
  if (Math.abs(width - W) <= 0.01 * W) return null;
  return `the model's chart is for a width W = ${Number(W.toPrecision(4))}, but the part's gross width across the flow at this raiser is ${Number(width.toPrecision(4))}: the chart does not describe the part as it is loaded`;
}

/**
 * The chart comparison of one raiser: none for a raiser whose Kt did not settle (status not
 * 'ok'); the model's own chart (a template's) for the governing raiser; else the chart its shape
 * is recognised as. `kts` are the settled net and gross Kt.
 */
export function compareRaiserWithChart(domain: Domain, ev: RaiserEvaluation, status: string, governing: boolean, modelChart: ChartCase | undefined, kts: { net: number | null; gross: number | null }): ChartComparison | null {
  if (status !== 'ok') return null;
  if (governing && modelChart) {
    const comparison = compareWithChart(modelChart.family, modelChart.dims, kts);
    const stale = comparison && widthDiffers(ev, modelChart);
    return comparison && stale ? { ...comparison, difference: null, outside: [...comparison.outside, stale] } : comparison;
  }
  const family = recogniseChart(domain, ev);
  if (!family) return null;
  const comparison = compareWithChart(family.family, family.dims, kts);
  // recognised on a part of the user's own: the chart holds only where the strip is long and plain
  const stray = comparison && strayFromStrip(domain, ev, family.dims.W);
  return comparison && stray ? { ...comparison, difference: null, outside: [...comparison.outside, stray] } : comparison;
}
