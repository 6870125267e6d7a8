/**
 * Writes schema/raiser-model.schema.json from the model schema:
 *   npm run build && node dist/model/write-schema.js [path]
 */
import { writeModelJsonSchema } from './jsonschema.js';

const written = writeModelJsonSchema(process.argv[2] || undefined);
process.stdout.write(`wrote ${written}\n`);
