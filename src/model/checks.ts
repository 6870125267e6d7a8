/**
 * Checks on a model that has passed the schema and that need nothing but the file itself:
 * selectors that name tags or holes that do not exist, loads that carry nothing, a missing
 * support, mesh sizes given the wrong way round. Geometric checks (does a loop close, does a
 * hole fit) belong to the geometry stage, which reports them with the same kind of error.
 *
 * Errors stop the run. Warnings are things that are legal but probably not meant; they do not
 * change the result and are for the command line to print.
 */
import { ModelError, formatPath, quoteText } from './errors.js';
import type { Load, Loop, Model, Selector, Target } from './schema.js';
import { didYouMean, quoteList } from './suggest.js';
import { resolveUnits } from './units.js';
import { checkLoadCases, loadsWithPaths } from './load-cases.js';

type Part = string | number;

/**
 * What the checks need to know of a drawing named by `"geometry": { "from": ... }`, as plain
 * data: the geometry stage reads the drawing (src/geometry/import) and hands this in.
 */
export interface DrawingNames {
  /** every tag carried by an edge of the outline or a hole */
  tags: readonly string[];
  /** each hole's name, in the drawing's order (undefined for a hole without one) */
  holeNames: readonly (string | undefined)[];
}

export interface ModelCheck {
  errors: ModelError[];
  warnings: ModelError[];
}

interface Declared {
  /** tag name -> where it is first declared, for messages */
  tags: Map<string, string>;
  holeNames: string[];
  holeCount: number;
  /** the geometry comes from a drawing that has not been read: names cannot be checked */
  unknown?: boolean;
  /** the geometry comes from this drawing file */
  drawing?: string;
}

function declaredNames(model: Model, drawing: DrawingNames | undefined): Declared {
  const tags = new Map<string, string>();
  const add = (tag: string | undefined, where: string) => {
    if (tag !== undefined && !tags.has(tag)) tags.set(tag, where);
  };
  const g = model.geometry;
  if ('from' in g) {
    // Tags and hole names come from the drawing, when the caller has read it.
    if (!drawing) return { tags, holeNames: [], holeCount: 0, unknown: true };
    for (const t of drawing.tags) add(t, 'geometry.from');
    return { tags, holeNames: drawing.holeNames.filter((n): n is string => n !== undefined), holeCount: drawing.holeNames.length, drawing: g.from };
  }
  const loops: [Loop, Part[]][] = [[g.outline, ['geometry', 'outline']]];
  (g.holes ?? []).forEach((h, i) => loops.push([h, ['geometry', 'holes', i]]));
  for (const [loop, parts] of loops) {
    add(loop.tag, formatPath([...parts, 'tag']));
    if (loop.shape === 'path') {
      loop.path.forEach((v, i) => {
        if (!Array.isArray(v)) add((v as { edge?: string }).edge, formatPath([...parts, 'path', i, 'edge']));
      });
    }
  }
  const holes = g.holes ?? [];
  return { tags, holeNames: holes.map((h) => h.name).filter((n): n is string => n !== undefined), holeCount: holes.length };
}

function selectorsOf(target: Target, parts: Part[]): [Selector, Part[]][] {
  // No selector form is itself a list, so a list is always a list of selectors.
  if (Array.isArray(target)) return target.map((s, i) => [s, [...parts, i]]);
  return [[target as Selector, parts]];
}

