/**
 * Writes the reference model files into meshes/ from the templates:
 *   npm run build && node dist/model/write-meshes.js [folder]
 */
import { writeReferenceModels } from './reference-cases.js';

for (const path of writeReferenceModels(process.argv[2] || undefined)) process.stdout.write(`wrote ${path}\n`);
