import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { describe, expect, it } from "vitest";

/*
 * The layers of the app, as docs/architecture.md draws them, checked on every import of every
 * module under app/ (the engine's own purity test is app/engine/architecture.test.ts). A layer may
 * import from the layers listed for it and nothing else, so an import that points upward, a route
 * that reads the database, or a browser module that pulls in server code fails here with the file
 * and the import named.
 */

const APP = __dirname;

type Layer = "entry" | "routes" | "auth" | "services" | "reports" | "jobs" | "db" | "ui" | "domain" | "exchange" | "engine" | "utils" | "stand-ins";

/** Which layer a module (path relative to app/) belongs to. */
function layerOf(file: string): Layer {
  // The local stand-in services (PostgreSQL, S3, mail capture, sign-in) run before the app and import none of it.
  if (file.startsWith("server/dev-services/")) return "stand-ins";
  if (/^(server|cli)\//.test(file) || file === "jobs/workers.server.ts" || file === "demo/seed.server.ts" || file === "entry.server.tsx" || file === "routes.ts") return "entry";
  if (file.startsWith("routes/") || file === "root.tsx" || file === "entry.client.tsx") return "routes";
  if (file.startsWith("auth/")) return "auth";
  if (file.startsWith("services/")) return "services";
  if (file.startsWith("reports/")) return "reports";
  if (file.startsWith("jobs/")) return "jobs";
  if (file.startsWith("db/")) return "db";
  if (file.startsWith("components/") || file.startsWith("charts/")) return "ui";
  if (file.startsWith("domain/") || file.startsWith("demo/")) return "domain";
  if (file.startsWith("exchange/")) return "exchange";
  if (file.startsWith("engine/")) return "engine";
  if (file.startsWith("utils/")) return "utils";
  throw new Error(`${file} belongs to no layer: add its folder to app/architecture.test.ts and docs/architecture.md`);
}

/**
 * What each layer may import at run time, top to bottom. Routes talk HTTP and reach data only
 * through auth and services; auth sits above the services (it asks them, they never ask it);
 * services own data and rules over the database, the engine, the PDF renderer and the job queue.
 */
const MAY_IMPORT: Record<Layer, readonly Layer[]> = {
  entry: ["entry", "routes", "auth", "services", "reports", "jobs", "db", "ui", "domain", "exchange", "engine", "utils", "stand-ins"],
  routes: ["routes", "auth", "services", "ui", "domain", "exchange", "utils"],
  auth: ["auth", "services", "db", "domain", "utils"],
  services: ["services", "reports", "jobs", "db", "domain", "exchange", "engine", "utils", "stand-ins"],
  // The report embeds the case and result documents, written by the exchange format's own serialiser.
  reports: ["reports", "ui", "domain", "exchange", "utils"],
  jobs: ["jobs", "utils"],
  db: ["db", "domain", "utils"],
  ui: ["ui", "domain", "utils"],
  domain: ["domain", "exchange", "engine"],
  exchange: ["exchange", "engine"],
  engine: ["engine"],
  utils: ["utils", "domain"],
  "stand-ins": [],
};

/** Types of the contract and the engine may be named anywhere above them; their code runs in services. */
const TYPES_MAY_ALSO: Partial<Record<Layer, readonly Layer[]>> = {
  routes: ["engine"],
  reports: ["exchange", "engine"],
  ui: ["exchange", "engine"],
};

/** Constants of the engine the pages show as they are: the version stamped on every result, the lattice's default strips. */
const ROUTE_ENGINE_VALUES = new Set(["ENGINE_VERSION", "VORTEX_LATTICE_DEFAULT_STRIPS"]);

/** Packages that speak to PostgreSQL: only the layers that own data may import them. */
const DATABASE_PACKAGES = /^(drizzle-orm|pg|pg-boss)(\/|$)/;
const MAY_USE_DATABASE: readonly Layer[] = ["entry", "auth", "services", "jobs", "db", "stand-ins"];

interface Import {
  spec: string;
  typeOnly: boolean;
  names: string[];
}

const IMPORT = /(?:^|\n)\s*(import|export)\s+(type\s+)?([^;]*?)\s*from\s*["']([^"']+)["']|import\(\s*["']([^"']+)["']\s*\)/g;

function importsOf(source: string): Import[] {
  const out: Import[] = [];
  for (const m of source.matchAll(IMPORT)) {
    if (m[5]) {
      out.push({ spec: m[5], typeOnly: false, names: [] });
      continue;
    }
    const clause = m[3] ?? "";
    const braces = /\{([^}]*)\}/.exec(clause)?.[1];
    const names = braces ? braces.split(",").map((n) => n.trim()).filter(Boolean) : [];
    const hasDefault = braces === undefined ? clause.trim() !== "" : clause.replace(/\{[^}]*\}/, "").replace(",", "").trim() !== "";
    const allTyped = names.length > 0 && names.every((n) => n.startsWith("type ")) && !hasDefault;
    out.push({ spec: m[4]!, typeOnly: Boolean(m[2]) || allTyped, names: names.map((n) => n.replace(/^type\s+/, "").split(/\s+as\s+/)[0]!) });
  }
  return out;
}

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    if (statSync(p).isDirectory()) return f === "node_modules" ? [] : sourceFiles(p);
    return /\.(ts|tsx)$/.test(f) && !/\.test\.tsx?$/.test(f) && !f.endsWith(".d.ts") ? [p] : [];
  });
}

