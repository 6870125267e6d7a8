/**
 * The saved solution, `solution.raiser`: what `raiser plot` needs to draw every picture again
 * without solving: the mesh, the displacements, the recovered nodal stresses, the result JSON
 * and the model. One binary file, little-endian, so the numbers come back bit for bit:
 *
 *   bytes 0-7    the magic "RAISERSV"
 *   bytes 8-11   uint32 format version (2)
 *   bytes 12-15  uint32 length H of the header
 *   bytes 16-47  SHA-256 of every byte from 48 to the end of the file
 *   48 ..        H bytes of UTF-8 JSON: { format, version, createdAt, model, result, szzFactor,
 *                mesh: { order, nNodes, nVertices, nElements, nBEdges },
 *                arrays: [{ name, type: "float64" | "int32", length, offset }] }
 *   then the arrays, each starting at its `offset` from the start of the file (a multiple of 8).
 *
 * A saved file may come from anywhere, so it is read back like a model file: the checksum must
 * match (an edited or damaged file is refused, not drawn), the header must have every field of
 * the right kind, every array must lie inside the file and fit the mesh counts, every element
 * must name existing nodes, and every number must be finite. Version 1 files (no checksum) are
 * still read, with the same checks.
 *
 * Arrays: nodes (2 per node), elements (3 or 6 per element, numbered as in src/mesh/types.ts),
 * bEdges (3 per boundary edge), bEdgeDomain, bEdgeT (2 per boundary edge), nodeEdge,
 * nodeCorner, u (2 per node), stress (sxx, syy, sxy per node).
 */
import { createHash } from 'node:crypto';
import { statSync } from 'node:fs';
import { z } from 'zod';
import { formatBytes, readRegularFile } from '../model/read-file.js';
import { join } from 'node:path';
import { ModelError } from '../model/errors.js';
import type { Model } from '../model/schema.js';
import type { Mesh } from '../mesh/types.js';
import type { Analysis } from '../pipeline/analyse.js';
import type { ResultJson } from './result-json.js';

export const SAVED_FILE = 'solution.raiser';
const MAGIC = 'RAISERSV';
const VERSION = 2;
/** Where the header starts: after magic, version, header length and (version 2) the checksum. */
const HEADER_AT: Record<number, number> = { 1: 16, 2: 48 };

const ArrayEntry = z.strictObject({ name: z.string(), type: z.enum(['float64', 'int32']), length: z.number().int().nonnegative(), offset: z.number().int().nonnegative() });
const count = z.number().int().nonnegative().max(2 ** 31 - 1);
const num = z.number().finite();
const numOrNull = num.nullable();
/**
 * The fields of the result that the pictures and the report read, each of its kind (the rest of
 * the result is kept as it is): a saved file whose checksum was made anew over a changed
 * result must still not reach the drawing code with a field missing.
 */
const SavedResult = z
  .object({
    tool: z.object({ version: z.string() }).passthrough(),
    model: z.object({ title: z.string().nullable().optional(), file: z.string().nullable().optional() }).passthrough(),
    units: z.object({ length: z.string(), stress: z.string() }).passthrough(),
    analysis: z.object({ measure: z.string(), state: z.string(), thickness: num }).passthrough(),
    peak: z.object({ measure: z.string(), stress: num, x: num, y: num, feature: z.string(), sxx: num, syy: num, sxy: num }).passthrough(),
    kt: z.object({ net: numOrNull, gross: numOrNull, error: numOrNull }).passthrough(),
    mesh: z.object({ dofs: count, elements: count, nodes: count, nodesPerElement: count, elementType: z.string(), minAngleDeg: num, maxAngleDeg: num }).passthrough(),
    convergence: z.object({ meshes: z.array(z.unknown()) }).passthrough(),
    warnings: z.array(z.string()),
    cautions: z.array(z.string()),
  })
  .passthrough();
