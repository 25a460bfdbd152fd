// Browser benchmark of the production app (not a timed test): starts `tsx app/server/start.ts` with
// its own data folder and ports, signs in as the demo engineer in Debian's Chromium (playwright-core),
// imports a copy of the demo case with 100 000 load cases and waits for its results, then loads each
// page of a case — the demo case and the large one — in a fresh browser context, recording the bytes
// transferred and the time to interactive, and writes its section of docs/benchmarks.md.
// The peer page of the load benchmark (tests/bench/peer: the same framework, a table and a 20-row
// history) is loaded the same way, on the app's database, as the floor of this machine and browser.
// `npm run bench` runs it after the others; alone: `npx tsx tests/bench/browser.ts [--rounds 3]`;
// `--only demo` (or `large`), `--pages envelope,review` and `--first-only` (no return visits) measure a part and only print it.
// BROWSER_BENCH_PORT_BASE moves its ports (default 3400) so that it can run beside other checkouts;
// BROWSER_BENCH_ORIGIN measures an app already running there instead (its large case imported once;
// the peer page only where BROWSER_BENCH_DATABASE_URL names that app's database).
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import os from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { chromium, type Browser, type BrowserContext, type CDPSession, type Page } from "playwright-core";
import { DEMO_USERS } from "../../app/demo/scenario";
import { CHROMIUM_ARGS, CHROMIUM_PATH } from "../chromium";
import { benchApp, root, writeDocsSection } from "./bench-app";

const arg = (name: string) => {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : undefined;
};
const ROUNDS = Number(arg("--rounds") ?? 3);
const ONLY = arg("--only") as "demo" | "large" | undefined;
const PAGE_KEYS = arg("--pages")?.split(",");
/** First visits only: no return visits, reloads or steps opened from the rail (two builds compared quickly). */
const FIRST_ONLY = process.argv.includes("--first-only");
/** A part of the benchmark is printed, not written into docs/benchmarks.md. */
const PARTIAL = ONLY !== undefined || PAGE_KEYS !== undefined || FIRST_ONLY;
const BASE = Number(process.env.BROWSER_BENCH_PORT_BASE ?? 3400);
const RUNNING = process.env.BROWSER_BENCH_ORIGIN;
const ORIGIN = RUNNING ?? `http://127.0.0.1:${BASE}`;
const LARGE_CASES = 100_000;
const LARGE_REFERENCE = "TN-BENCH-100K";
/** Targets: issue 14 (a page of a 100 000-case case) and issue 10, item 8 (one person on the demo case). */
const LARGE_BYTES_TARGET = 1_000_000;
const LARGE_TTI_TARGET_MS = 1000;
const DEMO_TTI_TARGET_MS = 500;
const DEMO_TTI_PAGES = ["envelope", "distribution"];
/** After hydration, a page counts as settled once no request has been in flight for this long (its data fetched). */
const QUIET_MS = 1000;
const SETTLE_LIMIT_MS = 120_000;
const MARK_START = "<!-- browser benchmark: written by tests/bench/browser.ts -->";
const MARK_END = "<!-- end of browser benchmark -->";

const ALL_PAGES = [
  { key: "overview", path: "" },
  { key: "basis", path: "/basis" },
  { key: "planform", path: "/planform" },
  { key: "sections", path: "/sections" },
  { key: "masses", path: "/masses" },
  { key: "envelope", path: "/envelope" },
  { key: "distribution", path: "/distribution" },
  { key: "loads", path: "/loads" },
  { key: "review", path: "/review" },
  { key: "reports", path: "/reports" },
] as const;
const PAGES = ALL_PAGES.filter((p) => !PAGE_KEYS || PAGE_KEYS.includes(p.key));

function say(line: string) {
  process.stdout.write(`[browser] ${line}\n`);
}

const loadAverage = () => os.loadavg().map((v) => v.toFixed(2)).join(" / ");

// ---------------------------------------------------------------------------------------------
// The app under test (none started where BROWSER_BENCH_ORIGIN names a running one)

const app = benchApp("browser", { port: BASE, pg: BASE + 51_069, s3: BASE + 1_199, smtp: BASE - 655, oidc: BASE + 1_210 }, say);
const startApp = (): Promise<number> => (RUNNING ? Promise.resolve(0) : app.start());

// ---------------------------------------------------------------------------------------------
// The browser

/**
 * Runs in the page before its own scripts: notes (in ms since navigation start) when the page has
 * hydrated — root.tsx marks html[data-hydrated]; the peer page, which has no marker, when React has
 * attached its props to the heading (looked for at each frame) — and when the first click reaches
 * the document, which happens only once the main thread is free to handle it. `ready` resolves with
 * the heading's centre at hydration, `clickedAt` with the click's time. The benchmark reads them
 * through CDP alone: Playwright's own helpers (waitForFunction) would compile its injected script,
 * some hundred kilobytes, on the page's main thread as the page hydrates.
 */
const pageProbe = (ready: Ready) => `
  const bench = (window.__bench = { hydrated: null, clicked: null });
  const centre = () => {
    const r = document.querySelector("main h1")?.getBoundingClientRect();
    return r ? { x: r.x + r.width / 2, y: r.y + r.height / 2 } : null;
  };
  bench.ready = new Promise((resolve) => {
    const done = () => {
      bench.hydrated = performance.now();
      resolve(centre());
    };
    if (${JSON.stringify(ready)} === "marker") {
      new MutationObserver((_, observer) => {
        if (document.documentElement.dataset.hydrated && bench.hydrated === null) {
          observer.disconnect();
          done();
        }
      }).observe(document, { attributes: true, subtree: true, attributeFilter: ["data-hydrated"] }); // <html> does not exist yet
    } else {
      const look = () => {
        const h = document.querySelector("main h1");
        if (h && Object.keys(h).some((k) => k.startsWith("__reactProps$"))) done();
        else requestAnimationFrame(look);
      };
      requestAnimationFrame(look);
    }
  });
  bench.clickedAt = new Promise((resolve) => {
    document.addEventListener("click", () => {
      if (bench.clicked === null) resolve((bench.clicked = performance.now()));
    }, true);
  });
`;