/** The app module an import names, relative to app/, or null for a package or generated types. */
function resolveImport(from: string, spec: string): string | null {
  let base: string;
  if (spec.startsWith("~/")) base = join(APP, spec.slice(2));
  else if (spec.startsWith("./") || spec.startsWith("../")) base = resolve(dirname(from), spec);
  else return null;
  // Generated route types, and files read as text or data (?raw, .json), are not modules of the app.
  if (spec.includes("+types/") || spec.includes("?") || spec.endsWith(".json") || !resolve(base).startsWith(APP)) return null;
  for (const candidate of [base, `${base}.ts`, `${base}.tsx`, join(base, "index.ts")]) {
    if (existsSync(candidate) && statSync(candidate).isFile()) return relative(APP, candidate);
  }
  throw new Error(`${relative(APP, from)}: cannot resolve ${spec}`);
}

// Route modules are the files app/routes.ts names: the framework keeps their server exports out of
// the browser. Every other module outside *.server files may reach the browser.
const ROUTE_MODULES = new Set([...readFileSync(join(APP, "routes.ts"), "utf8").matchAll(/["'](routes\/[^"']+\.tsx?)["']/g)].map((m) => m[1]!).concat("root.tsx"));
const runsOnServerOnly = (file: string) => /\.server\.tsx?$/.test(file) || ROUTE_MODULES.has(file) || layerOf(file) === "entry" || file.startsWith("server/");

const files = sourceFiles(APP).map((abs) => ({ abs, file: relative(APP, abs) }));
const graph = new Map(files.map(({ abs, file }) => [file, importsOf(readFileSync(abs, "utf8")).map((i) => ({ ...i, target: resolveImport(abs, i.spec) }))]));

