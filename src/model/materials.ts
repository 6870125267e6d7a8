/**
 * Bundled material grades: elastic constants and the minimum strengths their product standards
 * give, by product form and thickness band. A model names a grade (`"material": { "grade":
 * "S355JR", "form": "plate" }`); the loader fills E, nu, yield and ultimate from here, and fields
 * written in the model override them.
 *
 * Provenance of every band is stated beside it: [V] read in the stored public copy named in
 * `checkedIn`; [M] recalled from the standard, not checked against a copy here (verify before
 * relying on it). Strengths are specified minima (ReH or Rp0.2, Rm) in MPa; where the standard
 * gives Rm as a range, its upper end is kept too. Thicknesses are in mm: a band holds
 * over < t <= upTo (the standards' "> a, <= b").
 *
 * E and nu are design values, not from the product standards:
 *  - steels: E = 210 000 MPa, nu = 0.3, EN 1993-1-1:2005, 3.2.6 [M];
 *  - austenitic stainless steels: E = 200 000 MPa, nu = 0.3, EN 1993-1-4:2006, 2.1.3 [M];
 *  - aluminium alloys: E = 70 000 MPa, nu = 0.3, EN 1999-1-1:2007, 3.2.5 [M].
 */

export type MaterialFamily = 'steel' | 'stainless' | 'aluminium';

/** Product forms a model may name. */
export const PRODUCT_FORMS = ['plate', 'sheet', 'strip', 'extrusion', 'bar', 'section'] as const;
export type ProductForm = (typeof PRODUCT_FORMS)[number];

export interface StrengthBand {
  /** thickness band, mm: over < t <= upTo */
  over: number;
  upTo: number;
  /** minimum yield (ReH or Rp0.2), MPa; undefined where the standard gives none for the band */
  yield?: number;
  /** minimum tensile strength Rm, MPa */
  ultimate: number;
  /** upper end of the Rm range, MPa, where the standard gives a range */
  ultimateMax?: number;
}

export interface StandardTable {
  /** the forms this table covers */
  forms: readonly ProductForm[];
  /** standard and table, e.g. "EN 10025-2:2004, Table 7" */
  standard: string;
  provenance: 'V' | 'M';
  /** where a [V] table was read (a stored public copy of it) */
  checkedIn?: string;
  bands: readonly StrengthBand[];
}

export interface MaterialGrade {
  /** the canonical name, then other accepted names */
  names: readonly string[];
  family: MaterialFamily;
  /** MPa */
  E: number;
  nu: number;
  elasticSource: string;
  /** the form used when the model names none */
  defaultForm: ProductForm;
  tables: readonly StandardTable[];
}

const STEEL_ELASTIC = { E: 210000, nu: 0.3, elasticSource: 'EN 1993-1-1:2005, 3.2.6 [M]' } as const;
const STAINLESS_ELASTIC = { E: 200000, nu: 0.3, elasticSource: 'EN 1993-1-4:2006, 2.1.3 [M]' } as const;
const ALUMINIUM_ELASTIC = { E: 70000, nu: 0.3, elasticSource: 'EN 1999-1-1:2007, 3.2.5 [M]' } as const;

const EN10025_FORMS = ['plate', 'sheet', 'strip', 'bar', 'section'] as const;
const EN10025 = 'EN 10025-2:2004, Table 7';
const EN10025_SEEN = 'Table 7 of BS EN 10025-2 as reproduced at readle.co.uk/references/steel-grades-eurocodes.php';

/** EN 10025-2 Table 7: ReH by thickness band and Rm (ranges) by thickness band, merged into bands. */
function en10025Bands(reh: number[], rm: [number, number][], over250?: { reh: number; rm: [number, number] }): StrengthBand[] {
  // ReH bands: <=16, 16-40, 40-63, 63-80, 80-100, 100-150, 150-200, 200-250.
  // Rm bands: <3, 3-100, 100-150, 150-250.
  const edges = [0, 3, 16, 40, 63, 80, 100, 150, 200, 250];
  const rehAt = (upTo: number) => (upTo <= 16 ? reh[0] : reh[[40, 63, 80, 100, 150, 200, 250].indexOf(upTo) + 1]);
  const rmAt = (upTo: number) => (upTo <= 3 ? rm[0] : upTo <= 100 ? rm[1] : upTo <= 150 ? rm[2] : rm[3]);
  const out: StrengthBand[] = [];
  for (let i = 0; i + 1 < edges.length; i++) {
    const upTo = edges[i + 1];
    const [lo, hi] = rmAt(upTo);
    out.push({ over: edges[i], upTo, yield: rehAt(upTo), ultimate: lo, ultimateMax: hi });
  }
  if (over250) out.push({ over: 250, upTo: 400, yield: over250.reh, ultimate: over250.rm[0], ultimateMax: over250.rm[1] });
  return out;
}