interface PageRun {
  /** The document's HTTP status. */
  status: number;
  /** Bytes on the wire (compressed bodies and headers) of every request from navigation until settled. */
  bytes: number;
  requests: number;
  /** Of those, the document's own bytes. */
  documentBytes: number;
  hydratedMs: number;
  /** Time to interactive: navigation start until a click sent at hydration is handled. */
  ttiMs: number;
  /** Navigation start until no request has been in flight for QUIET_MS (the page's data fetched). */
  settledMs: number;
  settled: boolean;
  /** Where the time to interactive went (milestones on the page's clock, main-thread time up to the click). */
  parts: Parts;
}

/** Milestones in ms since navigation start, and the renderer's main-thread time (ms) spent until the click. */
interface Parts {
  /** The document's first byte (server time and the request). */
  ttfb: number;
  /** The document's last byte. */
  documentEnd: number;
  /** The last script and the stylesheet fetched (responseEnd of the latest), and their bytes (decoded). */
  scriptsEnd: number;
  scriptKiB: number;
  cssEnd: number;
  /** The last font file fetched before the click (NaN: none). */
  fontsEnd: number;
  fonts: number;
  firstPaint: number;
  /** DOMContentLoaded: the module scripts have run (React Router's entry has started hydration). */
  domContentLoaded: number;
  /** Chrome's own counters (CDP Performance.getMetrics) at the click. */
  scriptMs: number;
  compileMs: number;
  styleLayoutMs: number;
  taskMs: number;
}

/** How the benchmark knows a page has hydrated: our root's marker, or (the peer page has none) React's props on its heading. */
type Ready = "marker" | "react";

async function measurePage(browser: Browser, storageState: Awaited<ReturnType<BrowserContext["storageState"]>>, url: string, ready: Ready = "marker"): Promise<PageRun> {
  // A fresh context each time: an empty cache, as for a first visit; the session cookie only.
  const context = await browser.newContext({ storageState, viewport: { width: 1280, height: 800 } });
  try {
    const page = await context.newPage();
    await page.addInitScript(pageProbe(ready));
    const cdp = await context.newCDPSession(page);
    await cdp.send("Network.enable");
    await cdp.send("Network.setCacheDisabled", { cacheDisabled: false });
    await cdp.send("Performance.enable");
    const inFlight = new Set<string>();
    let bytes = 0;
    let requests = 0;
    let documentBytes = 0;
    let documentId: string | null = null;
    let status = 0;
    let lastActivity = 0;
    cdp.on("Network.requestWillBeSent", (e) => {
      inFlight.add(e.requestId);
      requests++;
      if (e.type === "Document" && documentId === null) documentId = e.requestId;
      lastActivity = performance.now();
    });
    cdp.on("Network.responseReceived", (e) => {
      if (e.requestId === documentId) status = e.response.status;
    });
    cdp.on("Network.loadingFinished", (e) => {
      inFlight.delete(e.requestId);
      bytes += e.encodedDataLength;
      if (e.requestId === documentId) documentBytes = e.encodedDataLength;
      lastActivity = performance.now();
    });
    cdp.on("Network.loadingFailed", (e) => {
      inFlight.delete(e.requestId);
      lastActivity = performance.now();
    });
    const started = performance.now();
    const probe = await interactive(page, cdp, url).catch((error: unknown) => {
      // A page that is not interactive within the limit is recorded as such, with what it had transferred.
      if (error instanceof Error && error.name === "TimeoutError") return { hydrated: Infinity, clicked: Infinity, parts: NO_PARTS };
      throw error;
    });
    let settled = false;
    while (Number.isFinite(probe.clicked) && performance.now() - started < SETTLE_LIMIT_MS) {
      if (inFlight.size === 0 && performance.now() - lastActivity >= QUIET_MS) {
        settled = true;
        break;
      }
      await new Promise((r) => setTimeout(r, 100));
    }
    return {
      status,
      bytes,
      requests,
      documentBytes,
      hydratedMs: probe.hydrated,
      ttiMs: probe.clicked,
      settledMs: (settled ? lastActivity : performance.now()) - started,
      settled,
      parts: probe.parts,
    };
  } finally {
    await context.close();
  }
}

const NO_PARTS: Parts = { ttfb: NaN, documentEnd: NaN, scriptsEnd: NaN, scriptKiB: NaN, cssEnd: NaN, fontsEnd: NaN, fonts: NaN, firstPaint: NaN, domContentLoaded: NaN, scriptMs: NaN, compileMs: NaN, styleLayoutMs: NaN, taskMs: NaN };

/** Read in the page after the click: its navigation and resource timings. */
const MILESTONES = `(() => {
  const bench = window.__bench;
  const nav = performance.getEntriesByType("navigation")[0];
  const resources = performance.getEntriesByType("resource").filter((r) => r.responseEnd <= bench.clicked);
  const last = (rs) => (rs.length ? Math.max(...rs.map((r) => r.responseEnd)) : NaN);
  const scripts = resources.filter((r) => /\\.m?js(\\?|$)/.test(r.name));
  const fonts = resources.filter((r) => /\\.woff2?(\\?|$)/.test(r.name));
  return {
    hydrated: bench.hydrated,
    clicked: bench.clicked,
    ttfb: nav.responseStart,
    documentEnd: nav.responseEnd,
    scriptsEnd: last(scripts),
    scriptKiB: scripts.reduce((a, r) => a + r.decodedBodySize, 0) / 1024,
    cssEnd: last(resources.filter((r) => /\\.css(\\?|$)/.test(r.name))),
    fontsEnd: last(fonts),
    fonts: fonts.length,
    firstPaint: performance.getEntriesByName("first-contentful-paint")[0]?.startTime ?? NaN,
    domContentLoaded: nav.domContentLoadedEventEnd,
  };
})()`;

