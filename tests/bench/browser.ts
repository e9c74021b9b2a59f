/**
 * Page and browser figures, on the production build (see tests/support/app-server.ts):
 * - JavaScript: the compressed bytes a cold load fetches, first-load (what the HTML asks for) and in all
 *   until the network is idle (lazy parts too), for the sign-in, traverse-entry and system-view pages;
 * - on the traverse-entry page, in Debian's Chromium emulating a portrait tablet (820 × 1180) on a slow
 *   4G link (150 ms round trip, 1.6 Mbit/s down, 750 kbit/s up) with the CPU slowed 4×: Largest
 *   Contentful Paint; Total Blocking Time (each long task's time beyond 50 ms, from the first
 *   contentful paint until the network is idle); and the delay from a key press in a reading cell to the
 *   live results showing the new mean velocity.
 */
import { chromium, type Browser, type BrowserContext, type CDPSession, type Page } from "@playwright/test";
import { figure, type Figure } from "./figures";
import { DEMO_PASSWORD } from "../support/app-server";

const CHROMIUM = process.env.AIRTALLY_CHROMIUM ?? "/usr/bin/chromium";
const PAGE_LOADS = 5;
const KEYSTROKES = 9;

/** The pages measured, by what the bench set up. */
export interface BenchPages {
  signIn: string;
  traverseEntry: string;
  systemView: string;
}

async function signedInContext(browser: Browser, base: string, email: string | null, options: Parameters<Browser["newContext"]>[0] = {}): Promise<BrowserContext> {
  const ctx = await browser.newContext({ baseURL: base, ...options });
  if (email) {
    const res = await ctx.request.post("/api/auth/sign-in", { data: { email, password: DEMO_PASSWORD }, headers: { origin: base } });
    if (res.status() !== 204) throw new Error(`bench sign-in as ${email} answered ${res.status()}`);
  }
  return ctx;
}

/**
 * Compressed bytes of the scripts a cold load of the page fetches: `firstLoad` counts those the HTML
 * itself asks for (its script tags and preloads: what the page needs before it works), `total` adds
 * the ones loaded lazily by code (charts and other parts imported on demand) until the network is idle.
 */
async function scriptBytes(browser: Browser, base: string, email: string | null, path: string): Promise<{ firstLoad: number; total: number }> {
  const ctx = await signedInContext(browser, base, email, { viewport: { width: 1024, height: 768 } });
  try {
    const page = await ctx.newPage();
    const cdp = await ctx.newCDPSession(page);
    await cdp.send("Network.enable");
    await cdp.send("Network.setCacheDisabled", { cacheDisabled: true });
    const initiators = new Map<string, string>();
    const scripts = new Map<string, { url: string; bytes: number; lazy: boolean }>();
    cdp.on("Network.requestWillBeSent", (e) => initiators.set(e.requestId, e.initiator.type));
    cdp.on("Network.responseReceived", (e) => {
      if (e.type === "Script") scripts.set(e.requestId, { url: e.response.url, bytes: 0, lazy: initiators.get(e.requestId) === "script" });
    });
    cdp.on("Network.loadingFinished", (e) => {
      const s = scripts.get(e.requestId);
      if (s) s.bytes = e.encodedDataLength;
    });
    await page.goto(path, { waitUntil: "networkidle" });
    const list = [...scripts.values()];
    // AIRTALLY_BENCH_SCRIPTS=1 lists each page's scripts, largest first, to find what weighs.
    if (process.env.AIRTALLY_BENCH_SCRIPTS) {
      console.log(`\nScripts of ${path}:`);
      for (const s of list.sort((a, b) => b.bytes - a.bytes)) console.log(`  ${(s.bytes / 1000).toFixed(1)} kB${s.lazy ? " (lazy)" : ""}  ${new URL(s.url).pathname}`);
    }
    const sum = (xs: typeof list) => xs.reduce((a, b) => a + b.bytes, 0);
    return { firstLoad: sum(list.filter((s) => !s.lazy)), total: sum(list) };
  } finally {
    await ctx.close();
  }
}

