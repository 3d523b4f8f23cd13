/**
 * Page weight and time to a usable chart, in Debian's headless Chromium on loopback.
 *
 * `npm run bench:pages` starts its own PostgreSQL (in /dev/shm) and the app's production build,
 * makes a Northwind Outfitters campaign with 90 days of counts (ingest API, then the worker), signs
 * in through the API and hands the session cookie to Chromium, then for the portfolio (`/campaigns`)
 * and the campaign page (`/campaigns/:id`) loads each page cold (new context, empty cache) three
 * times and reads
 *   - first-load JavaScript: the encoded (gzip, as `next start` sends it) bytes of the scripts whose
 *     request started before the page's `load` event (what the HTML and its scripts ask for up front),
 *     from Chromium's own response sizes and the page's resource timing; beside it the scripts the HTML
 *     itself names and the total including lazy chunks fetched after `load` (up to network idle);
 *   - time to a usable chart: from navigation start until the first chart line with data (a path
 *     through at least 10 points: the still drawing served with the HTML, `[data-still-plot] path[data-series]`,
 *     or recharts' `.recharts-line .recharts-curve`) is in the document and a frame has been painted;
 *     beside it the interactive chart (the first recharts line), the page's `load` event and a timeline:
 *     first byte, HTML done, DOMContentLoaded, chart chunk requested and received (resource timing).
 * Writes bench/results/pages.json.
 */
import { chromium } from "playwright-core";
import { machineLine, printTable, seedAnalysedCampaign, startBenchStack, writeResults } from "./lib/stack";

const RUNS = 3;
const TARGETS = { firstLoadJavaScriptKiB: 250, usableChartMs: 1_000 };
const CHARTS = { still: "[data-still-plot] path[data-series]", interactive: ".recharts-line .recharts-curve" };
const MIN_POINTS = 10;

// Runs in the page before its own scripts: notes the painted frame after the first line with data of each kind.
// (No named inner functions: the runner's transform would wrap them in a helper the page does not have.)
function watchFirstChartLine({ selectors, minPoints }: { selectors: Record<string, string>; minPoints: number }): void {
  const state = window as unknown as { __chartMs: Record<string, number> };
  state.__chartMs = {};
  const pending = new Set(Object.keys(selectors));
  new MutationObserver((_records, observer) => {
    for (const kind of [...pending]) {
      // Streamed HTML waits in a hidden holder until React moves it into place: only a shown line counts.
      const drawn = [...document.querySelectorAll(selectors[kind])].some((line) => !line.closest("[hidden]") && (line.getAttribute("d")?.match(/[MLC]/g)?.length ?? 0) >= minPoints);
      if (!drawn) continue;
      pending.delete(kind);
      requestAnimationFrame(() => (state.__chartMs[kind] = performance.now()));
    }
    if (pending.size === 0) observer.disconnect();
  }).observe(document, { childList: true, subtree: true, attributes: true, attributeFilter: ["d"] });
}

const kibOf = (bytes: number) => Math.round((bytes / 1024) * 10) / 10;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

