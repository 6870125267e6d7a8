/**
 * Loading a model together with the drawing it names: the model layer parses and validates the
 * file (src/model/load.ts), the geometry layer reads the drawing of `"geometry": { "from": ... }`
 * relative to the model file (src/geometry/import), and the model's checks then see the
 * drawing's tags and hole names as plain data. The drawing is returned beside the model, never
 * attached to it: the model stays the data of its file (it survives JSON.stringify unchanged),
 * and every stage that builds the geometry is handed the drawing explicitly.
 */
import type { DrawingNames } from '../model/checks.js';
import { ModelError } from '../model/errors.js';
import { checkParsedModel, parseModel, readModelText, type LoadOptions, type LoadedModel } from '../model/load.js';
import type { Model } from '../model/schema.js';
import { readModelDrawing, type ImportedDrawing } from '../geometry/import/index.js';

export interface ModelAndDrawingOptions extends LoadOptions {
  /** let geometry.from name a drawing outside the model file's folder (see importDrawing) */
  allowDrawingOutside?: boolean;
  /**
   * A drawing already read for a model of the same file: it is used, not read again, when this
   * model's geometry and units are the same as that model's (the cases of a sweep share the
   * base model's drawing unless a parameter changes how it is read).
   */
  known?: { model: Model; drawing: ImportedDrawing | undefined };
}

export interface LoadedModelAndDrawing extends LoadedModel {
  /** the drawing the geometry comes from; undefined when the loops are written in the file */
  drawing: ImportedDrawing | undefined;
}

/** Reads, parses and validates a model file and the drawing it names; throws ModelError (or ModelErrorList) on any problem. */
export function loadModelFileAndDrawing(path: string, options: ModelAndDrawingOptions = {}): LoadedModelAndDrawing {
  return loadModelAndDrawing(readModelText(path), path, options);
}

/** As loadModelFileAndDrawing, from the text of the model file (`file` is where it is, for the drawing's folder and messages). */
export function loadModelAndDrawing(text: string, file?: string, options: ModelAndDrawingOptions = {}): LoadedModelAndDrawing {
  const parsed = parseModel(text, file, { parameters: options.parameters });
  const known = options.known;
  let drawing: ImportedDrawing | undefined;
  let drawingWarnings: ModelError[] = [];
  if (known && readSameDrawing(parsed.model, known.model)) drawing = known.drawing;
  else {
    try {
      drawing = readModelDrawing(parsed.model, file, options.allowDrawingOutside ?? false);
    } catch (e) {
      throw e instanceof ModelError ? parsed.locate(e) : e;
    }
    drawingWarnings = (drawing?.warnings ?? []).map((w) => new ModelError('geometry.from', w, undefined, file));
  }
  const loaded = checkParsedModel(parsed, drawing && namesOf(drawing), drawingWarnings);
  return { ...loaded, drawing };
}

/** The tags and hole names of a drawing, as the model's checks take them. */
export function namesOf(drawing: ImportedDrawing): DrawingNames {
  return { tags: drawing.tags, holeNames: drawing.holes.map((h) => h.name) };
}

/** True when two models read their drawing the same way: the same geometry (file, unit, scale, layers...) and the same units. */
function readSameDrawing(a: Model, b: Model): boolean {
  return JSON.stringify(a.geometry) === JSON.stringify(b.geometry) && JSON.stringify(a.units ?? null) === JSON.stringify(b.units ?? null);
}