async function throttle(cdp: CDPSession, network: boolean): Promise<void> {
  await cdp.send("Emulation.setCPUThrottlingRate", { rate: 4 });
  await cdp.send("Network.enable");
  await cdp.send("Network.setCacheDisabled", { cacheDisabled: true });
  await cdp.send("Network.emulateNetworkConditions", network
    ? { offline: false, latency: 150, downloadThroughput: (1.6 * 1024 * 1024) / 8, uploadThroughput: (750 * 1024) / 8 }
    : { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
}

const OBSERVE = () => {
  const w = window as unknown as { __lcp: number; __long: [number, number][] };
  w.__lcp = 0;
  w.__long = [];
  new PerformanceObserver((list) => {
    for (const e of list.getEntries()) w.__lcp = e.startTime;
  }).observe({ type: "largest-contentful-paint", buffered: true });
  new PerformanceObserver((list) => {
    for (const e of list.getEntries()) w.__long.push([e.startTime, e.duration]);
  }).observe({ type: "longtask", buffered: true });
};

/** LCP and TBT of one cold load of the page on the emulated tablet. */
async function loadMetrics(page: Page, path: string): Promise<{ lcp: number; tbt: number }> {
  await page.goto(path, { waitUntil: "networkidle" });
  await page.waitForTimeout(500);
  return page.evaluate(() => {
    const w = window as unknown as { __lcp: number; __long: [number, number][] };
    const fcp = performance.getEntriesByName("first-contentful-paint")[0]?.startTime ?? 0;
    const tbt = w.__long.filter(([start]) => start >= fcp).reduce((sum, [, duration]) => sum + Math.max(0, duration - 50), 0);
    return { lcp: w.__lcp, tbt };
  });
}

/** Key press → the live mean velocity changes, in ms, for KEYSTROKES different values typed into the first cell. */
async function keystrokeDelays(page: Page): Promise<number[]> {
  const cell = page.getByRole("textbox", { name: /^(Diameter|Line) 1, Point 1\b/ });
  await cell.waitFor();
  const delays: number[] = [];
  for (let n = 0; n < KEYSTROKES; n++) {
    await cell.fill("");
    await cell.focus();
    await page.evaluate(() => {
      const w = window as unknown as { __keyAt: number; __changedAt: number; __watch?: MutationObserver };
      w.__keyAt = 0;
      w.__changedAt = 0;
      document.addEventListener("keydown", () => (w.__keyAt = performance.now()), { once: true, capture: true });
      const target = document.querySelector('[data-testid="mean-velocity"]')?.closest("dl") ?? document.body;
      w.__watch?.disconnect();
      w.__watch = new MutationObserver(() => {
        if (w.__keyAt && !w.__changedAt) w.__changedAt = performance.now();
      });
      w.__watch.observe(target, { subtree: true, characterData: true, childList: true });
    });
    // A different one-digit reading each time, so the mean always moves.
    await page.keyboard.press(String(1 + (n % 9)));
    await page.waitForFunction(() => (window as unknown as { __changedAt: number }).__changedAt > 0, undefined, { timeout: 10_000 });
    delays.push(await page.evaluate(() => {
      const w = window as unknown as { __keyAt: number; __changedAt: number };
      return w.__changedAt - w.__keyAt;
    }));
  }
  return delays;
}

export async function browserFigures(base: string, pages: BenchPages, users: { technician: string; engineer: string }): Promise<Figure[]> {
  const browser = await chromium.launch({ executablePath: CHROMIUM, args: ["--no-sandbox"] });
  try {
    const figures: Figure[] = [];
    for (const [name, email, path, budget] of [
      ["sign-in", null, pages.signIn, undefined],
      ["traverse-entry", users.technician, pages.traverseEntry, { atMost: 175 }],
      ["system-view", users.engineer, pages.systemView, undefined],
    ] as const) {
      const runs: { firstLoad: number; total: number }[] = [];
      for (let i = 0; i < 3; i++) runs.push(await scriptBytes(browser, base, email, path));
      figures.push(figure("pages", `first-load JavaScript, ${name} page (gzip)`, "kB", runs.map((r) => r.firstLoad / 1000), budget));
      figures.push(figure("pages", `all JavaScript until idle, lazy parts included, ${name} page (gzip)`, "kB", runs.map((r) => r.total / 1000)));
    }

    const lcp: number[] = [];
    const tbt: number[] = [];
    for (let i = 0; i < PAGE_LOADS; i++) {
      const ctx = await signedInContext(browser, base, users.technician, { viewport: { width: 820, height: 1180 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true });
      const page = await ctx.newPage();
      await throttle(await ctx.newCDPSession(page), true);
      await page.addInitScript(OBSERVE);
      const m = await loadMetrics(page, pages.traverseEntry);
      lcp.push(m.lcp);
      tbt.push(m.tbt);
      await ctx.close();
    }
    figures.push(figure("browser", "traverse entry, Largest Contentful Paint (tablet, slow 4G, CPU 4×)", "ms", lcp, { atMost: 1500 }));
    figures.push(figure("browser", "traverse entry, Total Blocking Time (tablet, slow 4G, CPU 4×)", "ms", tbt, { atMost: 200 }));

    const ctx = await signedInContext(browser, base, users.technician, { viewport: { width: 820, height: 1180 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true });
    const page = await ctx.newPage();
    await page.goto(pages.traverseEntry, { waitUntil: "networkidle" });
    await throttle(await ctx.newCDPSession(page), false);
    figures.push(figure("browser", "traverse entry, key press to live results (CPU 4×)", "ms", await keystrokeDelays(page), { atMost: 50 }));
    await ctx.close();
    return figures;
  } finally {
    await browser.close();
  }
}
