/**
 * The layout DEVELOPERS.md promises, held by a test so it cannot drift: data flows one way through
 * the stages (no module imports a later stage), no import cycles, a named public face for every
 * module (no `export *`), and no exported value that nobody uses (dead code comes back otherwise).
 */
import { describe, expect, test } from 'vitest';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';
import { findCycles, findUnusedExports, listTypeScript, readModule, stageOf } from './support/structure.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');

/**
 * The stages in the order data flows through them (DEVELOPERS.md, "Layout"). A module may import its
 * own stage and earlier ones. `solve` is a linear-algebra layer: it imports only `model` (its errors).
 * `bench` measures everything and may import anything; `cli` runs it (`raiser bench-solve`).
 */
const STAGES = ['model', 'geometry', 'element', 'mesh', 'solve', 'fem', 'charts', 'post', 'pipeline', 'render', 'verify', 'report', 'sweep', 'bench', 'cli'];

/** Imports that still run up the layers, each with the reason; the list only shrinks (empty now). */
const KNOWN_UPWARD = new Set<string>([]);

const source = listTypeScript(ROOT, 'src').map((f) => readModule(ROOT, f));
const tests = listTypeScript(ROOT, 'tests').map((f) => readModule(ROOT, f));

describe('the structure of src/', () => {
  test('every module sits in a known stage', () => {
    const unknown = source.map((m) => m.file).filter((f) => !STAGES.includes(stageOf(f) ?? ''));
    expect(unknown).toEqual([]);
  });

  test('no module imports a later stage', () => {
    const upward: string[] = [];
    for (const m of source) {
      const from = stageOf(m.file)!;
      if (from === 'bench') continue;
      for (const e of m.imports) {
        const to = stageOf(e.to);
        if (to === null) continue;
        const late = STAGES.indexOf(to) > STAGES.indexOf(from);
        const solveReachesOut = from === 'solve' && to !== 'solve' && to !== 'model';
        const edge = `${m.file} -> ${e.to}`;
        if ((late || solveReachesOut) && !KNOWN_UPWARD.has(edge)) upward.push(edge);
      }
    }
    expect(upward).toEqual([]);
  });

  test('no import cycles between modules', () => {
    expect(findCycles(source)).toEqual([]);
  });

  test('no `export *`: each module names what it offers', () => {
    expect(source.filter((m) => m.exportsStar).map((m) => m.file)).toEqual([]);
  });

  test('every exported value is used by another module or a test', () => {
    expect(findUnusedExports(source, [...source, ...tests])).toEqual([]);
  });
});

describe('the structure reader itself', () => {
  test('it sees the imports and exports of a known module', () => {
    const m = readModule(ROOT, 'tests/support/structure.ts');
    expect(m.exports).toContain('readModule');
    expect(m.typeExports.has('SourceModule')).toBe(true);
    expect(m.typeExports.has('readModule')).toBe(false);
  });

  test('it finds a cycle and an unused export in made-up modules', () => {
    const a = { file: 'src/a/x.ts', exports: ['f', 'g'], typeExports: new Set<string>(), exportsStar: false, imports: [{ from: 'src/a/x.ts', to: 'src/a/y.ts', names: ['h'], typeOnly: false }] };
    const b = { file: 'src/a/y.ts', exports: ['h'], typeExports: new Set<string>(), exportsStar: false, imports: [{ from: 'src/a/y.ts', to: 'src/a/x.ts', names: ['f'], typeOnly: false }] };
    expect(findCycles([a, b])).toEqual([['src/a/x.ts', 'src/a/y.ts']]);
    expect(findUnusedExports([a, b], [a, b])).toEqual(['src/a/x.ts: g']);
  });
});