function en10025(reh: number[], rm: [number, number][], over250?: { reh: number; rm: [number, number] }): StandardTable {
  return { forms: EN10025_FORMS, standard: EN10025, provenance: 'V', checkedIn: EN10025_SEEN, bands: en10025Bands(reh, rm, over250) };
}

const S235_REH = [235, 225, 215, 215, 215, 195, 185, 175];
const S235_RM: [number, number][] = [[360, 510], [360, 510], [350, 500], [340, 490]];
const S275_REH = [275, 265, 255, 245, 235, 225, 215, 205];
const S275_RM: [number, number][] = [[430, 580], [410, 560], [400, 540], [380, 540]];
const S355_REH = [355, 345, 335, 325, 315, 295, 285, 275];
const S355_RM: [number, number][] = [[510, 680], [470, 630], [450, 600], [450, 600]];

const EN485 = 'EN 485-2';
const EN755 = 'EN 755-2';
const B209 = 'ASTM B209M';
const B221 = 'ASTM B221M';

/** The bundled grades. */
export const MATERIAL_GRADES: readonly MaterialGrade[] = [
  { names: ['S235JR'], family: 'steel', ...STEEL_ELASTIC, defaultForm: 'plate', tables: [en10025(S235_REH, S235_RM)] },
  { names: ['S275JR'], family: 'steel', ...STEEL_ELASTIC, defaultForm: 'plate', tables: [en10025(S275_REH, S275_RM)] },
  { names: ['S355JR'], family: 'steel', ...STEEL_ELASTIC, defaultForm: 'plate', tables: [en10025(S355_REH, S355_RM)] },
  // J2 has the JR strengths and, for flat products only, a band 250 < t <= 400 (Table 7, footnote c).
  { names: ['S355J2'], family: 'steel', ...STEEL_ELASTIC, defaultForm: 'plate', tables: [en10025(S355_REH, S355_RM, { reh: 265, rm: [450, 600] })] },
  {
    names: ['A36', 'ASTM A36'],
    family: 'steel',
    ...STEEL_ELASTIC,
    defaultForm: 'plate',
    tables: [
      {
        forms: ['plate', 'bar', 'section'],
        standard: 'ASTM A36/A36M, Table 3 (plates)',
        provenance: 'V',
        checkedIn: 'the tensile requirements of ASTM A36 plates as reproduced at lfpco.com/astm-a36-plates.html (yield 220 MPa over 200 mm, footnote A)',
        bands: [
          { over: 0, upTo: 200, yield: 250, ultimate: 400, ultimateMax: 550 },
          { over: 200, upTo: 1000, yield: 220, ultimate: 400, ultimateMax: 550 },
        ],
      },
    ],
  },
  {
    names: ['A572-50', 'A572 Gr 50', 'A572 Grade 50', 'ASTM A572 Gr 50'],
    family: 'steel',
    ...STEEL_ELASTIC,
    defaultForm: 'plate',
    tables: [
      {
        forms: ['plate', 'bar', 'section'],
        standard: 'ASTM A572/A572M-04, Grade 50',
        provenance: 'V',
        checkedIn: 'a table of ASTM A572-04 grades (scribd.com/document/350457765), yield 345 MPa, tensile 450 MPa; the 100 mm limit of Grade 50 plates is recalled [M]',
        bands: [{ over: 0, upTo: 100, yield: 345, ultimate: 450 }],
      },
    ],
  },
  {
    names: ['304', '1.4301', 'X5CrNi18-10', 'A240 304'],
    family: 'stainless',
    ...STAINLESS_ELASTIC,
    defaultForm: 'plate',
    tables: [
      // EN 10088-2 1.4301 hot-rolled plate: Rp0.2 >= 210, Rm 520-720 [M]; ASTM A240 304: 205 / 515 [M].
      { forms: ['plate'], standard: 'EN 10088-2:2014, Table 8 (hot-rolled plate, 1.4301, annealed)', provenance: 'M', bands: [{ over: 0, upTo: 75, yield: 210, ultimate: 520, ultimateMax: 720 }] },
      { forms: ['sheet', 'strip'], standard: 'EN 10088-2:2014, Table 8 (cold-rolled strip, 1.4301, annealed)', provenance: 'M', bands: [{ over: 0, upTo: 8, yield: 230, ultimate: 540, ultimateMax: 750 }] },
    ],
  },
  {
    names: ['316L', '1.4404', 'X2CrNiMo17-12-2', 'A240 316L'],
    family: 'stainless',
    ...STAINLESS_ELASTIC,
    defaultForm: 'plate',
    tables: [
      { forms: ['plate'], standard: 'EN 10088-2:2014, Table 8 (hot-rolled plate, 1.4404, annealed)', provenance: 'M', bands: [{ over: 0, upTo: 75, yield: 220, ultimate: 520, ultimateMax: 670 }] },
      { forms: ['sheet', 'strip'], standard: 'EN 10088-2:2014, Table 8 (cold-rolled strip, 1.4404, annealed)', provenance: 'M', bands: [{ over: 0, upTo: 8, yield: 240, ultimate: 530, ultimateMax: 680 }] },
    ],
  },
  {
    names: ['6082-T6', 'EN AW-6082-T6', '6082-T651', 'EN AW-6082 T6'],
    family: 'aluminium',
    ...ALUMINIUM_ELASTIC,
    defaultForm: 'plate',
    tables: [
      {
        forms: ['plate', 'sheet', 'strip'],
        standard: `${EN485}, 6082 T6/T651`,
        provenance: 'V',
        checkedIn:
          'EN 485-2 tables for EN AW-6082 as reproduced at batz-burgel.com (EN AW-6082 3.2315) and euralliage.com/6082_english.htm; for 6 < t <= 12.5 the two copies differ in Rm (300 and 310 MPa): the lower is kept',
        bands: [
          { over: 0.4, upTo: 6, yield: 260, ultimate: 310 },
          { over: 6, upTo: 12.5, yield: 255, ultimate: 300 },
          { over: 12.5, upTo: 100, yield: 240, ultimate: 295 },
          { over: 100, upTo: 150, yield: 240, ultimate: 275 },
        ],
      },
      {
        forms: ['extrusion', 'section'],
        standard: `${EN755}, 6082 T6 open profiles`,
        provenance: 'M',
        bands: [
          { over: 0, upTo: 5, yield: 250, ultimate: 290 },
          { over: 5, upTo: 25, yield: 260, ultimate: 310 },
        ],
      },
      {
        forms: ['bar'],
        standard: `${EN755}, 6082 T6 rod and bar (diameter)`,
        provenance: 'M',
        bands: [
          { over: 0, upTo: 20, yield: 250, ultimate: 295 },
          { over: 20, upTo: 150, yield: 260, ultimate: 310 },
        ],
      },
    ],
  },
  {
    names: ['6061-T6', 'EN AW-6061-T6', '6061-T651'],
    family: 'aluminium',
    ...ALUMINIUM_ELASTIC,
    defaultForm: 'plate',
    tables: [
      { forms: ['plate', 'sheet', 'strip'], standard: `${EN485}, 6061 T6/T651`, provenance: 'M', bands: [{ over: 0.4, upTo: 100, yield: 240, ultimate: 290 }] },
      {
        forms: ['extrusion', 'section', 'bar'],
        standard: `${B221}, 6061-T6`,
        provenance: 'V',
        checkedIn: 'the ASTM B221 6061 table as reproduced at h2abc.com (T6: tensile >= 38 ksi, yield >= 35 ksi, all sizes); converted 1 ksi = 6.895 MPa and rounded down [D]',
        bands: [{ over: 0, upTo: 1000, yield: 241, ultimate: 262 }],
      },
    ],
  },
  {
    names: ['5083-O', 'EN AW-5083-O', '5083-H111', 'EN AW-5083-H111', '5083-O/H111'],
    family: 'aluminium',
    ...ALUMINIUM_ELASTIC,
    defaultForm: 'plate',
    tables: [
      {
        forms: ['plate', 'sheet', 'strip'],
        standard: `${EN485}, 5083 O/H111`,
        provenance: 'M',
        bands: [
          { over: 0.2, upTo: 50, yield: 125, ultimate: 275, ultimateMax: 350 },
          { over: 50, upTo: 80, yield: 115, ultimate: 270, ultimateMax: 345 },
        ],
      },
      { forms: ['extrusion', 'section', 'bar'], standard: `${EN755}, 5083 O/H111`, provenance: 'M', bands: [{ over: 0, upTo: 200, yield: 110, ultimate: 270, ultimateMax: 350 }] },
    ],
  },
  {
    names: ['7075-T6', 'EN AW-7075-T6', '7075-T651'],
    family: 'aluminium',
    ...ALUMINIUM_ELASTIC,
    defaultForm: 'plate',
    tables: [
      {
        forms: ['plate', 'sheet', 'strip'],
        standard: `${EN485}, 7075 T6/T651`,
        provenance: 'M',
        bands: [
          { over: 0.4, upTo: 6, yield: 460, ultimate: 540 },
          { over: 6, upTo: 12.5, yield: 460, ultimate: 540 },
          { over: 12.5, upTo: 25, yield: 470, ultimate: 540 },
          { over: 25, upTo: 50, yield: 460, ultimate: 530 },
        ],
      },
    ],
  },
  {
    names: ['2024-T3', 'EN AW-2024-T3'],
    family: 'aluminium',
    ...ALUMINIUM_ELASTIC,
    defaultForm: 'sheet',
    tables: [
      {
        forms: ['sheet', 'plate', 'strip'],
        standard: `${B209}, 2024-T3 (bare sheet)`,
        provenance: 'M',
        bands: [
          { over: 0.2, upTo: 0.5, yield: 290, ultimate: 435 },
          { over: 0.5, upTo: 1.6, yield: 290, ultimate: 440 },
          { over: 1.6, upTo: 6.3, yield: 290, ultimate: 440 },
        ],
      },
    ],
  },
];