describe("the layers point one way", () => {
  it("finds the modules of every layer", () => {
    const layers = new Set(files.map((f) => layerOf(f.file)));
    for (const l of Object.keys(MAY_IMPORT)) expect(layers, l).toContain(l);
  });

  it.each(files.map((f) => [f.file]))("%s imports only from the layers below it", (file) => {
    const from = layerOf(file);
    const bad: string[] = [];
    for (const i of graph.get(file)!) {
      if (i.target === null) {
        if (DATABASE_PACKAGES.test(i.spec) && !i.typeOnly && !MAY_USE_DATABASE.includes(from)) bad.push(`${i.spec} (the database, from the ${from} layer)`);
        continue;
      }
      const to = layerOf(i.target);
      if (MAY_IMPORT[from].includes(to)) continue;
      if (i.typeOnly && TYPES_MAY_ALSO[from]?.includes(to)) continue;
      if (from === "routes" && to === "engine" && i.names.length > 0 && i.names.every((n) => ROUTE_ENGINE_VALUES.has(n) || i.typeOnly)) continue;
      bad.push(`${i.spec} (${to}, from the ${from} layer)`);
    }
    expect(bad).toEqual([]);
  });

  it("no route module or route helper reads the database", () => {
    const reading = [...graph.entries()].filter(([file]) => file.startsWith("routes/")).flatMap(([file, imports]) => imports.filter((i) => (i.target ?? "").startsWith("db/") || DATABASE_PACKAGES.test(i.spec)).map((i) => `${file}: ${i.spec}`));
    expect(reading).toEqual([]);
  });

  it("no module that may reach the browser imports server-only code", () => {
    const leaks = [...graph.entries()]
      .filter(([file]) => !runsOnServerOnly(file))
      .flatMap(([file, imports]) => imports.filter((i) => !i.typeOnly && i.target !== null && runsOnServerOnly(i.target) && !ROUTE_MODULES.has(i.target)).map((i) => `${file}: ${i.spec}`));
    expect(leaks).toEqual([]);
  });

  it("has no import cycle between modules", () => {
    const runtime = new Map([...graph.entries()].map(([file, imports]) => [file, imports.filter((i) => !i.typeOnly && i.target !== null && !i.spec.startsWith("import(")).map((i) => i.target!)]));
    const cycles: string[] = [];
    const state = new Map<string, "open" | "done">();
    const visit = (file: string, path: string[]) => {
      if (state.get(file) === "done") return;
      if (state.get(file) === "open") {
        cycles.push([...path.slice(path.indexOf(file)), file].join(" → "));
        return;
      }
      state.set(file, "open");
      for (const next of runtime.get(file) ?? []) visit(next, [...path, file]);
      state.set(file, "done");
    };
    for (const file of runtime.keys()) visit(file, []);
    expect(cycles).toEqual([]);
  });
});

describe("route modules read in the same order", () => {
  // docs/DEVELOPERS.md: middleware → loader → action → default component → local components → meta → ErrorBoundary.
  const HOUSE_ORDER = ["middleware", "loader", "action", "default", "meta", "ErrorBoundary"];
  const EXPORT = /^export\s+(?:(default)\b|(?:async\s+)?(?:function|const)\s+(\w+))/gm;

  it.each([...ROUTE_MODULES].filter((f) => f.startsWith("routes/")).map((f) => [f]))("%s exports in the house order", (file) => {
    const names = [...readFileSync(join(APP, file), "utf8").matchAll(EXPORT)].map((m) => m[1] ?? m[2]!).filter((n) => HOUSE_ORDER.includes(n));
    expect(names).toEqual([...names].sort((a, b) => HOUSE_ORDER.indexOf(a) - HOUSE_ORDER.indexOf(b)));
  });
});

describe("one way to do each thing", () => {
  it("casts nothing to never: types say what a value is", () => {
    const casting = files.filter(({ abs }) => /\bas never\b/.test(readFileSync(abs, "utf8"))).map(({ file }) => file);
    expect(casting).toEqual([]);
  });

  it("builds no case path by hand: href() checks it against app/routes.ts", () => {
    const handBuilt = files.filter(({ abs }) => /\/cases\/\$\{/.test(readFileSync(abs, "utf8"))).map(({ file }) => file);
    expect(handBuilt).toEqual([]);
  });

  it("gives every page of a case its own error boundary, so a refusal is said inside the case frame", () => {
    const casePages = [...ROUTE_MODULES].filter((f) => /^routes\/cases\/.+\.tsx$/.test(f) && !["routes/cases/list.tsx", "routes/cases/new.tsx"].includes(f));
    expect(casePages.length).toBeGreaterThan(10);
    const without = casePages.filter((f) => !/^export function ErrorBoundary\(/m.test(readFileSync(join(APP, f), "utf8")));
    expect(without).toEqual([]);
  });
});
