/**
 * Sweep cases: which models a `--vary` specification makes, and how one case's model is built.
 *
 *   --vary name=from:to:count   count values from `from` to `to`, both included
 *   --vary name=v1,v2,v3        the listed values
 * Two --vary give every combination (a family of curves: the first is the x axis).
 *
 * A name may be a declared parameter of the model ("parameters" with "=expressions"), or, for a
 * model made by `raiser new` (it records chart.family and chart.dims), one of its chart
 * dimensions: the template is then expanded again with the new value, and the file's material,
 * thickness, units, mesh and result settings are kept.
 */
import { createHash } from 'node:crypto';
import { ModelError, quoteText } from '../model/errors.js';
import { readModelText } from '../model/load.js';
import type { Model } from '../model/schema.js';
import type { ImportedDrawing } from '../geometry/import/index.js';
import { loadModelAndDrawing, type ModelAndDrawingOptions } from '../pipeline/load.js';
import { closest } from '../model/suggest.js';
import { expandTemplate } from '../model/templates.js';

export interface Vary {
  name: string;
  values: number[];
}

export function parseVary(spec: string): Vary {
  const m = /^\s*([A-Za-z_][A-Za-z0-9_-]*)\s*=\s*(.+)$/.exec(spec);
  if (!m) throw new ModelError('--vary', `"${spec}" is not a sweep specification`, 'write --vary name=from:to:count or --vary name=v1,v2,v3');
  const name = m[1];
  const body = m[2].trim();
  const num = (t: string) => {
    const w = t.trim();
    if (w === '') throw new ModelError('--vary', `--vary ${quoteText(spec)} has an empty value (two separators in a row, or one at an end)`, 'write --vary name=v1,v2,v3 or --vary name=from:to:count, with a number between each pair of separators');
    const v = /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(w) ? Number(w) : NaN;
    if (!Number.isFinite(v)) throw new ModelError('--vary', `"${quoteText(w)}" in --vary ${quoteText(spec)} is not a ${Number.isNaN(v) ? 'decimal number' : 'finite number'}`, 'write --vary name=from:to:count or --vary name=v1,v2,v3 with plain decimal numbers');
    return v;
  };
  if (body.includes(':')) {
    const parts = body.split(':');
    if (parts.length < 2 || parts.length > 3) throw new ModelError('--vary', `"${spec}" needs from:to or from:to:count`, 'for example --vary fillet=1:10:10');
    const a = num(parts[0]);
    const b = num(parts[1]);
    const n = parts.length === 3 ? num(parts[2]) : 2;
    if (!Number.isInteger(n) || n < 2 || n > 1000) throw new ModelError('--vary', `the count ${parts[2]} in --vary ${spec} must be a whole number from 2 to 1000`);
    return { name, values: Array.from({ length: n }, (_, k) => a + ((b - a) * k) / (n - 1)) };
  }
  const values = body.split(',').map(num);
  if (values.length > 1000) throw new ModelError('--vary', `--vary ${name} lists ${values.length} values, more than the 1000 one sweep may solve`, 'give fewer values');
  return { name, values };
}

/** The template behind a chart family, and its parameter names for the recorded dimensions. */
const FAMILY_TEMPLATE: Record<string, { template: string; extra?: Record<string, string> }> = {
  'plate-with-hole-tension': { template: 'plate-with-hole' },
  'plate-with-elliptical-hole-tension': { template: 'plate-with-elliptical-hole' },
  'stepped-bar-tension': { template: 'stepped-bar', extra: { loading: 'tension' } },
  'stepped-bar-bending': { template: 'stepped-bar', extra: { loading: 'bending' } },
  'u-notched-bar-tension': { template: 'u-notched-bar' },
  'edge-notched-bar-tension': { template: 'edge-notched-bar' },
  'pin-loaded-lug': { template: 'lug', extra: { end: 'round', load: 'pin' } },
  'pin-loaded-lug-square': { template: 'lug', extra: { end: 'square', load: 'pin' } },
  'bearing-loaded-lug': { template: 'lug', extra: { end: 'round', load: 'bearing' } },
  'bearing-loaded-lug-square': { template: 'lug', extra: { end: 'square', load: 'bearing' } },
  'pin-link': { template: 'link' },
};