/** A name reduced for comparison: case, spaces, hyphens, slashes, dots and "EN AW", "ASTM", "Gr" ignored. */
export function normaliseGradeName(name: string): string {
  return name
    .toLowerCase()
    .replace(/\b(en\s*aw|astm|grade|gr)\b/g, '')
    .replace(/[\s\-_/.]+/g, '');
}

const BY_NAME = new Map<string, MaterialGrade>();
for (const g of MATERIAL_GRADES) for (const n of g.names) BY_NAME.set(normaliseGradeName(n), g);

/** The grade of that name (case, spaces and hyphens ignored), or undefined. */
export function findGrade(name: string): MaterialGrade | undefined {
  return BY_NAME.get(normaliseGradeName(name));
}

/** Every canonical grade name. */
export function gradeNames(): string[] {
  return MATERIAL_GRADES.map((g) => g.names[0]);
}

/** What a grade lookup decided: the values and where they came from. */
export interface MaterialBasis {
  grade: string;
  family: MaterialFamily;
  form: ProductForm;
  /** true when the model named the form; false when the grade's default was taken */
  formGiven: boolean;
  thicknessMm: number;
  elasticSource: string;
  /** the strength table used, or null when none covers the form */
  standard: string | null;
  provenance: 'V' | 'M' | null;
  checkedIn: string | null;
  /** the band the thickness fell in, mm, or null when it is outside every band */
  band: { over: number; upTo: number } | null;
  /** MPa; null when no band applies */
  yield: number | null;
  ultimate: number | null;
  ultimateMax: number | null;
  /** why yield and ultimate are unset, when they are */
  unsetWhy: string | null;
}

