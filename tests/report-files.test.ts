/**
 * The exported files: the VTU file against the structure the VTK file-format document gives
 * (well-formed XML, counts, offsets, cell types, the quadratic triangle's point order) and a
 * round trip of its values; the saved solution read back bit for bit; the Matrix Market
 * stiffness and load vector satisfying K u = f with the solved displacements.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadModelFile } from '../src/model/load.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { vtuText, VTK_QUADRATIC_TRIANGLE, VTK_TRIANGLE } from '../src/report/vtu.js';
import { decodeSaved, encodeSaved, plotSource } from '../src/report/saved.js';
import { writeMatrixFiles } from '../src/report/matrix.js';
import { readMatrixMarket, readMatrixMarketArray } from '../src/solve/index.js';
import { measureField } from '../src/post/peak.js';

const { model } = loadModelFile('examples/strap-bolt-hole.json');
const quad = analyseModel(model);
const lin = analyseModel(model, { element: 'linear' });

interface XmlElement {
  name: string;
  attrs: Record<string, string>;
  children: XmlElement[];
  text: string;
}

/**
 * A strict reader for the XML subset a VTU file uses (declaration, comments, elements,
 * attributes in double quotes, character data): throws on anything not well-formed (unclosed
 * or crossed tags, duplicate attributes, a bare < or &).
 */
function parseXml(src: string): XmlElement {
  let i = 0;
  const fail = (why: string): never => {
    throw new Error(`not well-formed at ${i}: ${why}`);
  };
  const skipMisc = () => {
    for (;;) {
      while (i < src.length && /\s/.test(src[i])) i++;
      if (src.startsWith('<?', i)) {
        const e = src.indexOf('?>', i);
        if (e < 0) fail('unterminated declaration');
        i = e + 2;
      } else if (src.startsWith('<!--', i)) {
        const e = src.indexOf('-->', i);
        if (e < 0) fail('unterminated comment');
        if (src.slice(i + 4, e).includes('--')) fail('-- inside a comment');
        i = e + 3;
      } else return;
    }
  };
  const element = (): XmlElement => {
    if (src[i] !== '<') fail('expected <');
    i++;
    const name = /^[A-Za-z_][\w.-]*/.exec(src.slice(i))?.[0] ?? fail('bad element name');
    i += name.length;
    const attrs: Record<string, string> = {};
    for (;;) {
      while (/\s/.test(src[i])) i++;
      if (src.startsWith('/>', i)) {
        i += 2;
        return { name, attrs, children: [], text: '' };
      }
      if (src[i] === '>') {
        i++;
        break;
      }
      const an = /^[A-Za-z_][\w.:-]*/.exec(src.slice(i))?.[0] ?? fail('bad attribute name');
      i += an.length;
      if (src[i] !== '=' || src[i + 1] !== '"') fail('attribute without ="');
      const e = src.indexOf('"', i + 2);
      const v = src.slice(i + 2, e);
      if (/[<&]/.test(v)) fail('< or & in an attribute');
      if (an in attrs) fail(`duplicate attribute ${an}`);
      attrs[an] = v;
      i = e + 1;
    }
    const children: XmlElement[] = [];
    let text = '';
    for (;;) {
      if (src.startsWith('</', i)) {
        i += 2;
        if (!src.startsWith(name, i)) fail(`</${name}> expected`);
        i += name.length;
        while (/\s/.test(src[i])) i++;
        if (src[i] !== '>') fail('bad end tag');
        i++;
        return { name, attrs, children, text };
      }
      if (src.startsWith('<!--', i)) {
        skipMisc();
        continue;
      }
      if (src[i] === '<') {
        children.push(element());
        continue;
      }
      const e = src.indexOf('<', i);
      if (e < 0) fail(`unclosed <${name}>`);
      const t = src.slice(i, e);
      if (t.includes('&')) fail('& in character data');
      text += t;
      i = e;
    }
  };
  skipMisc();
  const root = element();
  skipMisc();
  if (i !== src.length) fail('content after the root element');
  return root;
}

function find(e: XmlElement, name: string): XmlElement {
  if (e.name === name) return e;
  for (const c of e.children) {
    try {
      return find(c, name);
    } catch {
      /* next */
    }
  }
  throw new Error(`no <${name}>`);
}

