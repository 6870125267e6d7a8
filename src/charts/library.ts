/**
 * The chart library: published Kt formulas with their source, provenance, nominal-stress
 * definition, parameters and validity range, for `raiser charts` and for the cross-check of a
 * model built from a template. The formulas themselves live in formulas.ts.
 */
import {
  ktBearingInfinitePlate,
  ktPinInPlateCloseFitNet,
  ktHoleInStripGross,
  ktHoleInStripHeywood,
  ktHoleInStripNet,
  ktInglis,
  ktKirsch,
  ktNeuberOppositeNotchesTension,
  ktOppositeSemicircularNotchesTension,
  ktOppositeUNotchesTension,
  ktSteppedBarBending,
  ktSteppedBarTension,
} from './formulas.js';
import { edgeNotchPeakStress } from './edge-notch.js';

export interface ChartParam {
  name: string;
  meaning: string;
}

export interface Chart {
  id: string;
  /**
   * The `raiser new` templates whose family this chart applies to: the one place that ties the
   * template names to the chart ids, so `raiser charts <template>` finds the charts of a family.
   */
  templates: readonly string[];
  title: string;
  source: string;
  /** [V] found in the text, [D] derived, [M] recalled, [M+] recalled with an independent check */
  provenance: string;
  /** which nominal stress: net or gross section, or the bearing stress F / (d t) of a pin */
  nominal: 'net' | 'gross' | 'bearing';
  nominalDefinition: string;
  params: ChartParam[];
  /** the range in words */
  range: string;
  /** problems with the given dimensions against the range, in words; empty when inside */
  outside(p: Record<string, number>): string[];
  evaluate(p: Record<string, number>): number;
  /** how far to trust it, as a relative spread (what REFERENCES.md allows for it) */
  spread: number;
}

const between = (v: number, lo: number, hi: number, what: string): string[] => (v >= lo - 1e-12 && v <= hi + 1e-12 ? [] : [`${what} = ${Number(v.toPrecision(4))} is outside ${lo} ... ${hi}`]);

