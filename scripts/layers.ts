/**
 * The layer table of DEVELOPERS.md as a check: every import in the source tree (static, re-export and dynamic) is
 * resolved to a file and must go to a layer its own layer may import. Type-only imports (`import type`, or every
 * specifier marked `type`) are allowed where the table says "types". Run: `npm run check:layers`; the test command
 * runs it through tests/unit/scripts/layers.test.ts.
 */
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import ts from "typescript";

/** A layer: a folder (`lib/db`) or one file (`lib/errors.ts`), relative to the repository root. */
export interface LayerRule {
  /** Layers whose values (and types) this layer may import. Its own layer is always allowed. */
  values: readonly string[];
  /** Layers this layer may import types from, and nothing else. */
  types?: readonly string[];
}

/** Everything under lib/ that the server side may build on. */
const SERVER_LIB = ["lib/auth", "lib/db", "lib/mail", "lib/library", "lib/scenarios", "lib/parts", "lib/api"] as const;
const PURE_LIB = ["lib/units", "lib/sim", "lib/design", "lib/traces", "lib/shared", "lib/errors.ts"] as const;

/** The table. Keep it and DEVELOPERS.md's "Layout" table in agreement. */
export const LAYERS: Readonly<Record<string, LayerRule>> = {
  "lib/units": { values: [] },
  "lib/errors.ts": { values: [] },
  "lib/shared": { values: [] },
  "lib/sim": { values: ["lib/units"] },
  "lib/design": { values: ["lib/sim", "lib/units", "lib/errors.ts"] },
  "lib/traces": { values: ["lib/design", "lib/sim", "lib/units"] },
  "lib/db": { values: ["knexfile.ts", "lib/db/knex.ts", "lib/errors.ts", "lib/shared"] },
  /** The Knex instance: the query modules use it; the layers above go through them (lib/auth and app/ still may). */
  "lib/db/knex.ts": { values: ["knexfile.ts"] },
  "lib/mail": { values: [] },
  "lib/auth": { values: ["lib/db", "lib/db/knex.ts", "lib/mail", "lib/shared", "lib/errors.ts"] },
  "lib/scenarios": { values: ["lib/db", "lib/design", "lib/shared", "lib/errors.ts"] },
  "lib/parts": { values: ["lib/db", "lib/design", "lib/shared", "lib/errors.ts"] },
  "lib/library": { values: ["lib/db", "lib/mail", "lib/design", "lib/traces", "lib/shared", "lib/errors.ts"] },
  "lib/api": { values: ["lib/auth", "lib/db", "lib/library", "lib/scenarios", "lib/parts", "lib/design", "lib/traces", "lib/shared", "lib/errors.ts"] },
  "lib/workbench": { values: ["lib/design", "lib/sim", "lib/units"], types: ["workers"] },
  workers: { values: ["lib/sim", "lib/design", "lib/units"] },
  components: {
    values: ["lib/units", "lib/design", "lib/traces", "lib/workbench", "lib/shared"],
    types: ["lib/sim", "lib/db", "lib/auth", "lib/library", "lib/parts", "lib/api", "workers"],
  },
  app: { values: [...PURE_LIB, ...SERVER_LIB, "lib/db/knex.ts", "lib/workbench", "components"] },
  "proxy.ts": { values: ["lib/db", "lib/db/knex.ts"] },
  "knexfile.ts": { values: [] },
  db: { values: ["knexfile.ts", "lib/design"] },
  scripts: { values: ["lib/sim", "lib/design"] },
  tests: { values: ["*"] },
};

export interface ImportEdge {
  /** Importing file, relative to the root. */
  from: string;
  /** Imported file, relative to the root. */
  to: string;
  /** The specifier as written. */
  specifier: string;
  typeOnly: boolean;
  line: number;
}

export interface Violation extends ImportEdge {
  fromLayer: string;
  toLayer: string;
}

const SOURCE = /\.(ts|tsx)$/;
const SKIP = new Set(["node_modules", ".next", ".data", ".git"]);

/** The layer a root-relative path belongs to: the longest matching folder or file of the table. */
export function layerOf(path: string): string | null {
  let best: string | null = null;
  for (const key of Object.keys(LAYERS)) {
    if (path === key || path.startsWith(`${key}/`)) {
      if (!best || key.length > best.length) best = key;
    }
  }
  return best;
}

