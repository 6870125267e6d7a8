/**
 * `raiser mesh <model> -o DIR`: the geometry (typed, or imported from a drawing) with its tags
 * and the mesh, as a picture (mesh-preview.png, mesh-preview.svg; the solution's own mesh.png is written by solve -o) and a summary, before anything is solved.
 * The mesh is the one `raiser solve --single-mesh` would use.
 */
import { Option, type Command } from 'commander';
import { join } from 'node:path';
import { curveLength } from '../geometry/curve.js';
import { selectTarget } from '../geometry/select.js';
import { generateMesh } from '../mesh/generate.js';
import { ModelError, ModelTooLargeError } from '../model/errors.js';
import { loadModelFileAndDrawing } from '../pipeline/load.js';
import { prepareModel } from '../pipeline/analyse.js';
import { drawGeometryPicture } from '../render/geometry-picture.js';
import { prepareOutputDir, writeAtomic } from '../report/files.js';
import { CAUTION_LINE } from '../report/pictures.js';
import { TOOL_VERSION } from '../model/version.js';
import { loadsOf, splitLoadCases } from '../model/load-cases.js';

interface MeshFlags {
  out?: string;
  force?: boolean;
  element?: 'linear' | 'quadratic';
  json?: boolean;
  allowDrawingOutside?: boolean;
}

function fmt(v: number): string {
  return Number(v.toPrecision(5)).toString();
}

