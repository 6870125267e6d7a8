/**
 * The saved solution, `solution.raiser`: what `raiser plot` needs to draw every picture again
 * without solving: the mesh, the displacements, the recovered nodal stresses, the result JSON
 * and the model. One binary file, little-endian, so the numbers come back bit for bit:
 *
 *   bytes 0-7    the magic "RAISERSV"
 *   bytes 8-11   uint32 format version (1)
 *   bytes 12-15  uint32 length H of the header
 *   16 ..        H bytes of UTF-8 JSON: { format, version, createdAt, model, result, szzFactor,
 *                mesh: { order, nNodes, nVertices, nElements, nBEdges },
 *                arrays: [{ name, type: "float64" | "int32", length, offset }] }
 *   then the arrays, each starting at its `offset` from the start of the file (a multiple of 8).
 *
 * Arrays: nodes (2 per node), elements (3 or 6 per element, numbered as in src/mesh/types.ts),
 * bEdges (3 per boundary edge), bEdgeDomain, bEdgeT (2 per boundary edge), nodeEdge,
 * nodeCorner, u (2 per node), stress (sxx, syy, sxy per node).
 */
import { readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { ModelError } from '../model/errors.js';
import type { Model } from '../model/schema.js';
import type { Mesh } from '../mesh/types.js';
import type { Analysis } from '../pipeline/analyse.js';
import type { ResultJson } from './result.js';

export const SAVED_FILE = 'solution.raiser';
const MAGIC = 'RAISERSV';
const VERSION = 1;

/** Everything a picture is drawn from. */
export interface PlotSource {
  result: ResultJson;
  model: Model;
  mesh: Mesh;
  u: Float64Array;
  stress: Float64Array;
  szzFactor: number;
  /** when the analysis ran, ISO 8601 */
  createdAt: string;
}

export function plotSource(a: Analysis, result: ResultJson, createdAt = new Date().toISOString()): PlotSource {
  return { result, model: a.model, mesh: a.mesh, u: a.u, stress: a.stress, szzFactor: a.szzFactor, createdAt };
}

type ArrayEntry = { name: string; data: Float64Array | Int32Array };

export function encodeSaved(src: PlotSource): Buffer {
  const m = src.mesh;
  const arrays: ArrayEntry[] = [
    { name: 'nodes', data: m.nodes },
    { name: 'elements', data: m.elements },
    { name: 'bEdges', data: m.bEdges },
    { name: 'bEdgeDomain', data: m.bEdgeDomain },
    { name: 'bEdgeT', data: m.bEdgeT },
    { name: 'nodeEdge', data: m.nodeEdge },
    { name: 'nodeCorner', data: m.nodeCorner },
    { name: 'u', data: src.u },
    { name: 'stress', data: src.stress },
  ];
  const headerOf = (base: number) => {
    let off = base;
    const list = arrays.map((a) => {
      const e = { name: a.name, type: a.data instanceof Float64Array ? 'float64' : 'int32', length: a.data.length, offset: off };
      off += Math.ceil(a.data.byteLength / 8) * 8;
      return e;
    });
    return { text: JSON.stringify({ format: 'raiser saved solution', version: VERSION, createdAt: src.createdAt, model: src.model, result: src.result, szzFactor: src.szzFactor, mesh: { order: m.order, nNodes: m.nNodes, nVertices: m.nVertices, nElements: m.nElements, nBEdges: m.nBEdges }, arrays: list }), end: off };
  };
  // The offsets depend on the header's length, which depends on the offsets: iterate to a fixed point.
  let base = 0;
  let h = headerOf(base);
  for (let it = 0; it < 8; it++) {
    const len = Buffer.byteLength(h.text, 'utf8');
    const want = Math.ceil((16 + len) / 8) * 8;
    if (want === base) break;
    base = want;
    h = headerOf(base);
  }
  const hb = Buffer.from(h.text, 'utf8');
  const out = Buffer.alloc(h.end);
  out.write(MAGIC, 0, 'latin1');
  out.writeUInt32LE(VERSION, 8);
  out.writeUInt32LE(hb.length, 12);
  hb.copy(out, 16);
  let off = base;
  for (const a of arrays) {
    const bytes = Buffer.from(a.data.buffer, a.data.byteOffset, a.data.byteLength);
    if (a.data instanceof Float64Array) for (let i = 0; i < a.data.length; i++) out.writeDoubleLE(a.data[i], off + 8 * i);
    else for (let i = 0; i < a.data.length; i++) out.writeInt32LE(a.data[i], off + 4 * i);
    off += Math.ceil(bytes.length / 8) * 8;
  }
  return out;
}

export function decodeSaved(buf: Buffer, name = SAVED_FILE): PlotSource {
  const bad = (why: string) => new ModelError('', `${name} is not a raiser saved solution: ${why}`, `give the ${SAVED_FILE} file (or the folder holding it) that raiser solve -o wrote`);
  if (buf.length < 16 || buf.toString('latin1', 0, 8) !== MAGIC) throw bad('it does not start with the raiser signature');
  const version = buf.readUInt32LE(8);
  if (version !== VERSION) throw bad(`format version ${version}, this raiser reads version ${VERSION}`);
  const hl = buf.readUInt32LE(12);
  if (16 + hl > buf.length) throw bad('the header runs past the end of the file');
  let header: any;
  try {
    header = JSON.parse(buf.toString('utf8', 16, 16 + hl));
  } catch {
    throw bad('its header is not JSON');
  }
  const get = (nm: string): Float64Array | Int32Array => {
    const e = (header.arrays as { name: string; type: string; length: number; offset: number }[]).find((a) => a.name === nm);
    if (!e) throw bad(`the array ${nm} is missing`);
    const size = e.type === 'float64' ? 8 : 4;
    if (e.offset + e.length * size > buf.length) throw bad(`the array ${nm} runs past the end of the file`);
    if (e.type === 'float64') {
      const a = new Float64Array(e.length);
      for (let i = 0; i < e.length; i++) a[i] = buf.readDoubleLE(e.offset + 8 * i);
      return a;
    }
    const a = new Int32Array(e.length);
    for (let i = 0; i < e.length; i++) a[i] = buf.readInt32LE(e.offset + 4 * i);
    return a;
  };
  const hm = header.mesh;
  const mesh: Mesh = {
    order: hm.order,
    nNodes: hm.nNodes,
    nVertices: hm.nVertices,
    nodes: get('nodes') as Float64Array,
    nElements: hm.nElements,
    elements: get('elements') as Int32Array,
    bEdges: get('bEdges') as Int32Array,
    nBEdges: hm.nBEdges,
    bEdgeDomain: get('bEdgeDomain') as Int32Array,
    bEdgeT: get('bEdgeT') as Float64Array,
    nodeEdge: get('nodeEdge') as Int32Array,
    nodeCorner: get('nodeCorner') as Int32Array,
  };
  const per = mesh.order === 2 ? 6 : 3;
  if (mesh.nodes.length !== 2 * mesh.nNodes || mesh.elements.length !== per * mesh.nElements) throw bad('the mesh arrays do not match their counts');
  for (let i = 0; i < mesh.elements.length; i++) if (mesh.elements[i] < 0 || mesh.elements[i] >= mesh.nNodes) throw bad('an element refers to a node that does not exist');
  const u = get('u') as Float64Array;
  const stress = get('stress') as Float64Array;
  if (u.length !== 2 * mesh.nNodes || stress.length !== 3 * mesh.nNodes) throw bad('the displacement or stress arrays do not match the mesh');
  return { result: header.result, model: header.model, mesh, u, stress, szzFactor: header.szzFactor, createdAt: header.createdAt };
}

/** Reads a saved solution from the file, or from a folder holding solution.raiser. */
export function readSaved(path: string): PlotSource {
  let file = path;
  try {
    if (statSync(path).isDirectory()) file = join(path, SAVED_FILE);
  } catch {
    throw new ModelError('', `${path}: no such file or folder`, `give the ${SAVED_FILE} file (or the folder holding it) that raiser solve -o wrote`);
  }
  let buf: Buffer;
  try {
    buf = readFileSync(file);
  } catch {
    throw new ModelError('', `${file}: no such file`, `raiser solve <model> -o DIR writes DIR/${SAVED_FILE}`);
  }
  return decodeSaved(buf, file);
}
