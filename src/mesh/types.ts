/**
 * The finished mesh: flat typed arrays, y up, every element counter-clockwise.
 *
 *   linear (3-node)       quadratic (6-node)
 *        2                     2
 *        | \                   | \
 *        |   \                 5   4
 *        |     \               |     \
 *        0-------1             0--3--1
 *
 * Nodes 0 .. nVertices-1 are element corners; quadratic midside nodes follow. Degree of freedom
 * 2*i + c belongs to node i, direction c (0 = x, 1 = y).
 */
export interface Mesh {
  order: 1 | 2;
  nNodes: number;
  nVertices: number;
  /** x0, y0, x1, y1, ... */
  nodes: Float64Array;
  nElements: number;
  /** 3 or 6 node indices per element */
  elements: Int32Array;
  /** boundary edges, 3 entries each: start vertex, end vertex (material on the left), midside node or -1 */
  bEdges: Int32Array;
  nBEdges: number;
  /** per boundary edge: the domain edge it lies on */
  bEdgeDomain: Int32Array;
  /** per boundary edge: curve parameters at its start and end */
  bEdgeT: Float64Array;
  /** per node: the domain edge it lies on (for a junction, the edge that starts there), -1 inside */
  nodeEdge: Int32Array;
  /** per node: the domain corner at that node, -1 if none */
  nodeCorner: Int32Array;
}

export interface MeshStats {
  minAngleDeg: number;
  maxAngleDeg: number;
  /** smallest angle over the triangles that are not forced by a sharp input corner */
  minAngleUnforcedDeg: number;
  triangles: number;
  vertices: number;
  /** the count the size field asked for, estimated before meshing */
  estimatedTriangles: number;
  timeMs: { boundary: number; triangulate: number; refine: number; finish: number; total: number };
  refine: {
    insertedInterior: number;
    segmentSplits: number;
    rejected: number;
    chordSplits: number;
    exemptTriangles: number;
  };
}
