/**
 * Benchmark of the per-pixel contour: a 6-node mesh of about 2e5 elements on a 500 x 300 plate with a
 * smooth invented stress field, drawn at 2000 x 1200 pixels (median of 3 after a warm-up):
 *   npm run build && node dist/bench/render.js [elements]
 * A benchmark, not a test: times depend on the machine.
 */
import { DEFAULT_MAP } from '../render/colormap.js';
import { fitView, paintField, type DrawMesh } from '../render/field.js';
import { Raster } from '../render/raster.js';

function stripMesh(nx: number, ny: number, L: number, H: number): DrawMesh {
  // Vertices on a (2nx+1) x (2ny+1) grid: even indices are corners, odd ones midside nodes.
  const gx = 2 * nx + 1;
  const gy = 2 * ny + 1;
  const nodes = new Float64Array(2 * gx * gy);
  for (let j = 0; j < gy; j++) {
    for (let i = 0; i < gx; i++) {
      nodes[2 * (j * gx + i)] = (L * i) / (gx - 1);
      nodes[2 * (j * gx + i) + 1] = (H * j) / (gy - 1);
    }
  }
  const id = (i: number, j: number) => j * gx + i;
  const elements = new Int32Array(6 * 2 * nx * ny);
  let e = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const [x0, y0] = [2 * i, 2 * j];
      elements.set([id(x0, y0), id(x0 + 2, y0), id(x0 + 2, y0 + 2), id(x0 + 1, y0), id(x0 + 2, y0 + 1), id(x0 + 1, y0 + 1)], 6 * e++);
      elements.set([id(x0, y0), id(x0 + 2, y0 + 2), id(x0, y0 + 2), id(x0 + 1, y0 + 1), id(x0 + 1, y0 + 2), id(x0, y0 + 1)], 6 * e++);
    }
  }
  return { order: 2, nNodes: gx * gy, nodes, nElements: e, elements };
}

const target = Number(process.argv[2] || 2e5);
const ny = Math.round(Math.sqrt((target / 2) * 0.6));
const nx = Math.round(target / 2 / ny);
const mesh = stripMesh(nx, ny, 500, 300);
const stress = new Float64Array(3 * mesh.nNodes);
for (let i = 0; i < mesh.nNodes; i++) {
  const x = mesh.nodes[2 * i];
  const y = mesh.nodes[2 * i + 1];
  stress[3 * i] = 100 + 50 * Math.sin(x / 40) * Math.cos(y / 30);
  stress[3 * i + 1] = 20 * Math.cos(x / 70);
  stress[3 * i + 2] = 10 * Math.sin(y / 20);
}
const field = { data: stress, stride: 3, value: (c: Float64Array) => 0.5 * (c[0] + c[1]) + Math.hypot(0.5 * (c[0] - c[1]), c[2]) };
const W = 2000;
const H = 1200;
const view = fitView([0, 0, 500, 300], [20, 20, W - 20, H - 20]);
const times: number[] = [];
for (let run = 0; run < 4; run++) {
  const r = new Raster(W, H);
  const t0 = performance.now();
  paintField(r, mesh, view, field, { lo: 0, hi: 200, map: DEFAULT_MAP });
  if (run > 0) times.push(performance.now() - t0);
}
times.sort((a, b) => a - b);
process.stdout.write(`contour of ${mesh.nElements} 6-node elements at ${W} x ${H} pixels: median ${times[1].toFixed(0)} ms (best ${times[0].toFixed(0)} ms) on Node ${process.version}\n`);
