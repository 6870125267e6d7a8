/**
 * Draws the README's pictures from the bundled invented example (examples/strap-bolt-hole.json,
 * certified to 1%) into docs/pictures/ (PNG, 1200 pixels wide), and the geometry picture of the
 * invented link plate (examples/link-plate.json) with its raisers' sections as link-geometry.png:
 *   npm run build && node dist/report/write-pictures.js [folder] [date YYYY-MM-DD]
 * The date printed on the pictures is the second argument (default today), so a rerun on
 * another day can reproduce the committed files exactly.
 */
import { mkdirSync } from 'node:fs';
import { loadModelFile } from '../model/load.js';
import { certifyModel } from '../pipeline/certify.js';
import { buildResult } from './result.js';
import { geometryScene, standardPictures, writePictures } from './pictures.js';
import { plotSource } from './saved.js';

const dir = process.argv[2] || 'docs/pictures';
const day = process.argv[3] || new Date().toISOString().slice(0, 10);
const file = 'examples/strap-bolt-hole.json';
const { model } = loadModelFile(file);
const cert = certifyModel(model, { target: 0.01 });
const src = plotSource(cert.analysis, buildResult(cert.analysis, file, cert), `${day}T00:00:00.000Z`);
mkdirSync(dir, { recursive: true });
const { written } = writePictures(dir, standardPictures(src, { width: 1200 }), ['png']);
const linkFile = 'examples/link-plate.json';
const link = certifyModel(loadModelFile(linkFile).model, { target: 0.01 });
const linkSrc = plotSource(link.analysis, buildResult(link.analysis, linkFile, link), `${day}T00:00:00.000Z`);
written.push(...writePictures(dir, [{ name: 'link-geometry', scene: geometryScene(linkSrc, { width: 1200 }) }], ['png']).written);
process.stdout.write(`wrote ${written.join(', ')}\n`);