async function main(): Promise<void> {
  const stack = await startBenchStack({ app: true });
  const browser = await chromium.launch({ executablePath: "/usr/bin/chromium", headless: true, args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking"] });
  try {
    const appUrl = stack.appUrl!;
    const { workspace, campaign } = await seedAnalysedCampaign(stack, 1_010);

    const host = new URL(appUrl).hostname;
    const cookies = [...workspace.admin.cookies].map(([name, value]) => ({ name, value, domain: host, path: "/" }));
    const pages = [
      { name: "portfolio", path: "/campaigns" },
      { name: "campaign", path: `/campaigns/${campaign.id}` },
    ];
    const results: Record<string, unknown>[] = [];
    const table: Record<string, string | number>[] = [];
    for (const target of pages) {
      const javaScript: number[] = [];
      const htmlJavaScript: number[] = [];
      const totalJavaScript: number[] = [];
      const chart: number[] = [];
      const loaded: number[] = [];
      const timeline: Record<string, number>[] = [];
      for (let run = 0; run < RUNS; run++) {
        const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
        await context.addCookies(cookies);
        await context.addInitScript(watchFirstChartLine, { selectors: CHARTS, minPoints: MIN_POINTS });
        const page = await context.newPage();
        const scripts: Promise<{ url: string; bytes: number; plots: boolean }>[] = [];
        page.on("requestfinished", (request) => {
          if (request.resourceType() !== "script") return;
          const body = request.response().then((answer) => answer?.text() ?? "").catch(() => "");
          scripts.push(Promise.all([request.sizes(), body]).then(([sizes, text]) => ({ url: request.url(), bytes: sizes.responseBodySize, plots: text.includes("recharts-curve") })));
        });
        const response = await page.goto(`${appUrl}${target.path}`, { waitUntil: "load" });
        if (!response || response.status() !== 200) throw new Error(`${target.path} answered ${response?.status()}`);
        const html = await response.text();
        await page.waitForFunction(() => (window as unknown as { __chartMs: Record<string, number> }).__chartMs.interactive !== undefined, undefined, { timeout: 15_000 }).catch(() => {
          // no chart on this page: reported as such
        });
        await page.waitForLoadState("networkidle").catch(() => undefined);
        const timing = await page.evaluate(() => {
          const [navigation] = performance.getEntriesByType("navigation") as PerformanceNavigationTiming[];
          const resources = (performance.getEntriesByType("resource") as PerformanceResourceTiming[]).map((entry) => [entry.name, { start: entry.startTime, end: entry.responseEnd }] as const);
          const chartMs = (window as unknown as { __chartMs: Record<string, number> }).__chartMs;
          return {
            firstByte: navigation.responseStart,
            htmlDone: navigation.responseEnd,
            domContentLoaded: navigation.domContentLoadedEventEnd,
            loadStart: navigation.loadEventStart,
            loadEnd: navigation.loadEventEnd,
            resources,
            chartMs,
          };
        });
        const resourceAt = new Map(timing.resources);
        const startedAt = new Map(timing.resources.map(([name, entry]) => [name, entry.start]));
        const fetched = await Promise.all(scripts);
        const plotsChunk = resourceAt.get(fetched.find((script) => script.plots)?.url ?? "");
        const usable = [timing.chartMs.still, timing.chartMs.interactive].filter((value) => value !== undefined);
        const chartMs = usable.length === 0 ? Number.NaN : Math.min(...usable);
        timeline.push({
          firstByte: timing.firstByte,
          htmlDone: timing.htmlDone,
          domContentLoaded: timing.domContentLoaded,
          chartChunkRequested: plotsChunk?.start ?? Number.NaN,
          chartChunkReceived: plotsChunk?.end ?? Number.NaN,
          stillChart: timing.chartMs.still ?? Number.NaN,
          interactiveChart: timing.chartMs.interactive ?? Number.NaN,
          load: timing.loadEnd,
        });
        const sum = (list: { bytes: number }[]) => list.reduce((total, script) => total + script.bytes, 0);
        javaScript.push(sum(fetched.filter((script) => (startedAt.get(script.url) ?? Number.POSITIVE_INFINITY) < timing.loadStart)));
        htmlJavaScript.push(sum(fetched.filter((script) => html.includes(new URL(script.url).pathname))));
        totalJavaScript.push(sum(fetched));
        chart.push(chartMs);
        loaded.push(timing.loadEnd);
        await context.close();
      }
      const kib = kibOf(median(javaScript));
      const chartMedian = chart.some(Number.isNaN) ? null : Math.round(median(chart));
      const timelineMs = Object.fromEntries(
        Object.keys(timeline[0]).map((mark) => {
          const values = timeline.map((run) => run[mark]);
          return [mark, values.some(Number.isNaN) ? null : Math.round(median(values))];
        }),
      );
      const entry = {
        page: target.name,
        path: target.name === "campaign" ? "/campaigns/:id" : target.path,
        firstLoadJavaScriptKiB: kib,
        htmlJavaScriptKiB: kibOf(median(htmlJavaScript)),
        totalJavaScriptKiB: kibOf(median(totalJavaScript)),
        usableChartMs: chartMedian,
        loadEventMs: Math.round(median(loaded)),
        interactiveChartMs: timelineMs.interactiveChart,
        timelineMs,
        runs: { javaScriptBytes: javaScript, htmlJavaScriptBytes: htmlJavaScript, totalJavaScriptBytes: totalJavaScript, chartMs: chart.map((value) => (Number.isNaN(value) ? null : Math.round(value))), loadMs: loaded.map(Math.round) },
        meetsJavaScriptTarget: kib < TARGETS.firstLoadJavaScriptKiB,
        meetsChartTarget: chartMedian === null ? null : chartMedian < TARGETS.usableChartMs,
      };
      results.push(entry);
      table.push({
        page: target.name,
        "first-load JS KiB": kib,
        "< 250": entry.meetsJavaScriptTarget ? "yes" : "NO",
        "in HTML KiB": entry.htmlJavaScriptKiB,
        "total JS KiB": entry.totalJavaScriptKiB,
        "chart ms": chartMedian ?? "no chart",
        "< 1000": entry.meetsChartTarget === null ? "" : entry.meetsChartTarget ? "yes" : "NO",
        "interactive ms": entry.interactiveChartMs ?? "",
        "load ms": entry.loadEventMs,
      });
      console.log(`${target.name} timeline (median ms from navigation start): ${Object.entries(timelineMs).map(([mark, ms]) => `${mark} ${ms ?? "-"}`).join(", ")}`);
    }
    const machine = machineLine();
    console.log(`\nPages in headless Chromium on loopback (cold context, median of ${RUNS})`);
    console.log("first-load JS: gzip bytes of scripts requested before the load event; in HTML: scripts the HTML names; total: every script up to network idle");
    console.log(`machine: ${machine.cpus} CPUs, load average ${machine.loadAverage.join(" / ")}, Node ${machine.node}\n`);
    printTable(table);
    const file = writeResults("pages", { bench: "pages", ranAt: new Date().toISOString(), machine, targets: TARGETS, results });
    console.log(`\nwrote ${file}`);
  } finally {
    await browser.close();
    await stack.stop();
  }
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
