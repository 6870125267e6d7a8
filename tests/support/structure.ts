/**
 * The code's structure read from its sources: which module imports which, what each exports, and
 * who uses each export. Read with the TypeScript parser (syntax only, no type checking), so it is
 * quick enough to run in the test suite on every change.
 *
 * Used by tests/structure.test.ts to hold the layering of DEVELOPERS.md ("no module imports a later
 * stage"), to forbid import cycles and `export *`, and to find exports nobody uses.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import ts from 'typescript';

export interface ImportEdge {
  /** the importing file, relative to the repository root, with forward slashes */
  readonly from: string;
  /** the imported file (resolved to its .ts source) */
  readonly to: string;
  /** names imported; '*' for a namespace import, a dynamic import or `export * from` */
  readonly names: readonly string[];
  /** true when the import is erased at run time (`import type`, or every name `type`) */
  readonly typeOnly: boolean;
}

export interface SourceModule {
  readonly file: string;
  /** exported names (values and types) */
  readonly exports: readonly string[];
  /** the exported names that are types only (interfaces, type aliases, `export type`) */
  readonly typeExports: ReadonlySet<string>;
  /** true when the module has `export * from` */
  readonly exportsStar: boolean;
  readonly imports: readonly ImportEdge[];
}

/** Every .ts file under `dir` (recursively), relative to `root`. */
export function listTypeScript(root: string, dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d).sort()) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else if (name.endsWith('.ts') && !name.endsWith('.d.ts')) out.push(relative(root, p).split('\\').join('/'));
    }
  };
  walk(join(root, dir));
  return out;
}

function resolveSpecifier(root: string, from: string, spec: string): string | null {
  if (!spec.startsWith('.')) return null; // a package
  const base = resolve(root, dirname(from), spec);
  for (const candidate of [base.replace(/\.js$/, '.ts'), `${base}.ts`, join(base, 'index.ts')]) {
    try {
      if (statSync(candidate).isFile()) return relative(root, candidate).split('\\').join('/');
    } catch {
      // not this candidate; the next one
    }
  }
  return null;
}

function modifiersOf(node: ts.Node): readonly ts.ModifierLike[] {
  return ts.canHaveModifiers(node) ? (ts.getModifiers(node) ?? []) : [];
}

function hasExportModifier(node: ts.Node): boolean {
  return modifiersOf(node).some((m) => m.kind === ts.SyntaxKind.ExportKeyword);
}