/** Loads the page; when it says it has hydrated, clicks it: both moments on the page's own clock. */
async function interactive(page: Page, cdp: CDPSession, url: string): Promise<{ hydrated: number; clicked: number; parts: Parts }> {
  await page.goto(url, { waitUntil: "commit", timeout: SETTLE_LIMIT_MS });
  const inPage = async <T,>(expression: string): Promise<T> => {
    const r = (await cdp.send("Runtime.evaluate", { expression, awaitPromise: true, returnByValue: true })) as { result: { value?: T }; exceptionDetails?: { text: string } };
    if (r.exceptionDetails) throw new Error(`in the page: ${r.exceptionDetails.text}`);
    return r.result.value as T;
  };
  const within = <T,>(p: Promise<T>) =>
    Promise.race([p, new Promise<never>((_, reject) => setTimeout(() => reject(Object.assign(new Error("not interactive in time"), { name: "TimeoutError" })), SETTLE_LIMIT_MS))]);
  // Where the page's heading is, once the page says it has hydrated (the probe may not be there the instant the document commits)…
  const at = await within(inPage<{ x: number; y: number } | null>("new Promise((r) => { const go = () => (window.__bench ? window.__bench.ready.then(r) : setTimeout(go, 5)); go(); })"));
  if (!at) throw new Error(`${url}: no heading (main h1) to click`);
  // …and a click there (it does nothing), sent as real input: the page handles it when its main thread is free.
  await cdp.send("Input.dispatchMouseEvent", { type: "mousePressed", x: at.x, y: at.y, button: "left", clickCount: 1 });
  await cdp.send("Input.dispatchMouseEvent", { type: "mouseReleased", x: at.x, y: at.y, button: "left", clickCount: 1 });
  await within(inPage<number>("window.__bench.clickedAt"));
  const metrics = Object.fromEntries(((await cdp.send("Performance.getMetrics")) as { metrics: { name: string; value: number }[] }).metrics.map((m) => [m.name, m.value]));
  const seen = await inPage<Omit<Parts, "scriptMs" | "compileMs" | "styleLayoutMs" | "taskMs"> & { hydrated: number; clicked: number }>(MILESTONES);
  const ms = (name: string) => (metrics[name] ?? NaN) * 1000;
  const { hydrated, clicked, ...read } = seen;
  // A missing milestone (no stylesheet, no font) comes back through JSON as null.
  const rest = Object.fromEntries(Object.entries(read).map(([k, v]) => [k, v ?? NaN])) as typeof read;
  return {
    hydrated,
    clicked,
    parts: { ...rest, scriptMs: ms("ScriptDuration"), compileMs: ms("V8CompileDuration"), styleLayoutMs: ms("RecalcStyleDuration") + ms("LayoutDuration"), taskMs: ms("TaskDuration") },
  };
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2;
};

interface PageFigures {
  key: string;
  statuses: number[];
  bytes: number;
  documentBytes: number;
  requests: number;
  hydratedMs: number;
  ttiMs: number;
  settledMs: number;
  allSettled: boolean;
  parts: Parts;
}

interface Target {
  key: string;
  url: string;
  ready?: Ready;
}

async function measurePages(browser: Browser, storageState: Awaited<ReturnType<BrowserContext["storageState"]>>, targets: Target[], label: string): Promise<PageFigures[]> {
  const out: PageFigures[] = [];
  for (const p of targets) {
    // One load first (the server's own caches warm, as for the person who opened the case before);
    // a page not interactive within the limit even then is recorded from that load alone.
    const warm = await measurePage(browser, storageState, p.url, p.ready);
    const runs: PageRun[] = Number.isFinite(warm.ttiMs) ? [] : [warm];
    for (let i = runs.length ? ROUNDS : 0; i < ROUNDS; i++) runs.push(await measurePage(browser, storageState, p.url, p.ready));
    const f: PageFigures = {
      key: p.key,
      statuses: [...new Set(runs.map((r) => r.status))],
      bytes: median(runs.map((r) => r.bytes)),
      documentBytes: median(runs.map((r) => r.documentBytes)),
      requests: median(runs.map((r) => r.requests)),
      hydratedMs: median(runs.map((r) => r.hydratedMs)),
      ttiMs: median(runs.map((r) => r.ttiMs)),
      settledMs: median(runs.map((r) => r.settledMs)),
      allSettled: runs.every((r) => r.settled),
      parts: Object.fromEntries(Object.keys(NO_PARTS).map((k) => [k, median(runs.map((r) => r.parts[k as keyof Parts]))])) as unknown as Parts,
    };
    const t = f.parts;
    say(`${label} ${p.key}: HTTP ${f.statuses.join(", ")}, ${(f.bytes / 1024).toFixed(0)} KiB in ${f.requests} requests, hydrated ${f.hydratedMs.toFixed(0)} ms, interactive ${f.ttiMs.toFixed(0)} ms, settled ${f.settledMs.toFixed(0)} ms (load ${loadAverage()})`);
    say(`  first byte ${t.ttfb.toFixed(0)}, css ${t.cssEnd.toFixed(0)}, scripts ${t.scriptsEnd.toFixed(0)} (${t.scriptKiB.toFixed(0)} KiB), paint ${t.firstPaint.toFixed(0)}, DOMContentLoaded ${t.domContentLoaded.toFixed(0)}, fonts ${t.fonts} by ${t.fontsEnd.toFixed(0)}; main thread: script ${t.scriptMs.toFixed(0)}, compile ${t.compileMs.toFixed(0)}, style+layout ${t.styleLayoutMs.toFixed(0)}, all tasks ${t.taskMs.toFixed(0)} ms`);
    out.push(f);
  }
  return out;
}

const caseTargets = (caseId: string): Target[] => PAGES.map((p) => ({ key: p.key, url: `${ORIGIN}/cases/${caseId}${p.path}` }));

// ---------------------------------------------------------------------------------------------
// The visits a person makes once the app is known to the browser: a return visit (the page loaded
// again with the browser's cache and compiled code from earlier visits) and a step opened from the
// case's rail (React Router fetches the page's data and code and renders it in the same document)

