// What `npm run analyze` runs: the command line (analyze.ts) from a bundle that esbuild builds on
// demand, so that no start pays for compiling TypeScript. Plain JavaScript because Node 20 cannot
// run TypeScript itself. The bundle is rebuilt whenever any file it was built from (the app's
// sources and the packages it bundles, as esbuild's metafile lists them) has changed since, or
// esbuild or Node is another version; otherwise starting costs a stat of each of those files.
// SPANWRIGHT_CLI_CACHE moves the bundle's folder (default node_modules/.cache/spanwright-cli).
import { mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = resolve(dirname(fileURLToPath(import.meta.url)), "..", "..");
const entry = join(root, "app", "cli", "analyze.ts");
const cache = resolve(process.env.SPANWRIGHT_CLI_CACHE || join(root, "node_modules", ".cache", "spanwright-cli"));
const bundle = join(cache, "analyze.mjs");
const manifestFile = join(cache, "manifest.json");

function esbuildVersion() {
  return JSON.parse(readFileSync(join(root, "node_modules", "esbuild", "package.json"), "utf8")).version;
}

/** The stamp of a file: its size and modification time, or null when it is gone. */
function stamp(file) {
  try {
    const s = statSync(file);
    return `${s.size}:${s.mtimeMs}`;
  } catch {
    return null;
  }
}

function isFresh() {
  let manifest;
  try {
    manifest = JSON.parse(readFileSync(manifestFile, "utf8"));
  } catch {
    return false;
  }
  if (manifest.node !== process.version || manifest.esbuild !== esbuildVersion() || stamp(bundle) !== manifest.bundle) return false;
  for (const [file, was] of Object.entries(manifest.inputs)) if (stamp(join(root, file)) !== was) return false;
  return true;
}

async function rebuild() {
  const { build } = await import("esbuild");
  mkdirSync(cache, { recursive: true });
  // Another start may build at the same time: each writes its own file and renames it into place.
  const tmp = `${bundle}.${process.pid}.tmp`;
  const result = await build({
    entryPoints: [entry],
    outfile: tmp,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    absWorkingDir: root,
    metafile: true,
    logLevel: "error",
    banner: { js: "// Built by app/cli/launch.mjs from app/cli/analyze.ts; rebuilt when a source changes. Do not edit." },
  });
  const inputs = {};
  for (const file of Object.keys(result.metafile.inputs)) inputs[file] = stamp(join(root, file));
  renameSync(tmp, bundle);
  const manifest = { node: process.version, esbuild: esbuildVersion(), bundle: stamp(bundle), inputs };
  writeFileSync(`${manifestFile}.${process.pid}.tmp`, JSON.stringify(manifest));
  renameSync(`${manifestFile}.${process.pid}.tmp`, manifestFile);
}

if (!isFresh()) await rebuild();
await import(pathToFileURL(bundle).href);