export const CHARTS: Chart[] = [
  {
    id: 'kirsch',
    templates: ['plate-with-hole'],
    title: 'circular hole in an infinite plate, uniaxial remote tension',
    source: 'G. Kirsch, Z. VDI 42 (1898) 797-807',
    provenance: 'D',
    nominal: 'gross',
    nominalDefinition: 'the remote stress',
    params: [],
    range: 'a hole far from every edge (d/W -> 0)',
    outside: () => [],
    evaluate: () => ktKirsch('uniaxial'),
    spread: 0,
  },
  {
    id: 'inglis',
    templates: ['plate-with-elliptical-hole'],
    title: 'elliptical hole in an infinite plate, remote tension across the semi-axis a',
    source: 'C. E. Inglis, Trans. Inst. Naval Architects 55 (1913) 219-241',
    provenance: 'V',
    nominal: 'gross',
    nominalDefinition: 'the remote stress',
    params: [
      { name: 'a', meaning: 'semi-axis across the load' },
      { name: 'b', meaning: 'semi-axis along the load' },
    ],
    range: 'a hole far from every edge',
    outside: () => [],
    evaluate: (p) => ktInglis(p.a, p.b),
    spread: 0,
  },
  {
    id: 'hole-in-strip',
    templates: ['plate-with-hole'],
    title: 'central circular hole in a strip, tension',
    source: 'Howland, Phil. Trans. R. Soc. A 229 (1930); Pilkey & Pilkey, Peterson\'s Stress Concentration Factors (2008) chart 4.1 fit',
    provenance: 'M+',
    nominal: 'net',
    nominalDefinition: 'P / ((W - d) t)',
    params: [
      { name: 'W', meaning: 'strip width' },
      { name: 'd', meaning: 'hole diameter' },
    ],
    range: '0 <= d/W <= 0.5 (Howland\'s data)',
    outside: (p) => between(p.d / p.W, 0, 0.5, 'd/W'),
    evaluate: (p) => ktHoleInStripNet(p.d / p.W),
    spread: 0.02,
  },
  {
    id: 'hole-in-strip-gross',
    templates: ['plate-with-hole'],
    title: 'central circular hole in a strip, tension, on the gross section',
    source: 'as hole-in-strip, Ktg = Ktn / (1 - d/W)',
    provenance: 'M+',
    nominal: 'gross',
    nominalDefinition: 'P / (W t)',
    params: [
      { name: 'W', meaning: 'strip width' },
      { name: 'd', meaning: 'hole diameter' },
    ],
    range: '0 <= d/W <= 0.5',
    outside: (p) => between(p.d / p.W, 0, 0.5, 'd/W'),
    evaluate: (p) => ktHoleInStripGross(p.d / p.W),
    spread: 0.02,
  },
  {
    id: 'hole-in-strip-heywood',
    templates: ['plate-with-hole'],
    title: 'central circular hole in a strip, tension (Heywood\'s formula)',
    source: 'R. B. Heywood, Designing by Photoelasticity (1952): Ktn = 2 + (1 - d/W)^3',
    provenance: 'M',
    nominal: 'net',
    nominalDefinition: 'P / ((W - d) t)',
    params: [
      { name: 'W', meaning: 'strip width' },
      { name: 'd', meaning: 'hole diameter' },
    ],
    range: '0 <= d/W <= 0.5',
    outside: (p) => between(p.d / p.W, 0, 0.5, 'd/W'),
    evaluate: (p) => ktHoleInStripHeywood(p.d / p.W),
    spread: 0.02,
  },
  {
    id: 'fillet-tension',
    templates: ['stepped-bar'],
    title: 'flat bar with shoulder fillets, tension',
    source: 'Pilkey & Pilkey (2008) chart 3.1 fit',
    provenance: 'M',
    nominal: 'net',
    nominalDefinition: 'P / (d t)',
    params: [
      { name: 'D', meaning: 'wide width' },
      { name: 'd', meaning: 'narrow width' },
      { name: 'r', meaning: 'fillet radius' },
    ],
    range: '0.1 <= t/r <= 20 with t = (D - d)/2; wide part long',
    outside: (p) => between((p.D - p.d) / 2 / p.r, 0.1, 20, 't/r'),
    evaluate: (p) => ktSteppedBarTension(p.D, p.d, p.r),
    spread: 0.05,
  },
  {
    id: 'fillet-bending',
    templates: ['stepped-bar'],
    title: 'flat bar with shoulder fillets, in-plane bending',
    source: 'Pilkey & Pilkey (2008) chart 3.4 fit',
    provenance: 'M',
    nominal: 'net',
    nominalDefinition: '6 M / (t d^2)',
    params: [
      { name: 'D', meaning: 'wide width' },
      { name: 'd', meaning: 'narrow width' },
      { name: 'r', meaning: 'fillet radius' },
    ],
    range: '0.1 <= t/r <= 20 with t = (D - d)/2',
    outside: (p) => between((p.D - p.d) / 2 / p.r, 0.1, 20, 't/r'),
    evaluate: (p) => ktSteppedBarBending(p.D, p.d, p.r),
    spread: 0.05,
  },
  {
    id: 'u-notches-tension',
    templates: ['u-notched-bar'],
    title: 'flat bar with opposite U-notches, tension',
    source: 'Pilkey & Pilkey (2008) chart 2.4 fit; it agrees with Neuber\'s combination rule, which is known to run low for deep narrow notches',
    provenance: 'M+',
    nominal: 'net',
    nominalDefinition: 'P / ((H - 2t) thickness)',
    params: [
      { name: 'H', meaning: 'full width' },
      { name: 't', meaning: 'notch depth' },
      { name: 'r', meaning: 'notch root radius' },
    ],
    range: '0.1 <= t/r <= 50',
    outside: (p) => between(p.t / p.r, 0.1, 50, 't/r'),
    evaluate: (p) => ktOppositeUNotchesTension(p.H, p.t, p.r),
    spread: 0.08,
  },
  {
    id: 'semicircular-notches-tension',
    templates: ['u-notched-bar'],
    title: 'flat bar with opposite semicircular notches, tension',
    source: 'Pilkey & Pilkey (2008) chart 2.3, after C.-B. Ling (1947) and M. Isida: 3.065 - 3.472 x + 1.009 x^2 + 0.405 x^3, x = 2r/H (coefficients recalled; 3.065 at x = 0 is Ling\'s semi-infinite value)',
    provenance: 'M+',
    nominal: 'net',
    nominalDefinition: 'P / ((H - 2r) thickness)',
    params: [
      { name: 'H', meaning: 'full width' },
      { name: 'r', meaning: 'notch radius (= depth)' },
    ],
    range: '0 <= 2r/H <= 1',
    outside: (p) => between((2 * p.r) / p.H, 0, 1, '2r/H'),
    evaluate: (p) => ktOppositeSemicircularNotchesTension(p.H, p.r),
    spread: 0.02,
  },
  {
    id: 'u-notches-neuber',
    templates: ['u-notched-bar'],
    title: 'opposite notches in tension by Neuber\'s combination rule',
    source: 'H. Neuber, Kerbspannungslehre (1958)',
    provenance: 'M',
    nominal: 'net',
    nominalDefinition: 'P / ((H - 2t) thickness)',
    params: [
      { name: 'H', meaning: 'full width' },
      { name: 't', meaning: 'notch depth' },
      { name: 'r', meaning: 'notch root radius' },
    ],
    range: 'any depth; an approximation between the shallow and deep limits',
    outside: () => [],
    evaluate: (p) => ktNeuberOppositeNotchesTension(p.H, p.t, p.r),
    spread: 0.1,
  },
  {
    id: 'edge-notch-semicircular',
    templates: ['edge-notched-bar'],
    title: 'semicircular edge notch in a semi-infinite plate, tension',
    source: 'C.-B. Ling, J. Math. Phys. 26 (1948) 284-289: Kt = 3.065',
    provenance: 'M',
    nominal: 'gross',
    nominalDefinition: 'the remote stress',
    params: [
      { name: 'H', meaning: 'bar width' },
      { name: 'r', meaning: 'notch radius (= depth)' },
    ],
    range: 'a shallow notch, r/H small (below about 0.02)',
    outside: (p) => between(p.r / p.H, 0, 0.02, 'r/H'),
    evaluate: () => 3.065,
    spread: 0.02,
  },
  {
    id: 'edge-notch-slender',
    templates: ['edge-notched-bar'],
    title: 'slender single edge U-notch in a strip, tension, ends free to rotate (an estimate)',
    source: 'derived here from Creager & Paris, IJFM 3 (1967) and the edge-crack factor of Tada, Paris & Irwin (2000); low by about 1/Kt and more',
    provenance: 'D from M',
    nominal: 'gross',
    nominalDefinition: 'the remote stress',
    params: [
      { name: 'H', meaning: 'strip width' },
      { name: 't', meaning: 'notch depth' },
      { name: 'r', meaning: 'notch root radius' },
    ],
    range: 't/r >= 10 and t/H <= 0.6',
    outside: (p) => [...(p.t / p.r >= 10 ? [] : [`t/r = ${Number((p.t / p.r).toPrecision(3))} is below 10`]), ...between(p.t / p.H, 0, 0.6, 't/H')],
    evaluate: (p) => edgeNotchPeakStress(1, p.t, p.r, p.H).ktGross,
    spread: 0.12,
  },
  {
    id: 'pin-bearing-infinite-plate',
    templates: ['lug'],
    title: 'cosine bearing pressure of a pin on a hole in an infinite plate: peak hoop stress on the hole',
    source: "derived here from J.H. Michell, Proc. London Math. Soc. 31 (1899) 100: Kt = 8/pi^2 on F/(d t), at 90 deg from the force",
    provenance: 'D',
    nominal: 'bearing',
    nominalDefinition: 'F / (d t), the bearing stress',
    params: [
      { name: 'W', meaning: 'width of the part' },
      { name: 'd', meaning: 'hole diameter' },
    ],
    range: 'a hole far from every edge, d/W <= 0.01: a finite part adds about 1.85 d/W (measured on lugs in tests/bearing.test.ts)',
    outside: (p) => between(p.d / p.W, 0, 0.01, 'd/W'),
    evaluate: () => ktBearingInfinitePlate(),
    // exact as d/W -> 0; at the edge of the range the finite part adds about 2%
    spread: 0.02,
  },
  {
    id: 'pin-in-plate-close-fit',
    templates: ['lug'],
    title: 'plate pulled through a close-fitting pin in a hole (Frocht and Hill)',
    source: 'M.M. Frocht and H.N. Hill, J. Appl. Mech. 7 (1940) A5, as charted in Pilkey & Pilkey (2008) ch. 5; cubic fit in d/W; experiments with real pins (friction, some play): clearance raises Kt 35 to 50%',
    provenance: 'M',
    nominal: 'net',
    nominalDefinition: 'P / ((W - d) t)',
    params: [
      { name: 'W', meaning: 'plate width' },
      { name: 'd', meaning: 'hole diameter' },
      { name: 'e', meaning: 'distance from the hole centre to the end the pin pulls towards' },
    ],
    range: '0.15 <= d/W <= 0.75, e >= W (a long end), close fit, axial pull',
    outside: (p) => [...between(p.d / p.W, 0.15, 0.75, 'd/W'), ...(p.e === undefined || p.e >= p.W * (1 - 1e-12) ? [] : [`e/W = ${Number((p.e / p.W).toPrecision(3))} is below 1`])],
    evaluate: (p) => ktPinInPlateCloseFitNet(p.d / p.W),
    // [M] the recalled coefficients, two independent experimental series, and real pins (friction,
    // a little play) against an ideal rigid frictionless one: 15%
    spread: 0.15,
  },
];

