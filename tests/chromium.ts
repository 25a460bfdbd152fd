/** Debian's Chromium, as the browser tests and the browser benchmark start it (Playwright's own browser downloads are not available here). */
export const CHROMIUM_PATH = "/usr/bin/chromium";

export const CHROMIUM_ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
  "--disable-quic",
  // Chromium 156 builds its address bar's suggestion popup as a web page of its own (a "WebUI"
  // renderer) in every new window, and a new browser context opens a new window: each test, and
  // each first visit the benchmark measures, paid 1.8–2.2 s of that renderer's main-thread time
  // (traced), on a machine of two cores, beside the page under test. No page is shown in that popup headless.
  "--disable-features=WebUIOmniboxPopup,WebUIOmniboxFullPopup",
];
