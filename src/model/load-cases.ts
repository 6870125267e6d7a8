/**
 * Load cases: a model gives either `loads` (one case, unnamed) or `loadCases` (several named
 * cases on the same part and supports). Every later stage works on a model of one case: this
 * module checks the choice and splits a model of several cases into one model per case, each
 * with its own `loads` and no `loadCases`.
 *
 * Pins in holes are refused with load cases: a rigid pin's contact arc depends on the load, so
 * the matrix would differ per case (no shared factorisation), and a bearing pin's hole is given
 * its own treatment in the nominal stress; a model with pins is run once per case instead.
 */
import { InternalError, ModelError } from './errors.js';
import type { Load, Model } from './schema.js';

/** One load case of a model: its name (null for a model's plain `loads`) and the model with only its loads. */
export interface CaseModel {
  name: string | null;
  model: Model;
}

/** The loads of a model of one case; a model with loadCases must be split first (splitLoadCases). */
export function loadsOf(model: Model): Load[] {
  if (!model.loads) throw new InternalError('a model with loadCases reached a stage that takes one load case; split it with splitLoadCases first');
  return model.loads;
}

/** Refuses a model with loadCases where a command takes one load case (a sweep, for one). */
export function refuseLoadCases(model: Model, where: string): void {
  if (model.loadCases) {
    throw new ModelError('loadCases', `${where} takes a model of one load case, and this one has ${model.loadCases.length}`, 'give "loads" (one case), or solve every case with raiser solve');
  }
}

/**
 * The refusals about loads versus loadCases: exactly one of the two, names unique. (An empty
 * case, or an empty name, is refused by the schema.)
 */
export function checkLoadCases(model: Model): ModelError[] {
  const errors: ModelError[] = [];
  if (model.loads !== undefined && model.loadCases !== undefined) {
    errors.push(new ModelError('loadCases', 'the model gives both "loads" and "loadCases"', 'keep one: "loads" for one load case, or move those loads into a case of "loadCases"'));
  } else if (model.loads === undefined && model.loadCases === undefined) {
    errors.push(new ModelError('', 'the model gives no loads', 'add "loads": [ ... ] (one load case), or "loadCases": [{ "name": "...", "loads": [ ... ] }, ...]'));
  }
  const seen = new Map<string, number>();
  (model.loadCases ?? []).forEach((c, i) => {
    const first = seen.get(c.name);
    if (first !== undefined) errors.push(new ModelError(`loadCases[${i}].name`, `the name "${c.name}" is already used by loadCases[${first}]`, 'give every load case its own name'));
    else seen.set(c.name, i);
  });
  if (model.loadCases) {
    const pinSupport = model.supports.findIndex((s) => s.type === 'rigid-pin');
    if (pinSupport >= 0) {
      errors.push(new ModelError(`supports[${pinSupport}]`, 'a rigid pin support is in contact, which depends on the load: load cases cannot share one factorisation with it', 'run each case as a model of its own with "loads"'));
    }
    model.loadCases.forEach((c, i) =>
      c.loads.forEach((l, j) => {
        if (l.type === 'bearing' || l.type === 'rigid-pin') {
          errors.push(new ModelError(`loadCases[${i}].loads[${j}]`, `a "${l.type}" load (a pin in a hole) is not supported in load cases`, 'run each case with a pin as a model of its own with "loads"'));
        }
      }),
    );
  }
  return errors;
}

/** The loads of every case with the JSON path each is found at (for the checks of each load). */
export function loadsWithPaths(model: Model): { load: Load; path: (string | number)[] }[] {
  if (model.loads) return model.loads.map((load, i) => ({ load, path: ['loads', i] }));
  return (model.loadCases ?? []).flatMap((c, i) => c.loads.map((load, j) => ({ load, path: ['loadCases', i, 'loads', j] })));
}

/**
 * One model per load case. A model with plain `loads` comes back as itself (the same object),
 * unnamed; a model with loadCases gives one model per case, in the file's order, each with that
 * case's loads as `loads` and without `loadCases` (the caller's model is not changed).
 */
export function splitLoadCases(model: Model): CaseModel[] {
  if (!model.loadCases) return [{ name: null, model }];
  const { loadCases, ...rest } = model;
  return loadCases.map((c) => ({ name: c.name, model: { ...rest, loads: c.loads } }));
}
