/**
 * The JSON Schema file for editors (completion and checking while a model file is typed),
 * generated from the zod schema so the two cannot disagree. The committed copy lives in
 * schema/raiser-model.schema.json; a test fails when it is out of date.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { modelJsonSchema } from './schema.js';

/** Where the committed schema file lives; the same from src/model and from dist/model. */
export function defaultSchemaPath(): string {
  return fileURLToPath(new URL('../../schema/raiser-model.schema.json', import.meta.url));
}

/** The schema file's exact text: two-space indented JSON with a final newline. */
export function modelJsonSchemaText(): string {
  return JSON.stringify(modelJsonSchema(), null, 2) + '\n';
}

/** Writes the schema file (creating its folder if needed) and returns the path written. */
export function writeModelJsonSchema(path: string = defaultSchemaPath()): string {
  mkdirSync(dirname(path), { recursive: true });
  writeFileSync(path, modelJsonSchemaText());
  return path;
}