interface VisitRun {
  /** Navigation start (return) or the link's mousedown (link) until a click on the new page's heading is handled. */
  ttiMs: number;
  /** Bytes on the wire from that moment until the click. */
  bytes: number;
  requests: number;
}

/** In the page, before the link is pressed: resolves with the new heading's centre once the new route shows. */
const linkProbe = (pathname: string) => `(() => {
  const old = document.querySelector("main h1");
  const bench = (window.__visit = { pressed: null, shown: null, clicked: null });
  document.addEventListener("mousedown", () => { if (bench.pressed === null) bench.pressed = performance.now(); }, { capture: true, once: true });
  bench.ready = new Promise((resolve) => {
    const look = () => {
      const h = document.querySelector("main h1");
      if (location.pathname === ${JSON.stringify(pathname)} && h && h !== old) {
        bench.shown = performance.now();
        const r = h.getBoundingClientRect();
        resolve({ x: r.x + r.width / 2, y: r.y + r.height / 2 });
      } else requestAnimationFrame(look);
    };
    requestAnimationFrame(look);
  });
  bench.clickedAt = bench.ready.then(() => new Promise((resolve) => {
    document.addEventListener("click", () => resolve((bench.clicked = performance.now())), { capture: true, once: true });
  }));
  const a = document.querySelector('a[href=' + JSON.stringify(${JSON.stringify(pathname)}) + ']');
  if (!a) return null;
  a.scrollIntoView({ block: "center" });
  const r = a.getBoundingClientRect();
  return { x: r.x + r.width / 2, y: r.y + r.height / 2 };
})()`;

async function clickAt(cdp: CDPSession, at: { x: number; y: number }) {
  await cdp.send("Input.dispatchMouseEvent", { type: "mousePressed", x: at.x, y: at.y, button: "left", clickCount: 1 });
  await cdp.send("Input.dispatchMouseEvent", { type: "mouseReleased", x: at.x, y: at.y, button: "left", clickCount: 1 });
}

async function evaluate<T>(cdp: CDPSession, expression: string): Promise<T> {
  const r = (await cdp.send("Runtime.evaluate", { expression, awaitPromise: true, returnByValue: true })) as { result: { value?: T }; exceptionDetails?: { text: string } };
  if (r.exceptionDetails) throw new Error(`in the page: ${r.exceptionDetails.text}`);
  return r.result.value as T;
}

/** Loads a page until it has hydrated (not measured). */
async function loadHydrated(page: Page, url: string, ready: Ready = "marker") {
  await page.goto(url, { timeout: SETTLE_LIMIT_MS });
  if (ready === "marker") await page.waitForSelector("html[data-hydrated]", { state: "attached", timeout: SETTLE_LIMIT_MS });
  else await page.waitForFunction(() => Object.keys(document.querySelector("main h1") ?? {}).some((k) => k.startsWith("__reactProps$")), null, { timeout: SETTLE_LIMIT_MS });
}

/** Counts the bytes and requests of a CDP session from now on. */
function countTraffic(cdp: CDPSession) {
  const t = { bytes: 0, requests: 0 };
  cdp.on("Network.requestWillBeSent", () => void t.requests++);
  cdp.on("Network.loadingFinished", (e) => void (t.bytes += e.encodedDataLength));
  return t;
}

async function measureVisit(browser: Browser, storageState: Awaited<ReturnType<BrowserContext["storageState"]>>, target: Target, visit: "return" | "again" | "link", fromUrl: string): Promise<VisitRun> {
  const context = await browser.newContext({ storageState, viewport: { width: 1280, height: 800 } });
  try {
    if (visit !== "link") {
      // Two earlier visits: the first fills the cache, the second lets Chromium keep the scripts' compiled code. A return visit
      // is then a new tab, opened just after theirs closed; "again" loads the page once more from itself, settled, as a person
      // reloads it. Not by way of a blank page: leaving a page for one without the app's Cross-Origin-Opener-Policy and coming
      // back starts a renderer each time (tests/bench/peer sends the same header, so both would pay it).
      let page = await context.newPage();
      await loadHydrated(page, fromUrl, target.ready);
      await loadHydrated(page, target.url, target.ready);
      await loadHydrated(page, target.url, target.ready);
      if (visit === "again") await page.waitForLoadState("networkidle", { timeout: SETTLE_LIMIT_MS });
      else {
        await page.close();
        page = await context.newPage();
      }
      await page.addInitScript(pageProbe(target.ready ?? "marker"));
      const cdp = await context.newCDPSession(page);
      await cdp.send("Network.enable");
      const traffic = countTraffic(cdp);
      const probe = await interactive(page, cdp, target.url);
      return { ttiMs: probe.clicked, ...traffic };
    }
    // From the case overview (or, for the overview itself, the basis page), its code and data loaded and settled.
    const page = await context.newPage();
    await loadHydrated(page, fromUrl);
    await page.waitForLoadState("networkidle", { timeout: SETTLE_LIMIT_MS });
    const cdp = await context.newCDPSession(page);
    await cdp.send("Network.enable");
    const traffic = countTraffic(cdp);
    const link = await evaluate<{ x: number; y: number } | null>(cdp, linkProbe(new URL(target.url).pathname));
    if (!link) throw new Error(`${fromUrl}: no link to ${target.url}`);
    await clickAt(cdp, link);
    const heading = await evaluate<{ x: number; y: number }>(cdp, "window.__visit.ready");
    await clickAt(cdp, heading);
    const seen = await evaluate<{ pressed: number; clicked: number }>(cdp, "window.__visit.clickedAt.then(() => ({ pressed: window.__visit.pressed, clicked: window.__visit.clicked }))");
    return { ttiMs: seen.clicked - seen.pressed, ...traffic };
  } finally {
    await context.close();
  }
}