function arrayNamed(parent: XmlElement, name: string): number[] {
  const a = parent.children.find((c) => c.name === 'DataArray' && c.attrs.Name === name);
  if (!a) throw new Error(`no DataArray ${name}`);
  expect(a.attrs.format).toBe('ascii');
  return a.text.trim().split(/\s+/).map(Number);
}

describe('VTU export', () => {
  for (const [label, a] of [['6-node', quad], ['3-node', lin]] as const) {
    it(`${label}: is well-formed VTK XML with the counts, offsets and cell types of the mesh`, () => {
      const doc = parseXml(vtuText({ mesh: a.mesh, u: a.u, stress: a.stress, szzFactor: a.szzFactor, title: 'strap <test> & more' }));
      expect(doc.name).toBe('VTKFile');
      expect(doc.attrs.type).toBe('UnstructuredGrid');
      expect(doc.attrs.byte_order).toBe('LittleEndian');
      const piece = find(doc, 'Piece');
      expect(Number(piece.attrs.NumberOfPoints)).toBe(a.mesh.nNodes);
      expect(Number(piece.attrs.NumberOfCells)).toBe(a.mesh.nElements);
      const pts = find(doc, 'Points').children[0];
      expect(pts.attrs.NumberOfComponents).toBe('3');
      const xyz = pts.text.trim().split(/\s+/).map(Number);
      expect(xyz.length).toBe(3 * a.mesh.nNodes);
      const cells = find(doc, 'Cells');
      const conn = arrayNamed(cells, 'connectivity');
      const offsets = arrayNamed(cells, 'offsets');
      const types = arrayNamed(cells, 'types');
      const per = a.mesh.order === 2 ? 6 : 3;
      expect(types.length).toBe(a.mesh.nElements);
      expect(new Set(types)).toEqual(new Set([per === 6 ? VTK_QUADRATIC_TRIANGLE : VTK_TRIANGLE]));
      expect(offsets.length).toBe(a.mesh.nElements);
      // Offsets: strictly increasing, each the end of its cell's points, the last the connectivity length.
      for (let e = 0; e < offsets.length; e++) expect(offsets[e] - (e ? offsets[e - 1] : 0)).toBe(per);
      expect(offsets[offsets.length - 1]).toBe(conn.length);
      for (const v of conn) expect(v >= 0 && v < a.mesh.nNodes).toBe(true);
      // Corners counter-clockwise in the xy-plane, as VTK's triangle and quadratic triangle take them.
      for (let e = 0; e < a.mesh.nElements; e++) {
        const [p, q, r] = [conn[per * e], conn[per * e + 1], conn[per * e + 2]];
        const area = (xyz[3 * q] - xyz[3 * p]) * (xyz[3 * r + 1] - xyz[3 * p + 1]) - (xyz[3 * r] - xyz[3 * p]) * (xyz[3 * q + 1] - xyz[3 * p + 1]);
        expect(area).toBeGreaterThan(0);
      }
    });
  }

  it('6-node: VTK points 3, 4, 5 of each quadratic triangle lie on the sides (0,1), (1,2), (2,0), in that order', () => {
    const doc = parseXml(vtuText({ mesh: quad.mesh, u: quad.u, stress: quad.stress, szzFactor: quad.szzFactor }));
    const xyz = find(doc, 'Points').children[0].text.trim().split(/\s+/).map(Number);
    const conn = arrayNamed(find(doc, 'Cells'), 'connectivity');
    const sides = [
      [0, 1, 3],
      [1, 2, 4],
      [2, 0, 5],
    ];
    let worst = 0;
    for (let e = 0; e < quad.mesh.nElements; e++) {
      for (const [a, b, m] of sides) {
        const pa = conn[6 * e + a];
        const pb = conn[6 * e + b];
        const pm = conn[6 * e + m];
        const L = Math.hypot(xyz[3 * pb] - xyz[3 * pa], xyz[3 * pb + 1] - xyz[3 * pa + 1]);
        const off = Math.hypot(xyz[3 * pm] - 0.5 * (xyz[3 * pa] + xyz[3 * pb]), xyz[3 * pm + 1] - 0.5 * (xyz[3 * pa + 1] + xyz[3 * pb + 1]));
        worst = Math.max(worst, off / L);
      }
    }
    // Midside nodes sit at the midpoints of straight sides and on the arc of curved ones: a
    // sagitta well under a tenth of the side (any other order would put them a side away).
    expect(worst).toBeLessThan(0.1);
  });

  it('reads back the displacements and stresses exactly', () => {
    const a = quad;
    const doc = parseXml(vtuText({ mesh: a.mesh, u: a.u, stress: a.stress, szzFactor: a.szzFactor }));
    const pd = find(doc, 'PointData');
    const disp = arrayNamed(pd, 'displacement');
    for (let i = 0; i < a.mesh.nNodes; i++) {
      expect(disp[3 * i]).toBe(a.u[2 * i]);
      expect(disp[3 * i + 1]).toBe(a.u[2 * i + 1]);
      expect(disp[3 * i + 2]).toBe(0);
    }
    const sxy = arrayNamed(pd, 'sxy');
    const vm = arrayNamed(pd, 'von_mises');
    const vmWant = measureField(a.stress, 'von-mises', a.szzFactor);
    for (let i = 0; i < a.mesh.nNodes; i++) {
      expect(sxy[i]).toBe(a.stress[3 * i + 2]);
      expect(vm[i]).toBe(vmWant[i]);
    }
  });
});

