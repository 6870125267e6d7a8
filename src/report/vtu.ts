/**
 * VTK XML unstructured grid (.vtu) of the solution, for any VTK viewer: points (z = 0), cells,
 * displacements and recovered nodal stresses.
 *
 * Written from "VTK File Formats" (Kitware, The VTK User's Guide, 11th ed., and the VTK
 * file-format document): <VTKFile type="UnstructuredGrid" version="1.0" byte_order=
 * "LittleEndian">, one <Piece NumberOfPoints NumberOfCells> holding <Points> (one 3-component
 * DataArray), <Cells> (connectivity, offsets = the running end of each cell's connectivity,
 * types: one UInt8 per cell), <PointData> and <CellData>. ASCII data, numbers in JavaScript's
 * shortest round-trip form, so values read back bit for bit.
 *
 * Cell types: VTK_TRIANGLE = 5 (3 corners counter-clockwise) and VTK_QUADRATIC_TRIANGLE = 22,
 * whose points are the corners 0, 1, 2 followed by the mid-edge points of edges (0,1), (1,2)
 * and (2,0). raiser's 6-node triangle numbers its nodes the same way (src/mesh/types.ts:
 * 3 = mid 0-1, 4 = mid 1-2, 5 = mid 2-0), so `VTK_QUADRATIC_TRIANGLE_ORDER` is the identity;
 * it is written out so the mapping is stated and tested rather than assumed.
 */
import type { Mesh } from '../mesh/types.js';
import { measureField } from '../post/peak.js';

export const VTK_TRIANGLE = 5;
export const VTK_QUADRATIC_TRIANGLE = 22;

/** VTK point k of a quadratic triangle is raiser's local node VTK_QUADRATIC_TRIANGLE_ORDER[k]. */
const VTK_QUADRATIC_TRIANGLE_ORDER = [0, 1, 2, 3, 4, 5] as const;

export interface VtuInput {
  mesh: Mesh;
  u: Float64Array;
  stress: Float64Array;
  szzFactor: number;
  title?: string;
}

function nums(a: ArrayLike<number>, perLine: number): string {
  const out: string[] = [];
  let line: string[] = [];
  for (let i = 0; i < a.length; i++) {
    line.push(String(a[i]));
    if (line.length === perLine) {
      out.push(line.join(' '));
      line = [];
    }
  }
  if (line.length) out.push(line.join(' '));
  return out.join('\n');
}

function esc(t: string): string {
  return t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/--/g, '- -');
}

export function vtuText(v: VtuInput): string {
  const m = v.mesh;
  const per = m.order === 2 ? 6 : 3;
  const pts = new Float64Array(3 * m.nNodes);
  for (let i = 0; i < m.nNodes; i++) {
    pts[3 * i] = m.nodes[2 * i];
    pts[3 * i + 1] = m.nodes[2 * i + 1];
  }
  const conn = new Int32Array(per * m.nElements);
  const order = per === 6 ? VTK_QUADRATIC_TRIANGLE_ORDER : [0, 1, 2];
  for (let e = 0; e < m.nElements; e++) for (let k = 0; k < per; k++) conn[per * e + k] = m.elements[per * e + order[k]];
  const offsets = new Int32Array(m.nElements);
  for (let e = 0; e < m.nElements; e++) offsets[e] = per * (e + 1);
  const types = new Uint8Array(m.nElements).fill(per === 6 ? VTK_QUADRATIC_TRIANGLE : VTK_TRIANGLE);
  const disp = new Float64Array(3 * m.nNodes);
  for (let i = 0; i < m.nNodes; i++) {
    disp[3 * i] = v.u[2 * i];
    disp[3 * i + 1] = v.u[2 * i + 1];
  }
  const comp = (c: number) => {
    const a = new Float64Array(m.nNodes);
    for (let i = 0; i < m.nNodes; i++) a[i] = v.stress[3 * i + c];
    return a;
  };
  const scalars: [string, Float64Array][] = [
    ['sxx', comp(0)],
    ['syy', comp(1)],
    ['sxy', comp(2)],
    ['s1', measureField(v.stress, 'max-principal', v.szzFactor)],
    ['s2', measureField(v.stress, 'min-principal', v.szzFactor)],
    ['von_mises', measureField(v.stress, 'von-mises', v.szzFactor)],
    ['tresca', measureField(v.stress, 'tresca', v.szzFactor)],
  ];
  const elementIds = new Int32Array(m.nElements);
  for (let e = 0; e < m.nElements; e++) elementIds[e] = e;
  const lines = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<!-- raiser solution${v.title ? `: ${esc(v.title)}` : ''}; stresses are recovered nodal values (model stress unit), displacements in the model length unit -->`,
    '<VTKFile type="UnstructuredGrid" version="1.0" byte_order="LittleEndian" header_type="UInt64">',
    '  <UnstructuredGrid>',
    `    <Piece NumberOfPoints="${m.nNodes}" NumberOfCells="${m.nElements}">`,
    '      <PointData Scalars="von_mises" Vectors="displacement">',
    `        <DataArray type="Float64" Name="displacement" NumberOfComponents="3" format="ascii">\n${nums(disp, 3)}\n        </DataArray>`,
    ...scalars.map(([name, a]) => `        <DataArray type="Float64" Name="${name}" format="ascii">\n${nums(a, 6)}\n        </DataArray>`),
    '      </PointData>',
    '      <CellData>',
    `        <DataArray type="Int32" Name="element" format="ascii">\n${nums(elementIds, 12)}\n        </DataArray>`,
    '      </CellData>',
    '      <Points>',
    `        <DataArray type="Float64" Name="Points" NumberOfComponents="3" format="ascii">\n${nums(pts, 3)}\n        </DataArray>`,
    '      </Points>',
    '      <Cells>',
    `        <DataArray type="Int32" Name="connectivity" format="ascii">\n${nums(conn, per)}\n        </DataArray>`,
    `        <DataArray type="Int32" Name="offsets" format="ascii">\n${nums(offsets, 12)}\n        </DataArray>`,
    `        <DataArray type="UInt8" Name="types" format="ascii">\n${nums(types, 24)}\n        </DataArray>`,
    '      </Cells>',
    '    </Piece>',
    '  </UnstructuredGrid>',
    '</VTKFile>',
    '',
  ];
  return lines.join('\n');
}
