// The numpy peers of the benchmark: which python3 has numpy, and running a peer script.
import { spawnSync } from "node:child_process";
import { join } from "node:path";

export const NUMPY_MISSING =
  "skipped: no python3 with numpy here (Debian: `apt-get install -y python3-numpy`, and `libopenblas0` for an optimised BLAS; the benchmark uses /usr/bin/python3 or python3 on the PATH)";

/** A python3 that imports numpy (Debian's /usr/bin/python3 first), or null. */
export function numpyPython(): string | null {
  for (const python of ["/usr/bin/python3", "python3"]) {
    const r = spawnSync(python, ["-c", "import numpy"], { stdio: "ignore" });
    if (r.status === 0) return python;
  }
  return null;
}

/** Run tests/bench/<script> with python; its stdout (throws with its stderr on failure). */
export function runPeer(python: string, script: string, args: string[], options: { input?: string } = {}): string {
  const r = spawnSync(python, [join(import.meta.dirname, script), ...args], { encoding: "utf8", maxBuffer: 1 << 30, input: options.input });
  if (r.status !== 0) throw new Error(`${script} failed (${r.status ?? r.signal}):\n${r.stderr}`);
  return r.stdout;
}
