import { it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { buildDomain } from '../src/geometry/domain.js';
import { generateMesh } from '../src/mesh/generate.js';
import { expandTemplate } from '../src/model/templates.js';
import { Raster } from '../src/render/raster.js';

export function meshPng(mesh: any, file: string, W = 1400) {
  const n = mesh.nodes; let xmin=Infinity,xmax=-Infinity,ymin=Infinity,ymax=-Infinity;
  for (let i=0;i<mesh.nNodes;i++){xmin=Math.min(xmin,n[2*i]);xmax=Math.max(xmax,n[2*i]);ymin=Math.min(ymin,n[2*i+1]);ymax=Math.max(ymax,n[2*i+1]);}
  const s=(W-20)/(xmax-xmin), H=Math.ceil((ymax-ymin)*s)+20;
  const r = new Raster(W, H);
  const X=(x:number)=>10+(x-xmin)*s, Y=(y:number)=>H-10-(y-ymin)*s;
  const per = mesh.order===2?6:3;
  for (let e=0;e<mesh.nElements;e++){ for (let k=0;k<3;k++){const a=mesh.elements[per*e+k], b=mesh.elements[per*e+(k+1)%3]; r.line(X(n[2*a]),Y(n[2*a+1]),X(n[2*b]),Y(n[2*b+1]),[20,30,90]);}}
  writeFileSync(file, r.toPng());
}
it('view', () => {
  const cases: [string, any][] = [['plate-with-hole', {W: 50, d: 10}], ['stepped-bar', {}], ['u-notched-bar', {}], ['edge-notched-bar', {}]];
  for (const [name, v] of cases) {
    const m = expandTemplate(name, v);
    const r = generateMesh(buildDomain(m.geometry), { order: 2 });
    meshPng(r.mesh, `/tmp/dev/${name}.png`);
  }
});
