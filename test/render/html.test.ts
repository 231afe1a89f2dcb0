import { describe, it, expect } from "vitest";
import { renderHtmlReport } from "../../src/render/html.js";
import { expectedChartCount, loadFixture } from "./load-fixture.js";

/** The report with each inline SVG replaced by a placeholder, for a readable snapshot. */
const withoutSvg = (html: string) => html.replace(/<svg[\s\S]*?<\/svg>/g, "<svg><!-- chart --></svg>");

/** The HTML of the section for column number `n` (1-based). */
function section(html: string, n: number): string {
  const start = html.indexOf(`<section class="column" id="col-${n}">`);
  return html.slice(start, html.indexOf("</section>", start));
}

describe("renderHtmlReport", async () => {
  const binary = await renderHtmlReport(loadFixture("binary"));
  const noTarget = await renderHtmlReport(loadFixture("no-target"));

  it("matches the snapshots (charts replaced by placeholders)", async () => {
    await expect(withoutSvg(binary)).toMatchFileSnapshot("__snapshots__/report-binary.html");
    await expect(withoutSvg(noTarget)).toMatchFileSnapshot("__snapshots__/report-no-target.html");
  });

  it("is deterministic, charts included", async () => {
    expect(await renderHtmlReport(loadFixture("binary"))).toBe(binary);
  });

  it("declares utf-8 and a Content-Security-Policy that forbids network loads", () => {
    expect(binary.startsWith("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">")).toBe(true);
    expect(binary).toContain(`<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:;`);
  });

  it("is self-contained: no scripts, no external URLs, no resources to fetch", () => {
    for (const html of [binary, noTarget]) {
      expect(html).not.toMatch(/<script/i);
      expect(html).not.toMatch(/https?:|\/\/[a-z]/i);
      expect(html).not.toMatch(/\ssrc=|url\(|@import|<link|<iframe|<object|<embed|javascript:/i);
      expect(html).not.toMatch(/NaN|undefined|Infinity/);
    }
  });

  it("HTML-escapes column names and level values, in tables and in chart text", () => {
    expect(binary).toContain("owner notes &lt;b&gt;&amp;&lt;/b&gt; &quot;quoted&quot; | `tick`");
    expect(binary).toContain(`<td class="level">&lt;script&gt;alert(1)&lt;/script&gt;</td>`);
    expect(binary).toContain(`<td class="level">Tom &amp; &quot;Jerry&quot;</td>`);
    expect(binary).toContain(`<td class="level">=cmd|&#39; /C calc&#39;!A0</td>`);
    expect(binary).toContain(`<td class="level"><em class="meta">(empty)</em></td>`);
    expect(binary).toContain(`<td class="level">line1<span class="ctl">\\n</span>line2</td>`); // shown, not collapsed
    const nasty = section(binary, 10);
    const svgs = nasty.match(/<svg[\s\S]*?<\/svg>/g) ?? [];
    expect(svgs.length).toBe(2); // coverage curve and funnel plot
    expect(svgs[1]).toMatch(/<text[^>]*>&lt;script&gt;alert\(1\)&lt;\/scrip…<\/text>/); // funnel label
    expect(svgs[1]).toContain(`aria-label="&lt;script&gt;alert(1)&lt;/script&gt;: 20,235 rows, 31.0 % (outside 99.8 %)"`); // point description
  });

  it("holds one SVG per expected chart: coverage, funnel with a target, collision with hashing", () => {
    expect((binary.match(/<svg/g) ?? []).length).toBe(expectedChartCount(loadFixture("binary")));
    expect((noTarget.match(/<svg/g) ?? []).length).toBe(expectedChartCount(loadFixture("no-target")));
    expect(expectedChartCount(loadFixture("binary"))).toBe(13); // 9 coverage + 3 funnel + 1 collision
    expect(section(binary, 8)).toContain("Hash collisions against width");
    expect(section(binary, 2)).toContain("No charts: fewer than two levels.");
    expect(section(binary, 11)).toContain("No charts: not profiled as levels.");
  });

  it("has the overview, the override, the notes and the standing cautions", () => {
    expect(binary).toContain(`<td><a href="#col-8">referral_source</a></td>`);
    expect(binary).toContain(`<span class="override">(overridden by the user, was target-kfold)</span>`);
    expect(noTarget).toContain(`<p class="note">Level values are redacted in this profile`);
    expect(binary).toContain("<h2>Cautions</h2>");
    expect(binary).toMatch(/proxies for protected characteristics/);
    expect(binary).toMatch(/credit, insurance, employment, housing, health/);
    expect(binary).toContain("--redact");
  });

  it("renders a profile without columns", async () => {
    const html = await renderHtmlReport({ ...loadFixture("no-target"), columns: [] });
    expect(html).toContain("No columns were profiled.");
    expect(html).not.toContain("<svg");
  });
});