export function findChart(id: string): Chart | undefined {
  return CHARTS.find((c) => c.id === id);
}

/** The charts that apply to the family of a `raiser new` template (empty for a name no chart lists). */
export function chartsForTemplate(template: string): Chart[] {
  return CHARTS.filter((c) => c.templates.includes(template));
}

/**
 * The chart a model built from a template belongs to, with the dimensions it needs, and which
 * Kt (net or gross) of the model to compare with it.
 */
export function chartForFamily(family: string, dims: Record<string, number>): { chart: Chart; params: Record<string, number> } | null {
  switch (family) {
    case 'plate-with-hole-tension':
      return { chart: findChart('hole-in-strip')!, params: { W: dims.W, d: dims.d } };
    case 'plate-with-elliptical-hole-tension':
      return { chart: findChart('inglis')!, params: { a: dims.a, b: dims.b } };
    case 'stepped-bar-tension':
      return { chart: findChart('fillet-tension')!, params: { D: dims.D, d: dims.d, r: dims.r } };
    case 'stepped-bar-bending':
      return { chart: findChart('fillet-bending')!, params: { D: dims.D, d: dims.d, r: dims.r } };
    case 'u-notched-bar-tension':
      // A notch as deep as its radius is a half circle: it has its own chart.
      if (Math.abs(dims.t - dims.r) <= 1e-9 * dims.r) return { chart: findChart('semicircular-notches-tension')!, params: { H: dims.H, r: dims.r } };
      return { chart: findChart('u-notches-tension')!, params: { H: dims.H, t: dims.t, r: dims.r } };
    case 'pin-loaded-lug':
    case 'pin-loaded-lug-square':
      return { chart: findChart('pin-in-plate-close-fit')!, params: { W: dims.W, d: dims.d, e: dims.e } };
    case 'bearing-loaded-lug':
    case 'bearing-loaded-lug-square':
      return { chart: findChart('pin-bearing-infinite-plate')!, params: { W: dims.W, d: dims.d } };
    case 'edge-notched-bar-tension': {
      const shallow = dims.t === dims.r && dims.r / dims.H <= 0.02;
      return shallow ? { chart: findChart('edge-notch-semicircular')!, params: { H: dims.H, r: dims.r } } : { chart: findChart('edge-notch-slender')!, params: { H: dims.H, t: dims.t, r: dims.r } };
    }
  }
  return null;
}

