import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  escapeHtml, escapeMarkdownCell, escapeMarkdownText, neutraliseFormula, showControlCharacters,
} from "../../src/render/escape.js";

describe("escapeHtml", () => {
  it("encodes the five HTML-significant characters (OWASP XSS Prevention Cheat Sheet, output encoding)", () => {
    expect(escapeHtml(`<script>alert("x") & 'y'</script>`))
      .toBe("&lt;script&gt;alert(&quot;x&quot;) &amp; &#39;y&#39;&lt;/script&gt;");
    expect(escapeHtml("")).toBe("");
    expect(escapeHtml("plain text")).toBe("plain text");
  });
  it("leaves no markup character in any string", () => {
    fc.assert(fc.property(fc.string(), (s) => !/[<>"']/.test(escapeHtml(s))));
  });
  it("is reversible: decoding the entities gives the input back", () => {
    const decode = (t: string) => t.replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&quot;/g, '"')
      .replace(/&#39;/g, "'").replace(/&amp;/g, "&");
    fc.assert(fc.property(fc.string(), (s) => decode(escapeHtml(s)) === s));
  });
});

describe("neutraliseFormula", () => {
  // OWASP "CSV Injection": cells starting with = + - @ tab or carriage return are prefixed with '.
  it("prefixes cells that a spreadsheet would evaluate", () => {
    expect(neutraliseFormula("=cmd|' /C calc'!A0")).toBe("'=cmd|' /C calc'!A0");
    expect(neutraliseFormula("+44 20")).toBe("'+44 20");
    expect(neutraliseFormula("-5")).toBe("'-5");
    expect(neutraliseFormula("@SUM(A1)")).toBe("'@SUM(A1)");
    expect(neutraliseFormula("\t=1")).toBe("'\t=1");
    expect(neutraliseFormula("\r=1")).toBe("'\r=1");
  });
  it("leaves other cells alone", () => {
    expect(neutraliseFormula("a=b")).toBe("a=b");
    expect(neutraliseFormula("")).toBe("");
    expect(neutraliseFormula("dog")).toBe("dog");
  });
});

describe("Markdown escaping", () => {
  it("escapes pipes, backticks and markup with CommonMark backslash escapes (CommonMark spec 2.4)", () => {
    expect(escapeMarkdownCell("a|b")).toBe("a\\|b");
    expect(escapeMarkdownCell("`rm -rf`")).toBe("\\`rm -rf\\`");
    expect(escapeMarkdownCell("<script>")).toBe("\\<script\\>");
    expect(escapeMarkdownCell("*x* _y_ [z](u)")).toBe("\\*x\\* \\_y\\_ \\[z\\](u)");
    expect(escapeMarkdownCell("back\\slash")).toBe("back\\\\slash");
  });
  it("shows newlines and other control characters as C-style escapes (common practice)", () => {
    expect(escapeMarkdownCell("line1\nline2")).toBe("line1\\nline2"); // source: line1\nline2
    expect(showControlCharacters("a\tb\r\u001b\u007f")).toBe("a\\tb\\r\\x1b\\x7f");
    // A typed backslash-n stays distinguishable from a newline in the Markdown source.
    expect(escapeMarkdownText("a\\nb")).toBe("a\\\\nb");
  });
  it("neutralises a leading formula character in table cells but not in prose", () => {
    expect(escapeMarkdownCell("=cmd")).toBe("'=cmd");
    expect(escapeMarkdownText("=cmd")).toBe("=cmd");
  });
  it("never lets a value end a line or a table cell", () => {
    // A pipe ends a GFM cell unless preceded by an odd number of backslashes.
    const unescapedPipe = /(^|[^\\])(\\\\)*\|/;
    fc.assert(fc.property(fc.string({ unit: "binary" }), (s) => {
      const cell = escapeMarkdownCell(s);
      return !/[\r\n]/.test(cell) && !unescapedPipe.test(cell);
    }));
  });
});
