/**
 * The reference model files in meshes/: published stress-concentration cases built with the
 * templates, so they stay consistent with them. Each file's note names the published case,
 * its source and the check value with its provenance tag as listed in docs/REFERENCES.md
 * at the time of writing ([V] found in the text, [D] derived from a closed form, [M] recalled,
 * [M+] recalled with an independent cross-check). The dimensions are chosen here; the ratios
 * that matter (d/W, D/d, r/d, t/r, ...) are the published cases'.
 *
 * The files are written by `node dist/model/write-meshes.js` and a test checks that the
 * committed files equal what this module generates.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { formatJson } from './format-json.js';
import type { Model } from './schema.js';
import { expandTemplate } from './templates.js';

export interface ReferenceCase {
  /** file name in meshes/ */
  file: string;
  template: string;
  params: Record<string, number | string>;
  /** the published case, its source, and the check value with its provenance */
  reference: string;
}

const HOWLAND =
  'Source: R.C.J. Howland, Phil. Trans. R. Soc. A 229 (1930) 49-86 (series solution, d/W up to 0.5) [M]; ' +
  "fit: Pilkey and Pilkey, Peterson's Stress Concentration Factors, chart 4.1, Ktn = 2 + 0.284(1 - d/W) - 0.600(1 - d/W)^2 + 1.32(1 - d/W)^3, Ktg = Ktn/(1 - d/W) [M+: coefficients recalled, cross-checked against the recalled Howland table within 0.5 % and chart readings within 1 %].";

/** [d/W, Howland Ktg [M], fit Ktn, fit Ktg] from REFERENCES.md §3. */
const HOLE_TABLE: [number, string, string, string][] = [
  [0.1, '3.03', '2.732', '3.035'],
  [0.2, '3.14', '2.519', '3.149'],
  [0.3, '3.36', '2.358', '3.368'],
  [0.4, '3.74', '2.240', '3.733'],
  [0.5, '4.32', '2.157', '4.314'],
];

const STEPPED =
  "Source: Pilkey and Pilkey, Peterson's Stress Concentration Factors, chart 3.1 (flat bar with shoulder fillets, tension), fit Kt = C1 + C2 (2t/D) + C3 (2t/D)^2 + C4 (2t/D)^3 with t = (D - d)/2 [M: coefficients recalled]; " +
  'the Roark (Young and Budynas, Table 17.1) fit is given beside it [M]. Nominal stress P/(d h). The two fits differ by up to 1 %; test tolerance about 5 %.';

/** [D/d, r/d, Pilkey-fit Kt, Roark-fit Kt] from REFERENCES.md §4. */
const STEPPED_TABLE: [number, number, string, string][] = [
  [1.5, 0.1, '2.227', '2.235'],
  [2, 0.1, '2.516', '2.534'],
  [2, 0.2, '1.992', '1.999'],
];

function ratioName(v: number): string {
  return String(v).replace('.', 'p');
}