export function runMesh(file: string, flags: MeshFlags): { text: string; json: object } {
  if (flags.out !== undefined) prepareOutputDir(flags.out, ['mesh-preview.png', 'mesh-preview.svg'], flags.force ?? false);
  const loaded = loadModelFileAndDrawing(file, { allowDrawingOutside: flags.allowDrawingOutside });
  const { model, drawing, warnings } = loaded;
  let prep;
  let meshed;
  try {
    prep = prepareModel(model, { element: flags.element, drawing });
    const ms = model.mesh ?? {};
    meshed = generateMesh(prep.domain, {
      order: prep.order,
      size: ms.size,
      raiserSize: ms.raiserSize,
      grading: ms.grading,
      minAngleDeg: ms.minAngle,
      hardPoints: prep.hardPoints,
      maxBytes: prep.maxMemoryBytes,
    });
  } catch (e) {
    // A problem found while building the geometry or the mesh is placed in the model file too.
    throw e instanceof ModelError || e instanceof ModelTooLargeError ? loaded.locate(e) : e;
  }
  const { domain, order } = prep;
  const { mesh, stats } = meshed;
  const u = prep.units.length;
  const lines: string[] = [];
  lines.push(`raiser mesh: ${model.title ?? file} (${file})`);
  if (drawing) {
    lines.push(`  geometry from ${drawing.file} (${drawing.format.toUpperCase()}), drawing unit ${drawing.unit}; ends joined within ${fmt(drawing.joinTolerance)} ${u}`);
    for (const n of drawing.notes) lines.push(`    ${n}`);
  }
  const kinds = new Map<string, number>();
  for (const e of domain.edges) kinds.set(e.curve.kind, (kinds.get(e.curve.kind) ?? 0) + 1);
  lines.push(`  ${domain.loops.length - 1} hole${domain.loops.length === 2 ? '' : 's'}, ${domain.edges.length} edges (${[...kinds].map(([k, n]) => `${n} ${k === 'bezier' ? 'Bezier curve' : k === 'ellipse' ? 'elliptical arc' : k}${n === 1 ? '' : 's'}`).join(', ')}), area ${fmt(domain.area)} ${u}^2, size ${fmt(domain.bbox[2] - domain.bbox[0])} x ${fmt(domain.bbox[3] - domain.bbox[1])} ${u}`);
  for (const l of domain.loops) {
    const len = l.edges.reduce((s, id) => s + curveLength(domain.edges[id].curve), 0);
    lines.push(`    ${l.label}: ${l.edges.length} edge${l.edges.length === 1 ? '' : 's'}, area ${fmt(Math.abs(l.signedArea))} ${u}^2, perimeter ${fmt(len)} ${u}`);
  }
  const tags = new Map<string, number>();
  for (const e of domain.edges) for (const t of e.tags) tags.set(t, (tags.get(t) ?? 0) + 1);
  lines.push(`  tags: ${tags.size ? [...tags].map(([t, n]) => `"${t}" (${n} edge${n === 1 ? '' : 's'})`).join(', ') : 'none'}`);
  const items: { what: string; edges: number; length: number }[] = [];
  model.supports.forEach((s, i) => {
    if (s.type === 'pin') {
      items.push({ what: `support ${i + 1} (pin at (${s.at.join(', ')}))`, edges: 0, length: 0 });
      return;
    }
    const { edges } = selectTarget(domain, s.on);
    items.push({ what: `support ${i + 1} (${s.type})`, edges: edges.length, length: edges.reduce((a, id) => a + curveLength(domain.edges[id].curve), 0) });
  });
  // every case's loads (src/model/load-cases.ts), named by their case when there are several
  for (const { name, model: one } of splitLoadCases(model)) {
    loadsOf(one).forEach((l, i) => {
      const what = `${name === null ? '' : `case "${name}" `}load ${i + 1} (${l.type}`;
      if (!l.on) {
        items.push({ what: `${what}, on the outer edges)`, edges: 0, length: 0 });
        return;
      }
      const { edges } = selectTarget(domain, l.on);
      items.push({ what: `${what})`, edges: edges.length, length: edges.reduce((a, id) => a + curveLength(domain.edges[id].curve), 0) });
    });
  }
  for (const it of items) lines.push(`  ${it.what}${it.edges ? `: ${it.edges} edge${it.edges === 1 ? '' : 's'}, ${fmt(it.length)} ${u} long` : ''}`);
  lines.push(`  mesh: ${mesh.nNodes} nodes, ${mesh.nElements} ${order === 2 ? 'quadratic triangles (6-node)' : 'linear triangles (3-node)'}, smallest angle ${stats.minAngleUnforcedDeg.toFixed(1)} deg`);
  for (const w of warnings) lines.push(`  warning: ${w.message}`);
  const written: string[] = [];
  if (flags.out !== undefined) {
    prepareOutputDir(flags.out, ['mesh-preview.png', 'mesh-preview.svg'], flags.force ?? false);
    const pic = drawGeometryPicture({
      domain,
      mesh,
      title: model.title ?? file,
      lines: [
        `${drawing ? `from ${drawing.file}, ` : ''}${domain.loops.length - 1} hole${domain.loops.length === 2 ? '' : 's'}, ${mesh.nElements} ${order === 2 ? '6-node' : '3-node'} triangles, ${mesh.nNodes} nodes; lengths in ${u}`,
        'boundary coloured by tag (the names loads and supports select); not solved',
      ],
      footer: { line: [`${model.title ?? 'untitled model'} (${file})`, `raiser ${TOOL_VERSION}`, new Date().toISOString().slice(0, 10)].join('  |  '), caution: CAUTION_LINE },
      lengthUnit: u,
    });
    writeAtomic(join(flags.out, 'mesh-preview.png'), pic.png);
    writeAtomic(join(flags.out, 'mesh-preview.svg'), pic.svg);
    written.push(join(flags.out, 'mesh-preview.png'), join(flags.out, 'mesh-preview.svg'));
    lines.push('', `  wrote ${written.join(', ')}`);
  }
  const json = {
    file,
    drawing: drawing ? { file: drawing.file, format: drawing.format, unit: drawing.unit, joinTolerance: drawing.joinTolerance, notes: drawing.notes } : null,
    loops: domain.loops.map((l) => ({ label: l.label, name: l.name ?? null, edges: l.edges.length, area: Math.abs(l.signedArea) })),
    area: domain.area,
    tags: Object.fromEntries(tags),
    selections: items,
    mesh: { nodes: mesh.nNodes, elements: mesh.nElements, order, minAngleDeg: stats.minAngleUnforcedDeg },
    written,
    warnings: warnings.map((w) => w.message),
  };
  return { text: lines.join('\n'), json };
}

export function declareMesh(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .argument('<model>', 'model file (JSON)')
    .option('-o, --out <dir>', 'write mesh-preview.png and mesh-preview.svg into this folder')
    .option('--force', 'replace picture files that already exist in the output folder')
    .addOption(new Option('--element <type>', 'element type, overriding the model file').choices(['linear', 'quadratic']))
    .option('--json', 'print the summary as one JSON object on stdout, nothing else')
    .option('--allow-drawing-outside', 'let geometry.from read a drawing outside the model file\'s folder (an absolute path, or one through ..)')
    .action((file: string, flags: MeshFlags) => {
      const r = runMesh(file, flags);
      process.stdout.write((flags.json ? JSON.stringify(r.json, null, 2) : r.text) + '\n');
      setCode(0);
    });
}
