/**
 * Small hostile or careless files for the bad-input catalogue: drawings and model files that
 * once hung raiser, exhausted its memory, crashed it or gave a wrong answer. Each is invented
 * for the tests; most are a few kilobytes that would expand into gigabytes or loop forever.
 */

/** A valid plate model (100 x 40 with a hole), as data. */
export function plateModel(): any {
  return {
    title: 'hostile-input base (invented)',
    material: { E: 210000, nu: 0.3, yield: 355, ultimate: 510 },
    thickness: 5,
    geometry: {
      outline: { shape: 'path', path: [{ at: [0, 0], edge: 'bottom' }, { at: [100, 0], edge: 'pull' }, { at: [100, 40], edge: 'top' }, { at: [0, 40], edge: 'held' }] },
      holes: [{ shape: 'circle', center: [50, 20], diameter: 10, name: 'bore' }],
    },
    supports: [{ type: 'fixed', on: 'held' }],
    loads: [{ type: 'traction', on: 'pull', normal: 100 }],
  };
}

/** A model whose geometry is the drawing `from` (a 100 x 40 plate held at x = 0, pulled at x = 100). */
export function drawingModel(from: string): string {
  return JSON.stringify(
    {
      title: 'hostile drawing (invented)',
      material: { E: 210000, nu: 0.3 },
      thickness: 5,
      geometry: { from, unit: 'mm' },
      supports: [{ type: 'fixed', on: { x: 0 } }],
      loads: [{ type: 'traction', on: { x: 100 }, normal: 100 }],
    },
    null,
    1,
  );
}

/** An ASCII DXF with the given BLOCKS content and entities (mm). */
export function dxf(entities: string, blocks = ''): string {
  const head = '0\nSECTION\n2\nHEADER\n9\n$INSUNITS\n70\n4\n0\nENDSEC\n';
  const blk = blocks ? `0\nSECTION\n2\nBLOCKS\n${blocks}0\nENDSEC\n` : '';
  return `${head}${blk}0\nSECTION\n2\nENTITIES\n${entities}0\nENDSEC\n0\nEOF\n`;
}

export function dxfLine(x0: number | string, y0: number | string, x1: number | string, y1: number | string): string {
  return `0\nLINE\n8\n0\n10\n${x0}\n20\n${y0}\n11\n${x1}\n21\n${y1}\n`;
}

/** The 100 x 40 rectangle as four LINEs. */
export const DXF_RECT = dxfLine(0, 0, 100, 0) + dxfLine(100, 0, 100, 40) + dxfLine(100, 40, 0, 40) + dxfLine(0, 40, 0, 0);

/** A block B0 of one line, and blocks B1..Bdepth each inserting the one below `fan` times. */
export function nestedBlocks(depth: number, fan: number): string {
  let blocks = `0\nBLOCK\n2\nB0\n10\n0\n20\n0\n${dxfLine(1, 1, 2, 2)}0\nENDBLK\n`;
  for (let i = 1; i <= depth; i++) {
    blocks += `0\nBLOCK\n2\nB${i}\n10\n0\n20\n0\n` + `0\nINSERT\n2\nB${i - 1}\n10\n0\n20\n0\n`.repeat(fan) + '0\nENDBLK\n';
  }
  return blocks;
}

/** A cubic (or other degree) SPLINE with n control points along y = 40, clamped. */
export function dxfSpline(degree: number, n: number): string {
  let s = `0\nSPLINE\n8\n0\n70\n8\n71\n${degree}\n72\n${n + degree + 1}\n73\n${n}\n`;
  for (let i = 0; i < n + degree + 1; i++) s += `40\n${Math.min(Math.max(i - degree, 0), n - degree)}\n`;
  for (let i = 0; i < n; i++) s += `10\n${(100 * (n - 1 - i)) / (n - 1)}\n20\n${40 + (i % 2)}\n30\n0\n`;
  return s;
}

const SVG_HEAD = '<svg xmlns="http://www.w3.org/2000/svg" width="100mm" height="40mm" viewBox="0 0 100 40">';

/** An SVG whose <use> elements fan out `fan` ways, `depth` levels deep, from one circle. */
export function svgUseFanOut(depth: number, fan: number): string {
  let s = `${SVG_HEAD}<defs><circle id="l0" cx="50" cy="20" r="1"/>`;
  for (let i = 1; i <= depth; i++) s += `<g id="l${i}">` + `<use href="#l${i - 1}"/>`.repeat(fan) + '</g>';
  return s + `</defs><rect x="0" y="0" width="100" height="40"/><use href="#l${depth}"/></svg>`;
}

/** An SVG with a document type declaring `count` entities (unterminated ones when `broken`). */
export function svgEntityDeclarations(count: number, broken = false): string {
  let dt = '<!DOCTYPE svg [';
  for (let i = 0; i < count; i++) dt += broken ? `<!ENTITY e${i} "x>` : `<!ENTITY e${i} "x">`;
  return `<?xml version="1.0"?>${dt}]>${SVG_HEAD}<rect x="0" y="0" width="100" height="40"/></svg>`;
}

/** An SVG with one long entity referenced many times (a few kilobytes that expand to megabytes). */
export function svgEntityExpansion(length: number, uses: number): string {
  const dt = `<!DOCTYPE svg [<!ENTITY big "${'x'.repeat(length)}">]>`;
  return `<?xml version="1.0"?>${dt}${SVG_HEAD}<rect id="${'&big;'.repeat(uses)}" x="0" y="0" width="100" height="40"/></svg>`;
}

/** An SVG of `depth` nested groups. */
export function svgDeepGroups(depth: number): string {
  return `${SVG_HEAD}${'<g>'.repeat(depth)}<rect x="0" y="0" width="100" height="40"/>${'</g>'.repeat(depth)}</svg>`;
}

/** Model text with `count` unknown fields, or `count` copies of one field. */
export function manyFields(count: number, duplicate: boolean): string {
  const m = JSON.stringify(plateModel()).slice(1, -1);
  const extra = Array.from({ length: count }, (_, i) => (duplicate ? `"thickness": 5` : `"unknown${i}": 1`)).join(',\n');
  return `{${m},\n${extra}}`;
}

/** n x n small CIRCLEs, 10 apart, inside a 1000 x 1000 square. */
export function manyCircles(n: number): string {
  let s = '';
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s += `0\nCIRCLE\n8\n0\n10\n${5 + 10 * i}\n20\n${5 + 10 * j}\n40\n1\n`;
  return s;
}

/** A closed LWPOLYLINE of n vertices on a circle of radius 40 about (50, 50). */
export function lwPolylineCircle(n: number): string {
  let s = `0\nLWPOLYLINE\n8\n0\n90\n${n}\n70\n1\n`;
  for (let i = 0; i < n; i++) s += `10\n${(50 + 40 * Math.cos((2 * Math.PI * i) / n)).toFixed(6)}\n20\n${(50 + 40 * Math.sin((2 * Math.PI * i) / n)).toFixed(6)}\n`;
  return s;
}
