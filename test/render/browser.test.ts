/**
 * Opens the HTML report in a real browser (Debian's chromium, headless, driven by playwright-core)
 * and checks that it loads without console errors or network requests and shows its charts.
 * Writes test-output/report.html and test-output/report.png for a person to look at.
 * Needs /usr/bin/chromium: CI installs it with .ci/install-browser.sh. Without it this test fails.
 */
import { describe, it, expect } from "vitest";
import { existsSync } from "node:fs";
import { mkdir, mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { chromium } from "playwright-core";
import { renderHtmlReport } from "../../src/render/html.js";
import { expectedChartCount, loadFixture } from "./load-fixture.js";

const CHROMIUM = "/usr/bin/chromium";
const FLAGS = [
  "--no-sandbox", "--disable-gpu", "--disable-background-networking", "--no-first-run",
  "--disable-component-update", "--disable-sync",
];

describe("the HTML report in headless chromium", () => {
  it("loads without console errors or network requests, with every chart drawn", async () => {
    if (!existsSync(CHROMIUM)) {
      throw new Error(`chromium not found at ${CHROMIUM}: run .ci/install-browser.sh (apt-get install chromium) first`);
    }
    const profile = loadFixture("binary");
    const outDir = resolve("test-output");
    await mkdir(outDir, { recursive: true });
    const reportPath = join(outDir, "report.html");
    await writeFile(reportPath, await renderHtmlReport(profile));
    const reportUrl = pathToFileURL(reportPath).href;

    const userDataDir = await mkdtemp(join(tmpdir(), "tailsift-chromium-"));
    const context = await chromium.launchPersistentContext(userDataDir, {
      executablePath: CHROMIUM, headless: true, args: FLAGS, viewport: { width: 1280, height: 900 },
    });
    try {
      const page = context.pages()[0] ?? (await context.newPage());
      const problems: string[] = [];
      const requests: string[] = [];
      page.on("console", (m) => { if (m.type() === "error" || m.type() === "warning") problems.push(`${m.type()}: ${m.text()}`); });
      page.on("pageerror", (e) => problems.push(`pageerror: ${e.message}`));
      page.on("request", (r) => requests.push(r.url()));
      await page.goto(reportUrl, { waitUntil: "load" });

      expect(problems).toEqual([]);
      expect(requests).toEqual([reportUrl]); // the page itself, nothing else
      expect(await page.locator("script").count()).toBe(0);
      const charts = expectedChartCount(profile);
      expect(await page.locator("svg").count()).toBeGreaterThanOrEqual(charts);
      const sizes = await page.locator("figure.chart svg").evaluateAll((els) =>
        els.map((el) => { const box = el.getBoundingClientRect(); return box.width > 100 && box.height > 100; }));
      expect(sizes).toEqual(Array(charts).fill(true));
      // The nasty level value is shown as text, not run or parsed as markup.
      expect(await page.locator("td.level", { hasText: "<script>alert(1)</script>" }).count()).toBe(1);
      expect(await page.title()).toContain("appointments-2 & more|.csv");

      await page.screenshot({ path: join(outDir, "report.png"), fullPage: true });
    } finally {
      await context.close();
      await rm(userDataDir, { recursive: true, force: true });
    }
  });
});