/**
 * The values of a grade for a form and thickness (mm). A thickness outside every band of the
 * form's table leaves the strengths unset, with the reason, rather than guessing.
 */
export function lookupGrade(grade: MaterialGrade, form: ProductForm | undefined, thicknessMm: number): MaterialBasis {
  const f = form ?? grade.defaultForm;
  const table = grade.tables.find((t) => t.forms.includes(f)) ?? null;
  const base = { grade: grade.names[0], family: grade.family, form: f, formGiven: form !== undefined, thicknessMm, elasticSource: grade.elasticSource };
  if (!table) {
    const forms = [...new Set(grade.tables.flatMap((t) => t.forms))];
    return { ...base, standard: null, provenance: null, checkedIn: null, band: null, yield: null, ultimate: null, ultimateMax: null, unsetWhy: `no bundled table gives ${grade.names[0]} as ${f} (it has ${forms.join(', ')})` };
  }
  const band = table.bands.find((b) => thicknessMm > b.over && thicknessMm <= b.upTo) ?? null;
  const common = { ...base, standard: table.standard, provenance: table.provenance, checkedIn: table.checkedIn ?? null };
  if (!band) {
    const lo = Math.min(...table.bands.map((b) => b.over));
    const hi = Math.max(...table.bands.map((b) => b.upTo));
    return { ...common, band: null, yield: null, ultimate: null, ultimateMax: null, unsetWhy: `the thickness ${thicknessMm} mm is outside the bands of ${table.standard} (over ${lo} up to ${hi} mm)` };
  }
  return { ...common, band: { over: band.over, upTo: band.upTo }, yield: band.yield ?? null, ultimate: band.ultimate, ultimateMax: band.ultimateMax ?? null, unsetWhy: null };
}

/** One line for people: "S355JR plate, 16 < t <= 40 mm, EN 10025-2:2004, Table 7 [V]". */
export function describeBasis(b: MaterialBasis): string {
  const form = `${b.grade} ${b.form}${b.formGiven ? '' : ' (default form)'}`;
  const where = b.band ? `${fmtMm(b.band.over)} < t <= ${fmtMm(b.band.upTo)} mm` : `t = ${fmtMm(b.thicknessMm)} mm`;
  const std = b.standard ? `${b.standard} [${b.provenance}]` : 'no strength table';
  return `${form}, ${where}, ${std}; E and nu ${b.elasticSource}`;
}

function fmtMm(x: number): string {
  return String(Number(x.toPrecision(6)));
}