/** The imports of one source text (static imports, re-exports, `import()` and `require()` with a literal). */
export function importsOf(fileName: string, text: string): { specifier: string; typeOnly: boolean; line: number }[] {
  const sf = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, false, fileName.endsWith(".tsx") ? ts.ScriptKind.TSX : ts.ScriptKind.TS);
  const out: { specifier: string; typeOnly: boolean; line: number }[] = [];
  const at = (node: ts.Node) => sf.getLineAndCharacterOfPosition(node.getStart(sf)).line + 1;
  const visit = (node: ts.Node) => {
    if (ts.isImportDeclaration(node) && ts.isStringLiteral(node.moduleSpecifier)) {
      const c = node.importClause;
      // `import "x"` runs x; `import type`, or only `type` specifiers, brings types alone.
      const typeOnly =
        !!c &&
        (c.isTypeOnly ||
          (!c.name &&
            !!c.namedBindings &&
            ts.isNamedImports(c.namedBindings) &&
            c.namedBindings.elements.length > 0 &&
            c.namedBindings.elements.every((e) => e.isTypeOnly)));
      out.push({ specifier: node.moduleSpecifier.text, typeOnly, line: at(node) });
    } else if (ts.isExportDeclaration(node) && node.moduleSpecifier && ts.isStringLiteral(node.moduleSpecifier)) {
      const typeOnly =
        node.isTypeOnly ||
        (!!node.exportClause && ts.isNamedExports(node.exportClause) && node.exportClause.elements.length > 0 && node.exportClause.elements.every((e) => e.isTypeOnly));
      out.push({ specifier: node.moduleSpecifier.text, typeOnly, line: at(node) });
    } else if (ts.isImportEqualsDeclaration(node) && ts.isExternalModuleReference(node.moduleReference) && ts.isStringLiteral(node.moduleReference.expression)) {
      out.push({ specifier: node.moduleReference.expression.text, typeOnly: node.isTypeOnly, line: at(node) });
    } else if (ts.isCallExpression(node) && node.arguments.length >= 1 && ts.isStringLiteralLike(node.arguments[0]!)) {
      const isImport = node.expression.kind === ts.SyntaxKind.ImportKeyword;
      const isRequire = ts.isIdentifier(node.expression) && node.expression.text === "require";
      if (isImport || isRequire) out.push({ specifier: (node.arguments[0] as ts.StringLiteralLike).text, typeOnly: false, line: at(node) });
    } else if (ts.isImportTypeNode(node) && ts.isLiteralTypeNode(node.argument) && ts.isStringLiteral(node.argument.literal)) {
      out.push({ specifier: node.argument.literal.text, typeOnly: true, line: at(node) });
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return out;
}

/** The repository file a specifier names (`@/…` or relative), or null for a package. */
export function resolveSpecifier(root: string, fromFile: string, specifier: string, exists: (p: string) => boolean = existsSync): string | null {
  let base: string;
  if (specifier.startsWith("@/")) base = join(root, specifier.slice(2));
  else if (specifier.startsWith("./") || specifier.startsWith("../")) base = resolve(dirname(join(root, fromFile)), specifier);
  else return null;
  const candidates = [base, `${base}.ts`, `${base}.tsx`, `${base}.json`, join(base, "index.ts"), join(base, "index.tsx")];
  const hit = candidates.find((c) => (SOURCE.test(c) || c.endsWith(".json")) && exists(c)) ?? base;
  return relative(root, hit).split("\\").join("/");
}

/** True when `fromLayer` may import `toLayer` (a type-only import when `typeOnly`). */
export function allowed(fromLayer: string, toLayer: string, typeOnly: boolean): boolean {
  if (fromLayer === toLayer) return true;
  const rule = LAYERS[fromLayer];
  if (!rule) return false;
  if (rule.values.includes("*") || rule.values.includes(toLayer)) return true;
  return typeOnly && !!rule.types?.includes(toLayer);
}

/** Checks a set of edges against the table. An import into a path outside every layer is a violation too. */
export function violations(edges: readonly ImportEdge[]): Violation[] {
  const out: Violation[] = [];
  for (const e of edges) {
    const fromLayer = layerOf(e.from);
    if (!fromLayer) continue; // files outside the table (config files at the root) are not checked
    const toLayer = layerOf(e.to) ?? e.to;
    if (!allowed(fromLayer, toLayer, e.typeOnly)) out.push({ ...e, fromLayer, toLayer });
  }
  return out;
}

function sourceFiles(root: string, dir = ""): string[] {
  const out: string[] = [];
  for (const name of readdirSync(join(root, dir))) {
    if (SKIP.has(name) || name.startsWith(".next")) continue;
    const rel = dir ? `${dir}/${name}` : name;
    const st = statSync(join(root, rel));
    if (st.isDirectory()) out.push(...sourceFiles(root, rel));
    else if (SOURCE.test(name) && !name.endsWith(".d.ts")) out.push(rel);
  }
  return out;
}

/** Every import edge between files of the repository at `root`. */
export function importGraph(root: string): ImportEdge[] {
  const edges: ImportEdge[] = [];
  for (const from of sourceFiles(root)) {
    for (const imp of importsOf(from, readFileSync(join(root, from), "utf8"))) {
      const to = resolveSpecifier(root, from, imp.specifier);
      if (to) edges.push({ from, to, ...imp });
    }
  }
  return edges;
}

export function describe(v: Violation): string {
  return `${v.from}:${v.line} imports ${v.typeOnly ? "types from " : ""}${v.to} ("${v.specifier}"): ${v.fromLayer} may not import ${v.toLayer}`;
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(new URL(import.meta.url).pathname)) {
  const root = resolve(dirname(new URL(import.meta.url).pathname), "..");
  const found = violations(importGraph(root));
  for (const v of found) console.error(describe(v));
  console.log(found.length ? `layers: ${found.length} import(s) cross a layer the table forbids` : "layers: every import keeps to the table");
  process.exit(found.length ? 1 : 0);
}