export interface ChartComparison {
  id: string;
  title: string;
  source: string;
  provenance: string;
  nominal: 'net' | 'gross' | 'bearing';
  value: number;
  /** the computed Kt on the chart's nominal stress (null when withheld) */
  computed: number | null;
  /** computed / chart - 1; null when the part lies outside the chart's range or conditions (`outside` says why) or no Kt was computed */
  difference: number | null;
  spread: number;
  outside: string[];
}

/**
 * The chart value beside a computed Kt (net and gross given; the chart says which it uses). No
 * difference is given outside the chart's range: a fit is not a statement about the shapes it
 * excludes.
 */
export function compareWithChart(family: string, dims: Record<string, number>, kt: { net: number | null; gross: number | null }): ChartComparison | null {
  const found = chartForFamily(family, dims);
  if (!found) return null;
  const { chart, params } = found;
  const outside = chart.outside(params);
  // a pin chart holds for a close fit pulled along the axis
  if (dims.clearance) outside.push(`the pin has a clearance of ${Number(dims.clearance.toPrecision(4))}; the chart is for a close fit (clearance raises Kt)`);
  if (dims.angle) outside.push(`the pin pulls at ${Number(dims.angle.toPrecision(4))} deg from the axis; the chart is for an axial pull`);
  let value: number;
  try {
    value = chart.evaluate(params);
  } catch (err) {
    outside.push((err as Error).message);
    value = NaN;
  }
  // the bearing stress F/(d t) of a pin pulling along the axis is the net stress F/((W - d) t) times (W - d)/d,
  // so Kt on it is Kt net times d/(W - d)
  const computed = chart.nominal === 'net' ? kt.net : chart.nominal === 'gross' ? kt.gross : kt.net === null ? null : (kt.net * dims.d) / (dims.W - dims.d);
  const difference = computed === null || outside.length > 0 || !Number.isFinite(value) ? null : computed / value - 1;
  return { id: chart.id, title: chart.title, source: chart.source, provenance: chart.provenance, nominal: chart.nominal, value, computed, difference, spread: chart.spread, outside };
}