async function measurePeerVisits(browser: Browser, storageState: Awaited<ReturnType<BrowserContext["storageState"]>>, peer: Target): Promise<{ returnMs: number; againMs: number }> {
  const returns: number[] = [];
  const agains: number[] = [];
  for (let i = 0; i < ROUNDS; i++) {
    returns.push((await measureVisit(browser, storageState, peer, "return", peer.url)).ttiMs);
    agains.push((await measureVisit(browser, storageState, peer, "again", peer.url)).ttiMs);
  }
  const f = { returnMs: median(returns), againMs: median(agains) };
  say(`floor peer page: return visit interactive ${f.returnMs.toFixed(0)} ms, reloaded ${f.againMs.toFixed(0)} ms (load ${loadAverage()})`);
  return f;
}

interface VisitFigures {
  key: string;
  returnMs: number;
  returnKiB: number;
  /** The page, open and settled, loaded again from itself (a reload). */
  againMs: number;
  linkMs: number;
  linkKiB: number;
  linkRequests: number;
}

async function measureVisits(browser: Browser, storageState: Awaited<ReturnType<BrowserContext["storageState"]>>, targets: Target[], label: string): Promise<VisitFigures[]> {
  const out: VisitFigures[] = [];
  const overview = targets.find((t) => t.key === "overview")?.url ?? targets[0]!.url.replace(/\/[a-z]+$/, "");
  for (const t of targets) {
    const from = t.key === "overview" ? `${overview}/basis` : overview;
    const returns: VisitRun[] = [];
    const agains: VisitRun[] = [];
    const links: VisitRun[] = [];
    for (let i = 0; i < ROUNDS; i++) {
      returns.push(await measureVisit(browser, storageState, t, "return", from));
      agains.push(await measureVisit(browser, storageState, t, "again", from));
      links.push(await measureVisit(browser, storageState, t, "link", from));
    }
    const f: VisitFigures = {
      key: t.key,
      returnMs: median(returns.map((r) => r.ttiMs)),
      returnKiB: median(returns.map((r) => r.bytes)) / 1024,
      againMs: median(agains.map((r) => r.ttiMs)),
      linkMs: median(links.map((r) => r.ttiMs)),
      linkKiB: median(links.map((r) => r.bytes)) / 1024,
      linkRequests: median(links.map((r) => r.requests)),
    };
    say(`${label} ${t.key}: return visit interactive ${f.returnMs.toFixed(0)} ms (${f.returnKiB.toFixed(0)} KiB), reloaded ${f.againMs.toFixed(0)} ms; from the rail ${f.linkMs.toFixed(0)} ms (${f.linkKiB.toFixed(0)} KiB in ${f.linkRequests} requests) (load ${loadAverage()})`);
    out.push(f);
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// The peer page: what any page of the framework costs in this browser on this machine

const PEER_PORT = BASE + 10;
let peer: ChildProcess | undefined;

/** Builds and starts tests/bench/peer on the app's database (as tests/bench/load.ts does), one process per web process of the app. */
async function startPeer(databaseUrl: string): Promise<string> {
  const dir = path.join(root, "tests", "bench", "peer");
  execFileSync(path.join(root, "node_modules", ".bin", "react-router"), ["build"], { cwd: dir, stdio: "ignore" });
  peer = spawn(path.join(root, "node_modules", ".bin", "tsx"), [path.join(dir, "server.ts")], {
    cwd: dir,
    env: { ...process.env, NODE_ENV: "production", PORT: String(PEER_PORT), DATABASE_URL: databaseUrl, WEB_PROCESSES: String(Math.min(os.availableParallelism(), 4)) },
    detached: true,
    stdio: "ignore",
  });
  const origin = `http://127.0.0.1:${PEER_PORT}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    // Any answer means it listens (the peer has no health route; an unknown path is its 404).
    if (await fetch(`${origin}/`).then(() => true, () => false)) return origin;
    if (Date.now() > deadline) throw new Error(`the peer page did not start on ${origin}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

function stopPeer() {
  if (peer && peer.exitCode === null && peer.signalCode === null) process.kill(-peer.pid!, "SIGTERM");
}

// ---------------------------------------------------------------------------------------------
// The cases

async function signIn(browser: Browser) {
  const u = DEMO_USERS.find((d) => d.label === "engineer")!;
  const context = await browser.newContext();
  const page = await context.newPage();
  await page.goto(`${ORIGIN}/login`);
  await page.waitForSelector("html[data-hydrated]", { state: "attached" });
  await page.getByLabel("E-mail", { exact: true }).fill(u.email);
  await page.getByLabel("Password").fill(u.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${ORIGIN}/cases`);
  return { context, state: await context.storageState() };
}

/** The demo case exported and imported again with 100 000 trimmed load cases (as tests/e2e/scale.spec.ts does). */
async function importLargeCase(context: BrowserContext, demo: { id: string; programme: { id: string } }): Promise<string> {
  const doc = (await (await context.request.get(`${ORIGIN}/api/v1/cases/${demo.id}/export`)).json()) as { cases: unknown[]; method: Record<string, unknown> };
  doc.cases = Array.from({ length: LARGE_CASES }, (_, i) => ({ id: `S${i + 1}`, mach: Number((0.2 + (i % 10) * 0.03).toFixed(2)), altitude: 1000 * (i % 5), weight: 30000, nz: 1 + (i % 7) * 0.25 }));
  doc.method = { ...doc.method, output: "summary" };
  const res = await context.request.post(`${ORIGIN}/api/v1/cases/import`, { data: { programmeId: demo.programme.id, reference: LARGE_REFERENCE, case: doc }, headers: { Origin: ORIGIN }, timeout: 300_000 });
  if (res.status() !== 201) throw new Error(`the 100 000-case import answered ${res.status()}: ${await res.text()}`);
  return ((await res.json()) as { id: string }).id;
}

/** Waits until the job worker has stored the case's results (the results API answers 202 until then). */
async function waitForResults(context: BrowserContext, caseId: string) {
  const deadline = Date.now() + 900_000;
  for (;;) {
    const res = await context.request.get(`${ORIGIN}/api/v1/cases/${caseId}/results`, { timeout: 300_000 });
    await res.body();
    if (res.status() === 200) return;
    if (res.status() !== 202) throw new Error(`the results of the 100 000-case case answered ${res.status()}`);
    if (Date.now() > deadline) throw new Error("the 100 000-case results were not stored within 15 minutes");
    await new Promise((r) => setTimeout(r, 2000));
  }
}

/** The row of the large case's table measured once every flagged case has a disposition. */
const DISPOSITIONED = "distribution, every flagged case with a disposition";

/**
 * The large case's distribution page as at the end of a check: every flagged case justified (one bulk
 * save for each reason a case is flagged for), measured like the other pages. Not on an app this run
 * did not start, whose case would keep the dispositions.
 */
async function measureDispositioned(browser: Browser, storageState: Awaited<ReturnType<BrowserContext["storageState"]>>, caseId: string): Promise<PageFigures[]> {
  const context = await browser.newContext({ storageState });
  const url = `${ORIGIN}/cases/${caseId}/distribution`;
  try {
    for (const reason of ["supercritical", "stall", "critical-mach-basis"]) {
      const { revision } = (await (await context.request.get(`${ORIGIN}/api/cases/${caseId}/flagged-cases?offset=0&limit=1`)).json()) as { revision: number };
      const res = await context.request.post(url, { data: { intent: "bulk", revision, reason, action: "justify", comment: "Benchmark: every case flagged for this reason justified at once." }, headers: { Origin: ORIGIN }, timeout: 300_000 });
      await res.body();
      // 400 where no case is flagged for the reason.
      if (res.status() !== 200 && res.status() !== 400) throw new Error(`the bulk disposition (${reason}) answered ${res.status()}`);
    }
  } finally {
    await context.close();
  }
  return measurePages(browser, storageState, [{ key: DISPOSITIONED, url }], "large");
}

// ---------------------------------------------------------------------------------------------
// Report

function writeSection(peerPage: PageFigures | null, demo: PageFigures[], large: PageFigures[], demoVisits: VisitFigures[], largeVisits: VisitFigures[], info: { demoCases: number; startupS: number; importS: number; resultsS: number; loadStart: string; loadEnd: string; chromium: string; peerReturn: { returnMs: number; againMs: number } }) {
  const cpu = os.cpus();
  const kib = (b: number) => (b / 1024).toFixed(0);
  const ms = (v: number) => (Number.isFinite(v) ? v.toFixed(0) : `not within ${SETTLE_LIMIT_MS / 1000} s`);
  const withUnit = (v: number) => (Number.isFinite(v) ? `${v.toFixed(0)} ms` : ms(v));
  const lines: string[] = [];
  const out = (s = "") => lines.push(s);
  out(MARK_START);
  out("# Browser benchmark: bytes and time to interactive per page");
  out();
  out(`Written by \`npm run bench\` (tests/bench/browser.ts) on ${new Date().toISOString().slice(0, 10)}. The production build served by`);
  out("`tsx app/server/start.ts` (its own PostgreSQL, S3 stand-in, mail capture, sign-in stand-in, job worker and web processes) on 127.0.0.1,");
  out(`loaded in ${info.chromium} (headless, playwright-core) on the same machine: ${cpu[0]?.model ?? "unknown"} × ${cpu.length} logical cores,`);
  out(`${(os.totalmem() / 2 ** 30).toFixed(1)} GiB, Node ${process.version}. Load average ${info.loadStart} at the start, ${info.loadEnd} at the end`);
  out("(1/5/15 min; other jobs share this machine, and the browser, the app and its database share its two cores).");
  out();
  out("How each page is measured: signed in as the demo engineer, each page is loaded in a fresh browser context (an empty cache, as");
  out(`on a first visit; the session cookie only), once to warm the server and then ${ROUNDS} times; the figures are medians of those.`);
  out("Chromium is started as the browser tests start it (tests/chromium.ts): among its flags, the address bar's suggestion popup is");
  out("turned off. Chromium builds that popup as a web page of its own in every new window, and each fresh context is a new window: traced,");
  out("it took 1.8–2.2 s of a renderer's main thread beside every page measured, on two cores. A person's browser builds it once, not per page.");
  out();
  out("- **Bytes**: everything transferred from navigation until the page has settled — the document, styles, scripts, fonts and the");
  out("  data the page fetches after it shows — as the bytes on the wire (compressed bodies and headers; Chrome's `encodedDataLength`).");
  out(`  The page has settled when, after hydration, no request has been in flight for ${QUIET_MS / 1000} s.`);
  out("- **Time to interactive**: from navigation start until the page answers a click. The moment root.tsx marks `html[data-hydrated]`");
  out("  (its first effect, after React has hydrated the whole page), the benchmark clicks the page's heading; the time is when that");
  out("  click reaches the document's listener, which happens only once the main thread is free (hydration, and whatever rendering");
  out("  follows it, done). Both times are the page's own clock (`performance.now()`, zero at navigation start). \"Hydrated\" is the");
  out("  marker alone; \"settled\" adds the data fetched after the page shows.");
  out(`- The large case: the demo case exported and imported again with ${LARGE_CASES.toLocaleString("en")} trimmed load cases (10 Mach numbers), its`);
  out(`  results computed by the job worker before the pages are loaded (import ${info.importS.toFixed(1)} s, results ${info.resultsS.toFixed(1)} s). App start-up ${info.startupS.toFixed(1)} s.`);
  out();
  const ok = (f: PageFigures) => f.statuses.every((st) => st === 200);
  const visitMisses = (v: VisitFigures, limit: number, label: string) => [
    ...(v.returnMs >= limit ? [`${label} ${v.key} on a return visit (${withUnit(v.returnMs)})`] : []),
    ...(v.againMs >= limit ? [`${label} ${v.key} reloaded (${withUnit(v.againMs)})`] : []),
    ...(v.linkMs >= limit ? [`${label} ${v.key} from the rail (${withUnit(v.linkMs)})`] : []),
  ];
  const visitTable = (first: PageFigures[], visits: VisitFigures[], limit: number, targeted: string[], floor?: { firstMs: number; returnMs: number; againMs: number }) => {
    if (!visits.length) return;
    out("### A return visit, and a step opened from the case's rail (medians)");
    out();
    out("A person who works on a case has the app in the browser already. **Return visit**: the page loaded again in a context that");
    out("has visited the case overview and the page twice before (the browser's cache and the scripts' compiled code kept, as after");
    out("earlier days' work); interactive as above. It is a new tab, opened just after the earlier visits' tab closed, so it starts a");
    out("renderer of its own (the app's Cross-Origin-Opener-Policy, which the peer carries too). **Reloaded**: the page, open and settled");
    out("in the tab of the earlier visits, loaded again from itself, as a person reloads it. **From the rail**: the case overview open and settled, the page's link in the step");
    out("rail pressed; the time runs from that mousedown until a click on the new page's heading is handled (React Router fetches the");
    out("page's data and any code not yet loaded, and renders it in the same document); the bytes are those fetched meanwhile.");
    out(`The first-visit figure is the table's above. Target: interactive < ${limit} ms.`);
    out();
    out("| page | first visit (ms) | return visit (ms) | return visit (KiB) | reloaded (ms) | from the rail (ms) | from the rail (KiB) | requests | target |");
    out("|---|---|---|---|---|---|---|---|---|");
    if (floor && Number.isFinite(floor.returnMs)) out(`| peer page (framework floor) | ${ms(floor.firstMs)} | ${ms(floor.returnMs)} | — | ${ms(floor.againMs)} | — | — | — | — |`);
    for (const v of visits) {
      const f = first.find((x) => x.key === v.key);
      const verdict = targeted.includes(v.key) ? (v.returnMs < limit && v.againMs < limit && v.linkMs < limit ? "met" : "**missed**") : "—";
      out(`| ${v.key} | ${f ? ms(f.ttiMs) : "—"} | ${ms(v.returnMs)} | ${v.returnKiB.toFixed(0)} | ${ms(v.againMs)} | ${ms(v.linkMs)} | ${v.linkKiB.toFixed(0)} | ${v.linkRequests} | ${verdict} |`);
    }
    out();
  };
  const table = (rows: PageFigures[], targets: (f: PageFigures) => string) => {
    out("| page | HTTP | bytes (KiB) | of which the document (KiB) | requests | hydrated (ms) | interactive (ms) | settled (ms) | target |");
    out("|---|---|---|---|---|---|---|---|---|");
    for (const f of rows) out(`| ${f.key} | ${f.statuses.join(", ")} | ${kib(f.bytes)} | ${kib(f.documentBytes)} | ${f.requests} | ${ms(f.hydratedMs)} | ${ms(f.ttiMs)} | ${ms(f.settledMs)}${f.allSettled ? "" : " (still fetching)"} | ${targets(f)} |`);
    out();
  };
  out(`## The demo case (TN-WL-001, ${info.demoCases} load cases)`);
  out();
  out("The first row is the floor of this machine and browser: the peer page of the load benchmark (tests/bench/peer: the same framework,");
  out("React Router 7 with React 19, a table of the steps and a 20-row history of the same case from the same database; no styles, fonts or");
  out("charts), loaded the same way. It has no hydration marker: it counts as hydrated when React has attached its props to the heading.");
  out("It carries the app's isolation headers (Cross-Origin-Opener-Policy and Cross-Origin-Resource-Policy): reached from a new tab's blank");
  out("page, a page with that opener policy is loaded in a renderer of its own, which the browser starts then.");
  out();
  table(peerPage ? [{ ...peerPage, key: "peer page (framework floor)" }, ...demo] : demo, (f) => (!ok(f) ? `**failed** (HTTP ${f.statuses.join(", ")})` : DEMO_TTI_PAGES.includes(f.key) ? `interactive < ${DEMO_TTI_TARGET_MS} ms: ${f.ttiMs < DEMO_TTI_TARGET_MS ? "met" : "**missed**"}` : "—"));
  out("### Where the time to interactive goes (the same loads, medians)");
  out();
  out("Milestones on the page's clock (ms from navigation start): the document's first byte (the server's time included), the stylesheet and the");
  out("last script fetched, the first contentful paint, DOMContentLoaded (the module scripts have run and React Router's entry has started");
  out("hydrating), hydrated and interactive as above. Then the renderer's main-thread time until the click (Chrome's `Performance.getMetrics`):");
  out("running JavaScript (module evaluation, hydration, effects), compiling it, style and layout, and all its tasks together; the rest of");
  out("the time to interactive the main thread waited (for the network, or for a processor on this shared machine).");
  out();
  out("| page | first byte | stylesheet | scripts (KiB) | first paint | DOMContentLoaded | hydrated | interactive | script | compile | style + layout | all tasks |");
  out("|---|---|---|---|---|---|---|---|---|---|---|---|");
  for (const f of peerPage ? [{ ...peerPage, key: "peer page" }, ...demo] : demo) {
    const t = f.parts;
    const n = (v: number) => (Number.isFinite(v) ? v.toFixed(0) : "—");
    out(`| ${f.key} | ${n(t.ttfb)} | ${n(t.cssEnd)} | ${n(t.scriptsEnd)} (${n(t.scriptKiB)}) | ${n(t.firstPaint)} | ${n(t.domContentLoaded)} | ${ms(f.hydratedMs)} | ${ms(f.ttiMs)} | ${n(t.scriptMs)} | ${n(t.compileMs)} | ${n(t.styleLayoutMs)} | ${n(t.taskMs)} |`);
  }
  out();
  visitTable(demo, demoVisits, DEMO_TTI_TARGET_MS, DEMO_TTI_PAGES, peerPage ? { firstMs: peerPage.ttiMs, ...info.peerReturn } : undefined);
  out(`## A case of ${LARGE_CASES.toLocaleString("en")} load cases`);
  out();
  if (large.some((f) => f.key === DISPOSITIONED)) {
    out(`The row "${DISPOSITIONED}" is the distribution page again after every other figure, once each reason a case is flagged for`);
    out("has been justified for all its cases in one save (as at the end of a check): the page then counts the open cases among");
    out("as many dispositions as there are flagged cases.");
    out();
  }
  table(large, (f) => {
    if (!ok(f)) return `**failed** (HTTP ${f.statuses.join(", ")})`;
    const b = f.bytes < LARGE_BYTES_TARGET;
    const t = f.ttiMs < LARGE_TTI_TARGET_MS;
    return `< 1 MB: ${b ? "met" : "**missed**"}; interactive < 1 s: ${t ? "met" : "**missed**"}`;
  });
  visitTable(large, largeVisits, LARGE_TTI_TARGET_MS, ALL_PAGES.map((p) => p.key));
  const missedVisits = [
    ...demoVisits.filter((v) => DEMO_TTI_PAGES.includes(v.key)).flatMap((v) => visitMisses(v, DEMO_TTI_TARGET_MS, "demo")),
    ...largeVisits.flatMap((v) => visitMisses(v, LARGE_TTI_TARGET_MS, "large")),
  ];
  const missed = [
    ...demo.filter((f) => DEMO_TTI_PAGES.includes(f.key) && f.ttiMs >= DEMO_TTI_TARGET_MS).map((f) => `demo ${f.key} (${withUnit(f.ttiMs)})`),
    ...demo.filter((f) => !ok(f)).map((f) => `demo ${f.key} (HTTP ${f.statuses.join(", ")})`),
    ...large.filter((f) => !ok(f) || f.bytes >= LARGE_BYTES_TARGET || f.ttiMs >= LARGE_TTI_TARGET_MS).map((f) => `large ${f.key} (${kib(f.bytes)} KiB, ${withUnit(f.ttiMs)})`),
  ];
  out(`- Targets (issue 14: every page of the ${LARGE_CASES.toLocaleString("en")}-case case under 1 MB and interactive within 1 s; issue 10, item 8: the demo envelope and distribution pages within 0.5 s): ${missed.length ? `**missed** by ${missed.join(", ")}` : "**met**"}.`);
  out(`- The same targets on a return visit, reloaded, and for a step opened from the case's rail: ${missedVisits.length ? `**missed** by ${missedVisits.join(", ")}` : "**met**"}.`);
  out(MARK_END);

  const file = writeDocsSection(MARK_START, MARK_END, lines.join("\n"));
  say(`wrote its section of ${path.relative(process.cwd(), file)}`);
}

// ---------------------------------------------------------------------------------------------

async function main() {
  const startupS = await startApp();
  say(`healthy after ${startupS.toFixed(1)} s`);
  const databaseUrl = RUNNING ? process.env.BROWSER_BENCH_DATABASE_URL : app.databaseUrl;
  const peerOrigin = databaseUrl && ONLY !== "large" ? await startPeer(databaseUrl) : null;
  const browser = await chromium.launch({
    executablePath: CHROMIUM_PATH,
    args: CHROMIUM_ARGS,
  });
  try {
    const { context, state } = await signIn(browser);
    const list = (await (await context.request.get(`${ORIGIN}/api/v1/cases`)).json()) as { cases: { id: string; reference: string; programme: { id: string } }[] };
    const demo = list.cases.find((c) => c.reference === "TN-WL-001");
    if (!demo) throw new Error("the demo case TN-WL-001 is not in the engineer's list");
    const demoCases = ((await (await context.request.get(`${ORIGIN}/api/v1/cases/${demo.id}/export`)).json()) as { cases: unknown[] }).cases.length;
    const loadStart = loadAverage();
    let largeId: string | null = null;
    let importS = NaN;
    let resultsS = NaN;
    if (ONLY !== "demo") {
      let t0 = performance.now();
      largeId = list.cases.find((c) => c.reference === LARGE_REFERENCE)?.id ?? (await importLargeCase(context, demo));
      importS = (performance.now() - t0) / 1000;
      t0 = performance.now();
      await waitForResults(context, largeId);
      resultsS = (performance.now() - t0) / 1000;
      say(`imported ${LARGE_CASES} cases in ${importS.toFixed(1)} s, results stored after ${resultsS.toFixed(1)} s`);
    }
    await context.close();
    // The session cookie is the host's, so the peer page on its own port is signed in as the same person.
    const peerTarget: Target = { key: "peer page", url: `${peerOrigin}/cases/${demo.id}`, ready: "react" };
    const peerFigures = peerOrigin ? await measurePages(browser, state, [peerTarget], "floor") : [];
    // The floor of a return visit and a reload too (the peer has no rail).
    const peerReturn = peerOrigin && !FIRST_ONLY ? await measurePeerVisits(browser, state, peerTarget) : { returnMs: NaN, againMs: NaN };
    const demoFigures = ONLY === "large" ? [] : await measurePages(browser, state, caseTargets(demo.id), "demo");
    const largeFigures = largeId ? await measurePages(browser, state, caseTargets(largeId), "large") : [];
    const demoVisits = ONLY === "large" || FIRST_ONLY ? [] : await measureVisits(browser, state, caseTargets(demo.id), "demo");
    const largeVisits = largeId && !FIRST_ONLY ? await measureVisits(browser, state, caseTargets(largeId), "large") : [];
    if (largeId && !RUNNING && (!PAGE_KEYS || PAGE_KEYS.includes("distribution"))) largeFigures.push(...(await measureDispositioned(browser, state, largeId)));
    if (PARTIAL) say(`a part of the benchmark (--only, --pages): docs/benchmarks.md is left as it is (load ${loadStart} at the start, ${loadAverage()} at the end)`);
    else writeSection(peerFigures[0] ?? null, demoFigures, largeFigures, demoVisits, largeVisits, { demoCases, startupS, importS, resultsS, loadStart, loadEnd: loadAverage(), chromium: `Chromium ${browser.version()}`, peerReturn });
  } finally {
    await browser.close();
  }
}

main()
  .then(async () => {
    stopPeer();
    await app.stop();
  })
  .catch(async (error: unknown) => {
    console.error(`[browser] ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`);
    stopPeer();
    await app.stop();
    process.exitCode = 1;
  });