const SavedHeader = z.object({
  format: z.literal('raiser saved solution'),
  version: z.number().int(),
  createdAt: z.string(),
  model: z.object({ geometry: z.object({}).passthrough() }).passthrough(),
  result: SavedResult,
  szzFactor: z.number().finite(),
  mesh: z.strictObject({ order: z.union([z.literal(1), z.literal(2)]), nNodes: count, nVertices: count, nElements: count, nBEdges: count }),
  arrays: z.array(ArrayEntry),
});

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
  const at = HEADER_AT[VERSION];
  let base = 0;
  let h = headerOf(base);
  for (let it = 0; it < 8; it++) {
    const len = Buffer.byteLength(h.text, 'utf8');
    const want = Math.ceil((at + len) / 8) * 8;
    if (want === base) break;
    base = want;
    h = headerOf(base);
  }
  const hb = Buffer.from(h.text, 'utf8');
  const out = Buffer.alloc(h.end);
  out.write(MAGIC, 0, 'latin1');
  out.writeUInt32LE(VERSION, 8);
  out.writeUInt32LE(hb.length, 12);
  hb.copy(out, at);
  let off = base;
  for (const a of arrays) {
    const bytes = Buffer.from(a.data.buffer, a.data.byteOffset, a.data.byteLength);
    if (a.data instanceof Float64Array) for (let i = 0; i < a.data.length; i++) out.writeDoubleLE(a.data[i], off + 8 * i);
    else for (let i = 0; i < a.data.length; i++) out.writeInt32LE(a.data[i], off + 4 * i);
    off += Math.ceil(bytes.length / 8) * 8;
  }
  createHash('sha256').update(out.subarray(at)).digest().copy(out, 16);
  return out;
}