describe('saved solution', () => {
  it('reads back the mesh, displacements, stresses and result bit for bit', () => {
    const result = buildResult(quad, 'examples/strap-bolt-hole.json');
    const src = plotSource(quad, result, '2024-01-02T03:04:05.000Z');
    const back = decodeSaved(encodeSaved(src));
    expect(back.createdAt).toBe(src.createdAt);
    expect(back.result).toEqual(JSON.parse(JSON.stringify(result)));
    expect(back.mesh.order).toBe(2);
    for (const k of ['nodes', 'elements', 'bEdges', 'bEdgeDomain', 'bEdgeT', 'nodeEdge', 'nodeCorner'] as const) expect(Array.from(back.mesh[k]), k).toEqual(Array.from(quad.mesh[k]));
    expect(Array.from(back.u)).toEqual(Array.from(quad.u));
    expect(Array.from(back.stress)).toEqual(Array.from(quad.stress));
    expect(back.szzFactor).toBe(quad.szzFactor);
  });

  it('refuses a file that is not a saved solution, or is cut short, naming the file', () => {
    expect(() => decodeSaved(Buffer.from('{"not": "this"}'), 'x.raiser')).toThrow(/x.raiser is not a raiser saved solution/);
    const good = encodeSaved(plotSource(lin, buildResult(lin), '2024-01-02T03:04:05.000Z'));
    expect(() => decodeSaved(good.subarray(0, good.length - 100), 'cut.raiser')).toThrow(/checksum does not match its content|runs past the end/);
  });
});

describe('Matrix Market export', () => {
  it('writes K and f of the free degrees of freedom, which the solved displacements satisfy: K u = f', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-mtx-'));
    writeMatrixFiles(dir, lin, false);
    const K = readMatrixMarket(readFileSync(join(dir, 'stiffness.mtx'), 'utf8'));
    const f = readMatrixMarketArray(readFileSync(join(dir, 'load.mtx'), 'utf8'));
    const rows = readFileSync(join(dir, 'dofs.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
    expect(K.n).toBe(rows.length);
    expect(f.rows).toBe(rows.length);
    const uFree = rows.map(([, node, dir]) => lin.u[2 * Number(node) + (dir === 'y' ? 1 : 0)]);
    // y = K u from the lower triangle (column-major, symmetric).
    const y = new Float64Array(K.n);
    for (let j = 0; j < K.n; j++) {
      for (let p = K.colPtr[j]; p < K.colPtr[j + 1]; p++) {
        const i = K.rowIndex[p];
        y[i] += K.values[p] * uFree[j];
        if (i !== j) y[j] += K.values[p] * uFree[i];
      }
    }
    let num = 0;
    let den = 0;
    for (let i = 0; i < K.n; i++) {
      num += (y[i] - f.values[i]) ** 2;
      den += f.values[i] ** 2;
    }
    // The solver's relative residual is about 1e-12; allow round-off of the text form.
    expect(Math.sqrt(num / den)).toBeLessThan(1e-8);
    expect(() => writeMatrixFiles(dir, lin, false)).toThrow(/already holds stiffness.mtx/);
  });
});