/** Parses one file's imports and exports. */
export function readModule(root: string, file: string): SourceModule {
  const text = readFileSync(join(root, file), 'utf8');
  const sf = ts.createSourceFile(file, text, ts.ScriptTarget.ES2022, true, ts.ScriptKind.TS);
  const exports: string[] = [];
  const typeExports = new Set<string>();
  const imports: ImportEdge[] = [];
  let exportsStar = false;
  const edge = (spec: string, names: string[], typeOnly: boolean) => {
    const to = resolveSpecifier(root, file, spec);
    if (to) imports.push({ from: file, to, names, typeOnly });
  };
  for (const st of sf.statements) {
    if (ts.isImportDeclaration(st) && ts.isStringLiteral(st.moduleSpecifier)) {
      const clause = st.importClause;
      const names: string[] = [];
      let allTypes = clause?.isTypeOnly ?? false;
      if (clause?.name) names.push('default');
      const nb = clause?.namedBindings;
      if (nb && ts.isNamespaceImport(nb)) names.push('*');
      if (nb && ts.isNamedImports(nb)) {
        for (const el of nb.elements) names.push((el.propertyName ?? el.name).text);
        if (!allTypes && nb.elements.length > 0 && !clause?.name) allTypes = nb.elements.every((el) => el.isTypeOnly);
      }
      edge(st.moduleSpecifier.text, names, allTypes && names.length > 0);
    } else if (ts.isExportDeclaration(st)) {
      if (st.moduleSpecifier && ts.isStringLiteral(st.moduleSpecifier)) {
        if (!st.exportClause) {
          exportsStar = true;
          edge(st.moduleSpecifier.text, ['*'], st.isTypeOnly);
        } else if (ts.isNamedExports(st.exportClause)) {
          edge(st.moduleSpecifier.text, st.exportClause.elements.map((el) => (el.propertyName ?? el.name).text), st.isTypeOnly);
          for (const el of st.exportClause.elements) {
            exports.push(el.name.text);
            if (st.isTypeOnly || el.isTypeOnly) typeExports.add(el.name.text);
          }
        }
      } else if (st.exportClause && ts.isNamedExports(st.exportClause)) {
        for (const el of st.exportClause.elements) {
          exports.push(el.name.text);
          if (st.isTypeOnly || el.isTypeOnly) typeExports.add(el.name.text);
        }
      }
    } else if (ts.isExportAssignment(st)) {
      exports.push('default');
    } else if (hasExportModifier(st)) {
      const isDefault = modifiersOf(st).some((m) => m.kind === ts.SyntaxKind.DefaultKeyword);
      if (isDefault) exports.push('default');
      else if (ts.isVariableStatement(st)) {
        for (const d of st.declarationList.declarations) if (ts.isIdentifier(d.name)) exports.push(d.name.text);
      } else if (
        (ts.isFunctionDeclaration(st) || ts.isClassDeclaration(st) || ts.isInterfaceDeclaration(st) ||
          ts.isTypeAliasDeclaration(st) || ts.isEnumDeclaration(st)) && st.name
      ) {
        exports.push(st.name.text);
        if (ts.isInterfaceDeclaration(st) || ts.isTypeAliasDeclaration(st)) typeExports.add(st.name.text);
      }
    }
  }
  // Dynamic imports anywhere in the file: the whole module counts as used.
  const visit = (n: ts.Node) => {
    if (ts.isCallExpression(n) && n.expression.kind === ts.SyntaxKind.ImportKeyword) {
      const arg = n.arguments[0];
      if (arg && ts.isStringLiteralLike(arg)) edge(arg.text, ['*'], false);
    }
    ts.forEachChild(n, visit);
  };
  visit(sf);
  return { file, exports, typeExports, exportsStar, imports };
}

/** The folder right under src/ (the stage) of a source file, or null outside src/. */
export function stageOf(file: string): string | null {
  const m = /^src\/([^/]+)\//.exec(file);
  return m ? m[1] : null;
}

/** Import cycles: strongly connected groups of more than one module (Tarjan), run-time imports only. */
export function findCycles(modules: readonly SourceModule[]): string[][] {
  const next = new Map<string, string[]>();
  for (const m of modules) next.set(m.file, m.imports.filter((e) => !e.typeOnly).map((e) => e.to));
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const onStack = new Set<string>();
  const stack: string[] = [];
  const groups: string[][] = [];
  let counter = 0;
  const connect = (v: string) => {
    index.set(v, counter);
    low.set(v, counter);
    counter++;
    stack.push(v);
    onStack.add(v);
    for (const w of next.get(v) ?? []) {
      if (!index.has(w)) {
        connect(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v)!, index.get(w)!));
    }
    if (low.get(v) === index.get(v)) {
      const group: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        group.push(w);
      } while (w !== v);
      if (group.length > 1) groups.push(group.sort());
    }
  };
  for (const m of modules) if (!index.has(m.file)) connect(m.file);
  return groups;
}

/**
 * Value exports (functions, classes, constants) of `modules` that no other module among `users`
 * imports by name (a namespace or dynamic import counts as using every name). Exported types are
 * left out: a type named in an exported signature is part of that signature even when no other
 * module spells its name. Returns "file: name" strings.
 */
export function findUnusedExports(modules: readonly SourceModule[], users: readonly SourceModule[]): string[] {
  const used = new Map<string, Set<string>>();
  for (const u of users) {
    for (const e of u.imports) {
      if (e.from === e.to) continue;
      let s = used.get(e.to);
      if (!s) used.set(e.to, (s = new Set()));
      for (const n of e.names) s.add(n);
    }
  }
  const out: string[] = [];
  for (const m of modules) {
    const s = used.get(m.file);
    if (s?.has('*')) continue;
    for (const name of m.exports) if (!m.typeExports.has(name) && !s?.has(name)) out.push(`${m.file}: ${name}`);
  }
  return out;
}