export const REFERENCE_CASES: readonly ReferenceCase[] = [
  {
    file: 'kirsch-wide-plate.json',
    template: 'plate-with-hole',
    params: { W: 100, d: 5, L: 400 },
    reference:
      'Reference case: a small circular hole (d/W = 0.05) in a wide plate under uniaxial tension, close to the infinite plate of ' +
      'G. Kirsch, "Die Theorie der Elastizität und die Bedürfnisse der Festigkeitslehre", Z. VDI 42 (1898) 797-807: in the infinite plate the hoop stress at the hole edge across the load is 3 times the remote stress, Kt = 3 [D: closed form]. ' +
      'At d/W = 0.05 the finite width raises it to Ktg = 3.011 by the Pilkey chart 4.1 fit of Howland\'s results [M+], about 0.4 % above Kirsch.',
  },
  ...HOLE_TABLE.map(([dW, howland, ktn, ktg]): ReferenceCase => ({
    file: `hole-dW-${ratioName(dW)}.json`,
    template: 'plate-with-hole',
    params: { W: 100, d: 100 * dW, L: 400 },
    reference:
      `Reference case: central circular hole in a strip in tension, d/W = ${dW}. Howland (1930): Ktg = ${howland} [M]; Pilkey chart 4.1 fit: Ktn = ${ktn}, Ktg = ${ktg} [M+]. ` +
      `Gross nominal stress P/(W h), net P/((W - d) h). ${HOWLAND} Test tolerance about 2 %.`,
  })),
  {
    file: 'ellipse-a2b-wide-plate.json',
    template: 'plate-with-elliptical-hole',
    params: { W: 160, a: 4, b: 2, L: 640 },
    reference:
      'Reference case: elliptical hole with a/b = 2 (a across the load) in a wide plate (2a/W = 0.05) under uniaxial tension. ' +
      'C.E. Inglis, "Stresses in a plate due to the presence of cracks and sharp corners", Trans. Inst. Naval Architects 55 (1913) 219-241: ' +
      'in the infinite plate Kt = 1 + 2a/b = 5, at the ends of the axis a [V: the formula as quoted in fracture-mechanics texts; D: checked against the complex potentials]. ' +
      'The finite width raises the value slightly; REFERENCES.md gives no finite-width correction for the ellipse.',
  },
  ...STEPPED_TABLE.map(([Dd, rd, pilkey, roark]): ReferenceCase => ({
    file: `stepped-bar-Dd-${ratioName(Dd)}-rd-${ratioName(rd)}.json`,
    template: 'stepped-bar',
    params: { D: 20 * Dd, d: 20, r: 20 * rd },
    reference: `Reference case: flat stepped bar with shoulder fillets in tension, D/d = ${Dd}, r/d = ${rd}. Pilkey chart 3.1 fit: Kt = ${pilkey}; Roark fit: Kt = ${roark} [M]. ${STEPPED}`,
  })),
  {
    file: 'u-notches-opposite-tr-4.json',
    template: 'u-notched-bar',
    params: { H: 50, t: 10, r: 2.5, L: 200 },
    reference:
      'Reference case: two opposite U-notches in a flat bar in tension, t/r = 4, 2t/H = 0.4 (net width d = 30). ' +
      "Pilkey and Pilkey, Peterson's Stress Concentration Factors, chart 2.4 fit, evaluated at these ratios: Ktn = 2.931 on the net stress P/(d h) " +
      "[M+: coefficients recalled; they agree with Neuber's combination rule within about 1 %]. " +
      "Cross-check: H. Neuber, Kerbspannungslehre (1958), combination of the shallow-notch value 1 + 2 sqrt(t/r) = 5 and the deep-notch value 3.195 (a/r = 6) gives 2.925 [M]. Test tolerance about 8 %.",
  },
  {
    file: 'edge-notch-single-tr-4.json',
    template: 'edge-notched-bar',
    params: { H: 50, t: 10, r: 2.5, L: 200 },
    reference:
      'Reference geometry: one U-notch on one edge of a flat bar in tension, the same H, t and r as the opposite-notch case, t/r = 4, t/H = 0.2. ' +
      'REFERENCES.md lists no published check value for a single edge notch, so this file carries none; it exercises the half model with its pin, ' +
      'and any check must come from a closed form derived beside the test.',
  },
];

/** The model of a reference case: the template's output with $schema and the reference note. */
function referenceModel(c: ReferenceCase): Model {
  const m = expandTemplate(c.template, c.params, { schema: '../schema/raiser-model.schema.json' });
  return { ...m, note: `${c.reference} ${m.note}` };
}

/** Exact file text of a reference case. */
export function referenceModelText(c: ReferenceCase): string {
  return formatJson(referenceModel(c));
}

/** meshes/ at the top of the project; the same from src/model and from dist/model. */
export function defaultMeshesDir(): string {
  return fileURLToPath(new URL('../../meshes/', import.meta.url));
}

/** Writes every reference case into dir and returns the paths written. */
export function writeReferenceModels(dir: string = defaultMeshesDir()): string[] {
  mkdirSync(dir, { recursive: true });
  return REFERENCE_CASES.map((c) => {
    const path = join(dir, c.file);
    writeFileSync(path, referenceModelText(c));
    return path;
  });
}