function checkSelector(sel: Selector, parts: Part[], names: Declared, errors: ModelError[]): void {
  const path = formatPath(parts);
  if (names.unknown) return;
  if (typeof sel === 'string') {
    if (names.tags.has(sel)) return;
    const tags = [...names.tags.keys()];
    if (names.holeNames.includes(sel)) {
      errors.push(new ModelError(path, `no edge or loop has the tag "${quoteText(sel)}"; "${quoteText(sel)}" is the name of a hole`, `to select that hole write {"hole": "${sel}"}`));
      return;
    }
    const hint = names.drawing
      ? tags.length === 0
        ? `the edges of ${names.drawing} carry no tags: put them on layers (DXF) or give them ids or classes (SVG)`
        : `the tags of ${names.drawing} (its layers, ids and classes) are ${quoteList(tags, 'and')}`
      : tags.length === 0
        ? 'no tags are declared: tag an edge with "edge": "name" on the vertex where the edge starts, or a whole loop with "tag": "name"'
        : `the tags declared are ${quoteList(tags, 'and')}`;
    errors.push(new ModelError(path, `no edge or loop has the tag "${quoteText(sel)}"${didYouMean(sel, tags)}`, hint));
    return;
  }
  if ('hole' in sel) {
    const h = sel.hole;
    if (typeof h === 'number') {
      if (h > names.holeCount) {
        const msg = names.holeCount === 0 ? `there is no hole ${h}: the model has no holes` : `there is no hole ${h}: the model has ${names.holeCount} hole${names.holeCount === 1 ? '' : 's'}`;
        const hint =
          names.holeCount === 0
            ? 'holes are numbered from 1 in the order of geometry.holes; a hole cut by a symmetry line is part of the outline, so select its edges by tag'
            : `holes are numbered from 1 to ${names.holeCount} in the order of geometry.holes`;
        errors.push(new ModelError(formatPath([...parts, 'hole']), msg, hint));
      }
    } else {
      const count = names.holeNames.filter((n) => n === h).length;
      if (count === 0) {
        const hint = names.holeNames.length ? `the holes are named ${quoteList(names.holeNames, 'and')}` : 'no hole has a name; give one with "name" on the hole, or select it by number';
        errors.push(new ModelError(formatPath([...parts, 'hole']), `no hole is named "${quoteText(String(h))}"${didYouMean(h, names.holeNames)}`, hint));
      } else if (count > 1) {
        errors.push(new ModelError(formatPath([...parts, 'hole']), `${count} holes are named "${h}", so the selector is ambiguous`, 'give the holes different names, or select by number'));
      }
    }
    return;
  }
  if ('box' in sel) {
    const [[x0, y0], [x1, y1]] = sel.box;
    if (x0 > x1 || y0 > y1) {
      errors.push(new ModelError(formatPath([...parts, 'box']), `the box corners are not [[xmin, ymin], [xmax, ymax]]: found [[${x0}, ${y0}], [${x1}, ${y1}]]`, `write [[${Math.min(x0, x1)}, ${Math.min(y0, y1)}], [${Math.max(x0, x1)}, ${Math.max(y0, y1)}]]`));
    }
    return;
  }
  if ('line' in sel) {
    const [[x0, y0], [x1, y1]] = sel.line;
    if (x0 === x1 && y0 === y1) errors.push(new ModelError(formatPath([...parts, 'line']), 'the two points of the line are the same point', 'give two different points on the line'));
  }
}

function loadCarriesNothing(load: Load): string | undefined {
  switch (load.type) {
    case 'traction':
      if (load.normal === undefined && load.shear === undefined) return 'gives neither "normal" nor "shear"';
      return undefined;
    case 'force':
      if (load.fx === undefined && load.fy === undefined) return 'gives neither "fx" nor "fy"';
      return undefined;
    case 'remote':
      if (load.sxx === undefined && load.syy === undefined && load.sxy === undefined) return 'gives none of "sxx", "syy" and "sxy"';
      return undefined;
    default:
      return undefined;
  }
}

function loadIsZero(load: Load): boolean {
  switch (load.type) {
    case 'traction':
      return !load.normal && !load.shear;
    case 'force':
      return !load.fx && !load.fy;
    case 'moment':
      return !load.m;
    case 'pressure':
      return !load.p;
    case 'remote':
      return !load.sxx && !load.syy && !load.sxy;
    case 'bearing':
    case 'rigid-pin':
      return !load.force[0] && !load.force[1];
  }
}

/**
 * The semantic checks; the model must already have passed the schema. For a model whose
 * geometry comes from a drawing, `drawing` gives the drawing's tags and hole names; without it
 * the selectors that name them cannot be checked and are left alone.
 */
