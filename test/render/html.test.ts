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
    expect(svgs.length).toBe(3); // coverage curve, funnel plot and evidence chart
    expect(svgs[1]).toMatch(/<text[^>]*>&lt;script&gt;alert\(1\)&lt;\/scrip…<\/text>/); // funnel label
    expect(svgs[1]).toContain(`aria-label="&lt;script&gt;alert(1)&lt;/script&gt;: 20,235 rows, 31.0 % (outside 99.8 %)"`); // point description
  });

  it("holds one SVG per expected chart: coverage, funnel with a target, collision with hashing, evidence", () => {
    expect((binary.match(/<svg/g) ?? []).length).toBe(expectedChartCount(loadFixture("binary")));
    expect((noTarget.match(/<svg/g) ?? []).length).toBe(expectedChartCount(loadFixture("no-target")));
    expect(expectedChartCount(loadFixture("binary"))).toBe(16); // 9 coverage + 3 funnel + 1 collision + 3 evidence
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

  it("shows the out-of-fold evidence as a table (best and chosen marked) beside its chart, and the structure", () => {
    const postcode = section(binary, 6);
    expect(postcode).toContain("<h3>Evidence (out-of-fold)</h3>");
    expect(postcode).toContain(`<tr class="chosen"><td>backoff grouping then target encoding</td>`);
    expect(postcode).toContain(`<tr class="best"><td>target encoding with a hierarchical prior</td>`);
    expect(postcode).toContain(`<td class="num">0.35760</td><td class="num">0.00172</td><td class="num">0.590</td><td class="mark">chosen</td>`);
    expect(postcode).toMatch(/<text[^>]*>Candidates' out-of-fold loss, ±1 standard error<\/text>/); // the chart title, in the SVG
    expect(postcode).toContain("<p>One-standard-error threshold: 0.35858 (the best loss plus its standard error); 5 folds, 119,640 rows scored.</p>");
    expect(postcode).toContain("<h3>Structure</h3>");
    expect(postcode).toContain(`<tr><td>first 1 token (split on &#39; &#39;) — prior parent</td><td class="num">460</td><td class="num">98.1 %</td><td class="num">176</td></tr>`);
    expect(postcode).toContain(`<tr><th scope="row">rows backed off to a parent</th><td>20.1 %</td></tr>`);
    expect(section(binary, 7)).not.toContain("Evidence (out-of-fold)");
    expect(section(binary, 10)).toContain(`<tr class="chosen best"><td>target encoding</td>`);
  });

  it("puts the evidence beside an overriding user's choice", () => {
    expect(section(binary, 8)).toContain(`<p class="note">The user chose hashing; the evidence favoured pooled one-hot.</p>`);
    expect(section(binary, 6)).not.toContain("The user chose");
  });

  it("HTML-escapes level values kept by the pooled candidate", async () => {
    expect(section(binary, 10)).toContain(`<td class="params">keep 15 (&quot;&lt;script&gt;alert(1)&lt;/scrip…&quot;, &quot;Tom &amp; &quot;Jerry&quot;&quot;, &quot;a|b&quot;, …)`);
    const profile = loadFixture("binary");
    const pooled = profile.columns[9]!.evidence!.candidates[1]!;
    pooled.params = { ...pooled.params, keep: ["line1\nline2", "=cmd|' /C calc'!A0", "<b>x</b>"] };
    expect(section(await renderHtmlReport(profile), 10))
      .toContain(`keep 3 (&quot;line1<span class="ctl">\\n</span>line2&quot;, &quot;=cmd|&#39; /C calc&#39;!A0&quot;, &quot;&lt;b&gt;x&lt;/b&gt;&quot;) + other`);
  });

  it("shows the main reason in the overview, linked to the rest", () => {
    expect(binary).toContain(`<a class="more" href="#col-6">(3 more)</a>`);
    expect(binary).toContain(`<td class="reasons">The target column.</td>`);
  });

  it("renders a profile without columns", async () => {
    const html = await renderHtmlReport({ ...loadFixture("no-target"), columns: [] });
    expect(html).toContain("No columns were profiled.");
    expect(html).not.toContain("<svg");
  });
});