export function decodeSaved(buf: Buffer, name = SAVED_FILE): PlotSource {
  const bad = (why: string) => new ModelError('', `${name} is not a raiser saved solution: ${why}`, `give the ${SAVED_FILE} file (or the folder holding it) that raiser solve -o wrote; solve again to make a new one`);
  if (buf.length < 16 || buf.toString('latin1', 0, 8) !== MAGIC) throw bad('it does not start with the raiser signature');
  const version = buf.readUInt32LE(8);
  const at = HEADER_AT[version];
  if (at === undefined) throw bad(`format version ${version}, this raiser reads versions ${Object.keys(HEADER_AT).join(' and ')}`);
  if (buf.length < at) throw bad('it ends inside its preamble');
  if (version >= 2 && !createHash('sha256').update(buf.subarray(at)).digest().equals(buf.subarray(16, 48))) {
    throw bad('its checksum does not match its content: it was changed or damaged after raiser wrote it');
  }
  const hl = buf.readUInt32LE(12);
  if (at + hl > buf.length) throw bad('the header runs past the end of the file');
  let raw: unknown;
  try {
    raw = JSON.parse(buf.toString('utf8', at, at + hl));
  } catch {
    throw bad('its header is not JSON');
  }
  const parsed = SavedHeader.safeParse(raw);
  if (!parsed.success) {
    const i = parsed.error.issues[0];
    throw bad(`its header is incomplete: ${i.path.join('.') || 'the header'}: ${i.message}`);
  }
  const header = parsed.data;
  const get = (nm: string, type: 'float64' | 'int32', length: number): Float64Array | Int32Array => {
    const e = header.arrays.find((a) => a.name === nm);
    if (!e) throw bad(`the array ${nm} is missing`);
    if (e.type !== type) throw bad(`the array ${nm} holds ${e.type}, not ${type}`);
    if (e.length !== length) throw bad(`the array ${nm} has ${e.length} entries where the mesh counts ask for ${length}`);
    const size = type === 'float64' ? 8 : 4;
    if (e.offset < at + hl || e.offset + e.length * size > buf.length) throw bad(`the array ${nm} lies outside the file's data`);
    if (type === 'float64') {
      const a = new Float64Array(e.length);
      for (let i = 0; i < e.length; i++) {
        a[i] = buf.readDoubleLE(e.offset + 8 * i);
        if (!Number.isFinite(a[i])) throw bad(`the array ${nm} holds a number that is not finite`);
      }
      return a;
    }
    const a = new Int32Array(e.length);
    for (let i = 0; i < e.length; i++) a[i] = buf.readInt32LE(e.offset + 4 * i);
    return a;
  };
  const hm = header.mesh;
  const per = hm.order === 2 ? 6 : 3;
  // Nothing is allocated beyond what the file itself holds.
  const need = 8 * (2 * hm.nNodes) + 4 * per * hm.nElements;
  if (need > buf.length) throw bad(`its mesh counts (${hm.nNodes} nodes, ${hm.nElements} elements) need more data than the file's ${formatBytes(buf.length)}`);
  const mesh: Mesh = {
    order: hm.order,
    nNodes: hm.nNodes,
    nVertices: hm.nVertices,
    nodes: get('nodes', 'float64', 2 * hm.nNodes) as Float64Array,
    nElements: hm.nElements,
    elements: get('elements', 'int32', per * hm.nElements) as Int32Array,
    bEdges: get('bEdges', 'int32', 3 * hm.nBEdges) as Int32Array,
    nBEdges: hm.nBEdges,
    bEdgeDomain: get('bEdgeDomain', 'int32', hm.nBEdges) as Int32Array,
    bEdgeT: get('bEdgeT', 'float64', 2 * hm.nBEdges) as Float64Array,
    nodeEdge: get('nodeEdge', 'int32', hm.nNodes) as Int32Array,
    nodeCorner: get('nodeCorner', 'int32', hm.nNodes) as Int32Array,
  };
  if (hm.nVertices > hm.nNodes) throw bad('it has more vertices than nodes');
  for (let i = 0; i < mesh.elements.length; i++) if (mesh.elements[i] < 0 || mesh.elements[i] >= mesh.nNodes) throw bad('an element refers to a node that does not exist');
  for (let i = 0; i < mesh.bEdges.length; i++) if (mesh.bEdges[i] < 0 || mesh.bEdges[i] >= mesh.nNodes) throw bad('a boundary edge refers to a node that does not exist');
  const u = get('u', 'float64', 2 * hm.nNodes) as Float64Array;
  const stress = get('stress', 'float64', 3 * hm.nNodes) as Float64Array;
  return { result: header.result as unknown as ResultJson, model: header.model as unknown as Model, mesh, u, stress, szzFactor: header.szzFactor, createdAt: header.createdAt };
}

/** Largest saved solution read (4 GiB): a million-DOF solution is about 200 MB. */
const MAX_SAVED_BYTES = 4 * 2 ** 30;

/** Reads a saved solution from the file, or from a folder holding solution.raiser. */
export function readSaved(path: string): PlotSource {
  let file = path;
  try {
    if (statSync(path).isDirectory()) file = join(path, SAVED_FILE);
  } catch {
    throw new ModelError('', `${path}: no such file or folder`, `give the ${SAVED_FILE} file (or the folder holding it) that raiser solve -o wrote`);
  }
  const got = readRegularFile(file, MAX_SAVED_BYTES);
  if (!got.ok) {
    const why =
      got.kind === 'missing' ? 'no such file' : got.kind === 'folder' ? 'a folder' : got.kind === 'not-regular' ? `${got.what}, not a saved solution` : got.kind === 'too-large' ? `${formatBytes(got.bytes)}, more than the ${formatBytes(MAX_SAVED_BYTES)} raiser reads` : `cannot be read (${got.reason})`;
    throw new ModelError('', `${file}: ${why}`, `raiser solve <model> -o DIR writes DIR/${SAVED_FILE}`);
  }
  return decodeSaved(got.bytes, file);
}
