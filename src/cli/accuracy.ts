import { ModelError } from '../model/errors.js';

/** "0.5%" or "0.005" -> 0.005; a ModelError for anything else. */
export function parseAccuracy(text: string): number {
  const m = /^\s*(\d*\.?\d+(?:e-?\d+)?)\s*(%?)\s*$/i.exec(text);
  const v = m ? Number(m[1]) / (m[2] ? 100 : 1) : NaN;
  if (!(v > 0 && v < 0.5)) {
    throw new ModelError('--accuracy', `"${text}" is not an accuracy raiser can aim for`, 'give a relative error such as 1% or 0.005 (more than 0, less than 50%)');
  }
  return v;
}