const kebab = (s: string) => s.replace(/[A-Z]/g, (c, i) => (i > 0 && /[a-z]/.test(s[i - 1]) ? `-${c.toLowerCase()}` : c));

export interface SweepSource {
  text: string;
  file: string;
  model: Model;
  /** the drawing the base model's geometry comes from (read once; the cases share it) */
  drawing: ImportedDrawing | undefined;
  /** how the names are realised: model parameters or template dimensions */
  kind: 'parameters' | 'template';
  names: string[];
  /** a short hash of the model text, so a resumed sweep only reuses cases of the same model */
  signature: string;
  /** how each case's model is loaded (a drawing outside the model's folder allowed, say) */
  load: SweepLoadOptions;
}

/** How the model of a sweep is loaded (its cases' parameters and shared drawing are the sweep's own). */
export type SweepLoadOptions = Omit<ModelAndDrawingOptions, 'parameters' | 'known'>;

export function readSweepSource(file: string, vary: Vary[], load: SweepLoadOptions = {}): SweepSource {
  const text = readModelText(file);
  const { model, drawing } = loadModelAndDrawing(text, file, load);
  const names = vary.map((v) => v.name);
  if (new Set(names).size !== names.length) throw new ModelError('--vary', 'the same name is varied twice', 'give each --vary a different name');
  const declared = Object.keys(model.parameters ?? {});
  const isParam = names.every((n) => declared.includes(n));
  const dims = model.chart?.dims ?? {};
  const isDim = !!model.chart && !!FAMILY_TEMPLATE[model.chart.family] && names.every((n) => n in dims);
  if (!isParam && !isDim) {
    const bad = names.find((n) => !declared.includes(n) && !(n in dims))!;
    const candidates = [...declared, ...Object.keys(dims)];
    const near = closest(bad, candidates);
    throw new ModelError(
      '--vary',
      `"${bad}" is neither a parameter of ${file} nor a dimension of its template${near ? `; did you mean "${near}"?` : ''}`,
      candidates.length ? `it has ${candidates.join(', ')}` : 'declare it under "parameters" and write the numbers that depend on it as "=expressions"',
      file,
    );
  }
  return { text, file, model, drawing, kind: isParam ? 'parameters' : 'template', names, signature: createHash('sha256').update(text).digest('hex').slice(0, 16), load };
}

/** The model of one case, and the drawing its geometry comes from (the base model's, unless a parameter changes how it is read). */
export function caseModel(src: SweepSource, values: Record<string, number>): { model: Model; drawing: ImportedDrawing | undefined } {
  if (src.kind === 'parameters') {
    const { model, drawing } = loadModelAndDrawing(src.text, src.file, { ...src.load, parameters: values, known: { model: src.model, drawing: src.drawing } });
    return { model, drawing };
  }
  const chart = src.model.chart!;
  const fam = FAMILY_TEMPLATE[chart.family];
  const dims: Record<string, number | string> = {};
  for (const [k, v] of Object.entries({ ...chart.dims, ...values })) dims[kebab(k)] = v;
  const m = expandTemplate(fam.template, { ...dims, ...(fam.extra ?? {}) });
  const keep = src.model;
  // A template writes its loops out: no drawing.
  return { model: { ...m, title: keep.title ?? m.title, material: keep.material, thickness: keep.thickness, units: keep.units, mesh: keep.mesh, results: keep.results, state: keep.state }, drawing: undefined };
}

export function caseKey(values: Record<string, number>): string {
  return Object.entries(values)
    .map(([k, v]) => `${k}=${Number(v.toPrecision(12))}`)
    .join(',');
}

export function allCases(vary: Vary[]): Record<string, number>[] {
  let out: Record<string, number>[] = [{}];
  for (const v of vary) out = out.flatMap((c) => v.values.map((x) => ({ ...c, [v.name]: x })));
  return out;
}
