/**
 * The examples in the README's model format section are tests: the full model is read like a user's file and
 * its geometry is built; every JSON fragment is valid for the part of the schema it shows; the
 * printed error shown in the guide is what raiser prints for that file.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { buildDomain } from '../src/geometry/domain.js';
import { ModelError } from '../src/model/errors.js';
import { parseModelText } from '../src/model/load.js';
import { Load, Loop, Model, Support, Target } from '../src/model/schema.js';
import { substituteParameters } from '../src/model/params.js';

const readme = readFileSync(new URL('../README.md', import.meta.url), 'utf8');
// The model format section runs from its heading to the result fields.
const doc = readme.slice(readme.indexOf('## The model file'), readme.indexOf('## Result fields'));

function blocks(lang: string): string[] {
  const out: string[] = [];
  const re = new RegExp('```' + lang + '\\n([\\s\\S]*?)```', 'g');
  for (const m of doc.matchAll(re)) out.push(m[1]);
  return out;
}

describe('README model format', () => {
  it('has one complete example, which reads and builds', () => {
    const full = blocks('json');
    expect(full).toHaveLength(1);
    const m = parseModelText(full[0], 'README.md');
    const d = buildDomain(m.geometry);
    expect(d.loops).toHaveLength(2);
    // The notch edge is the half circle of radius 6 through (60, 19).
    const notch = d.edges.find((e) => e.tags.includes('notch'))!;
    expect(notch.curve).toMatchObject({ kind: 'arc', cx: 60, cy: 25 });
    expect((notch.curve as { r: number }).r).toBeCloseTo(6, 12);
  });
  it('every fragment is valid for the part of the format it shows', () => {
    const fragments = blocks('jsonc');
    expect(fragments.length).toBeGreaterThanOrEqual(6);
    const field: Record<string, z.ZodType> = { ...(Model.shape as Record<string, z.ZodType>), on: Target };
    for (const f of fragments) {
      if (f.trimStart().startsWith('"')) {
        // Expressions in a fragment are evaluated with its own parameters first, as a file's are.
        const o = substituteParameters(JSON.parse(`{${f}}`)).data as Record<string, unknown>;
        for (const [k, v] of Object.entries(o)) {
          expect(field[k], `a fragment shows the unknown field "${k}"`).toBeDefined();
          const r = field[k].safeParse(v);
          expect(r.success, `${k}: ${JSON.stringify(v)}`).toBe(true);
        }
        continue;
      }
      for (const line of f.split('\n').filter((l) => l.trim())) {
        const o = JSON.parse(line) as Record<string, unknown>;
        // a rigid pin is a support when it is not pushed with a force
        const support = ['fixed', 'roller', 'symmetry', 'pin'].includes(o.type as string) || (o.type === 'rigid-pin' && !('force' in o));
        const schema = 'shape' in o ? Loop : support ? Support : Load;
        const r = schema.safeParse(o);
        expect(r.success, line).toBe(true);
      }
    }
  });
  it('prints the error shown in the guide for the example with a negative thickness', () => {
    const shown = doc.match(/One problem is printed as\n\n```text\n([\s\S]*?)```/)![1].trimEnd();
    const text = blocks('json')[0].replace('"thickness": 10', '"thickness": -2');
    try {
      parseModelText(text, 'part.json');
      expect.unreachable();
    } catch (e) {
      expect((e as ModelError).describe()).toBe(shown);
    }
  });
});
