/**
 * Geometric transforms of a whole model file, for invariance tests: x -> s R (mirror x) with R
 * a rotation by a multiple of 90 degrees (so symmetry planes stay axis-parallel). Loads and
 * supports are carried along: arc turns flip under a mirror, shear tractions and moments change
 * sign, selectors move with the geometry.
 */
import type { Model } from '../../src/model/schema.js';

export interface Similarity {
  scale?: number;
  mirrorX?: boolean;
  /** quarter turns counter-clockwise */
  quarterTurns?: number;
  /** added to every point after the scaling and turning */
  translate?: [number, number];
}

export function transformModel(model: Model, t: Similarity): Model {
  const s = t.scale ?? 1;
  const m = t.mirrorX ? -1 : 1;
  const q = (((t.quarterTurns ?? 0) % 4) + 4) % 4;
  const rot = (x: number, y: number): [number, number] => {
    let a = m * x * s;
    let b = y * s;
    for (let k = 0; k < q; k++) [a, b] = [-b, a];
    return [a, b];
  };
  const turn = (v: 'ccw' | 'cw') => (t.mirrorX ? (v === 'ccw' ? 'cw' : 'ccw') : v);
  const angle = (deg: number) => (t.mirrorX ? 180 - deg : deg) + 90 * q;
  const json = JSON.parse(JSON.stringify(model));
  const [tx, ty] = t.translate ?? [0, 0];
  const point = (p: [number, number]): [number, number] => {
    const [a, b] = rot(p[0], p[1]);
    return [a + tx, b + ty];
  };
  const loop = (l: any) => {
    if (l.center) l.center = point(l.center);
    for (const k of ['radius', 'diameter', 'a', 'b', 'length', 'width', 'height']) if (typeof l[k] === 'number') l[k] *= s;
    if (l.shape === 'rounded-rect' && typeof l.radius === 'number') void 0;
    if (l.shape !== 'circle' && l.shape !== 'path') l.angle = angle(l.angle ?? 0);
    if (l.path) {
      l.path = l.path.map((v: any) => {
        if (Array.isArray(v)) return point(v as [number, number]);
        const o = { ...v, at: point(v.at) };
        if (typeof o.round === 'number') o.round *= s;
        if (o.arc) {
          o.arc = { ...o.arc };
          if (o.arc.turn) o.arc.turn = turn(o.arc.turn);
          if (o.arc.center) o.arc.center = point(o.arc.center);
          if (o.arc.through) o.arc.through = point(o.arc.through);
          if (typeof o.arc.radius === 'number') o.arc.radius *= s;
        }
        return o;
      });
    }
  };
  loop(json.geometry.outline);
  for (const h of json.geometry.holes ?? []) loop(h);
  const selector = (sel: any): any => {
    if (typeof sel === 'string' || sel.hole !== undefined || sel.outline) return sel;
    if (Array.isArray(sel)) return sel.map(selector);
    const line = (p: [number, number], r: [number, number]) => ({ line: [point(p), point(r)] });
    if (sel.x !== undefined) return line([sel.x, 0], [sel.x, 1]);
    if (sel.y !== undefined) return line([0, sel.y], [1, sel.y]);
    if (sel.line) return { line: sel.line.map(point) };
    if (sel.box) {
      const [a, b] = sel.box.map(point);
      return { box: [[Math.min(a[0], b[0]), Math.min(a[1], b[1])], [Math.max(a[0], b[0]), Math.max(a[1], b[1])]] };
    }
    return sel;
  };
  json.thickness *= s;
  for (const sup of json.supports) {
    if (sup.on) sup.on = selector(sup.on);
    if (sup.at) sup.at = point(sup.at);
    if (sup.fix && q % 2 === 1) sup.fix = sup.fix === 'x' ? 'y' : sup.fix === 'y' ? 'x' : sup.fix;
  }
  for (const load of json.loads) {
    if (load.on) load.on = selector(load.on);
    if (load.type === 'traction' && t.mirrorX && load.shear) load.shear = -load.shear;
    if (load.type === 'force') {
      const [fx, fy] = rot(load.fx ?? 0, load.fy ?? 0);
      load.fx = fx / s;
      load.fy = fy / s;
      load.fx *= s * s;
      load.fy *= s * s;
    }
    if (load.type === 'moment') load.m *= (t.mirrorX ? -1 : 1) * s * s * s;
    if (load.type === 'remote') {
      // Stress tensor transforms as R S R^T; quarter turns swap sxx and syy and flip sxy.
      let { sxx = 0, syy = 0, sxy = 0 } = load;
      if (t.mirrorX) sxy = -sxy;
      for (let k = 0; k < q; k++) [sxx, syy, sxy] = [syy, sxx, -sxy];
      Object.assign(load, { sxx, syy, sxy });
    }
  }
  if (json.mesh) for (const k of ['size', 'raiserSize']) if (typeof json.mesh[k] === 'number') json.mesh[k] *= s;
  if (json.results?.section && json.results.section !== 'auto') {
    json.results.section = { from: point(json.results.section.from), to: point(json.results.section.to) };
  }
  if (json.results?.direction) json.results.direction = rot(json.results.direction[0] / s, json.results.direction[1] / s);
  delete json.chart;
  return json;
}