export function checkModel(model: Model, drawing?: DrawingNames): ModelCheck {
  const errors: ModelError[] = [];
  const warnings: ModelError[] = [];
  const names = declaredNames(model, drawing);

  // Circles: exactly one size. (Both given and equal is accepted.)
  const loops: [Loop, Part[]][] = [];
  const geo = model.geometry;
  if (!('from' in geo)) {
    loops.push([geo.outline, ['geometry', 'outline']]);
    (geo.holes ?? []).forEach((h, i) => loops.push([h, ['geometry', 'holes', i]]));
  }
  for (const [loop, parts] of loops) {
    if (loop.shape !== 'circle') continue;
    if (loop.radius === undefined && loop.diameter === undefined) {
      errors.push(new ModelError(formatPath(parts), 'a circle needs its size: neither "radius" nor "diameter" is given', 'add "radius" or "diameter"'));
    } else if (loop.radius !== undefined && loop.diameter !== undefined && Math.abs(2 * loop.radius - loop.diameter) > 1e-12 * loop.diameter) {
      errors.push(new ModelError(formatPath([...parts, 'diameter']), `radius ${loop.radius} and diameter ${loop.diameter} disagree`, 'give only one of them'));
    }
  }

  // Supports.
  model.supports.forEach((s, i) => {
    if (s.type === 'pin') return;
    for (const [sel, parts] of selectorsOf(s.on, ['supports', i, 'on'])) checkSelector(sel, parts, names, errors);
  });

  // Loads.
  // Loads: exactly one of loads and loadCases (src/model/load-cases.ts), then each load where it is.
  errors.push(...checkLoadCases(model));
  for (const { load, path } of loadsWithPaths(model)) {
    const nothing = loadCarriesNothing(load);
    if (nothing) errors.push(new ModelError(formatPath(path), `this "${load.type}" load ${nothing}`, 'give at least one component'));
    if (load.on !== undefined) for (const [sel, parts] of selectorsOf(load.on, [...path, 'on'])) checkSelector(sel, parts, names, errors);
  }
  const caseLoads: [string, Load[]][] = model.loads ? [['loads', model.loads]] : (model.loadCases ?? []).map((c, i) => [`loadCases[${i}].loads`, c.loads]);
  for (const [path, loads] of caseLoads) {
    if (loads.length > 0 && loads.every(loadIsZero) && !loads.some((l) => loadCarriesNothing(l))) {
      errors.push(new ModelError(path, 'every load is zero, so there is no stress and no Kt', 'give at least one load a value other than 0'));
    }
  }

  // Material.
  const m = model.material;
  if (m.yield !== undefined && m.ultimate !== undefined && m.yield > m.ultimate) {
    errors.push(new ModelError('material.yield', `the yield strength ${m.yield} is above the ultimate strength ${m.ultimate}`, 'check the two values; yield cannot exceed ultimate'));
  }
  const units = resolveUnits(model.units);
  const ePa = m.E * units.toSI.stress;
  // Engineering solids for which a linear Kt means something run from about 0.5 GPa (soft
  // polymers such as PTFE) to about 1200 GPa (diamond). Outside that the unit is probably
  // wrong (210 written for 210 GPa in a MPa file, or Pa written in a MPa file). Stresses from
  // traction loads do not depend on E; displacements do. So: a warning.
  if (ePa < 5e8 || ePa > 1.2e12) {
    const gpa = ePa / 1e9;
    warnings.push(
      new ModelError(
        'material.E',
        `E = ${m.E} ${units.stress} is ${Number(gpa.toPrecision(3))} GPa, outside the range of engineering solids (about 0.5 to 1200 GPa)`,
        `E is in the file's stress unit (${units.stress}); for steel write ${Number((210e9 / units.toSI.stress).toPrecision(4))}`,
      ),
    );
  }

  // Mesh sizes. raiserSize larger than size would make the mesh coarser at the stress raisers
  // than away from them, the opposite of what the setting is for; it is almost certainly the
  // two values swapped, and it would give a less accurate Kt with no sign of it. So: an error.
  const mesh = model.mesh;
  if (mesh?.size !== undefined && mesh.raiserSize !== undefined && mesh.raiserSize > mesh.size) {
    errors.push(
      new ModelError(
        'mesh.raiserSize',
        `raiserSize ${mesh.raiserSize} is larger than size ${mesh.size}: the mesh would be coarser at the stress raisers than elsewhere`,
        `raiserSize is the element size at holes, notches and fillets and must not exceed size; did you swap them? (raiserSize ${mesh.size}, size ${mesh.raiserSize})`,
      ),
    );
  }

  // Results.
  const sec = model.results?.section;
  if (sec && sec !== 'auto' && sec.from[0] === sec.to[0] && sec.from[1] === sec.to[1]) {
    errors.push(new ModelError('results.section', 'the section cut has the same start and end point', 'give two different points, or "auto"'));
  }
  const dir = model.results?.direction;
  if (dir && dir[0] === 0 && dir[1] === 0) errors.push(new ModelError('results.direction', 'the load direction [0, 0] has no direction', 'give a non-zero vector, for example [1, 0] for x'));

  return { errors, warnings };
}
