/**
 * engine/csvDialect + engine/source: the CSV layout is detected once and pinned in the view
 * `tailsift_src`. The reference is DuckDB's own read of the same files with the read_csv options
 * tailsift passed before the layout was pinned (written out here, not taken from src/): DuckDB
 * then detects the layout itself in every statement. The pinned view must return exactly the same
 * columns and rows (or, for rows past DuckDB's detection sample, the same error).
 */
import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";
import { sniffDialect } from "../../src/engine/csvDialect.js";
import { withEngine, type Engine } from "../../src/engine/db.js";
import { countSkippedRows, MAX_LINE_BYTES, openSource, type SourceOptions } from "../../src/engine/source.js";
import { quoteLiteral, quoteLiteralList } from "../../src/engine/sql.js";
import { mulberry32, tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("csvdialect");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** The read tailsift made before pinning: DuckDB detects the layout (the options of source.ts then). */
function detectingReader(files: readonly string[], o: SourceOptions = {}): string {
  const parts = [quoteLiteralList(files), "header = true", "all_varchar = true", `union_by_name = ${!o.skipBadRows}`,
    `max_line_size = ${MAX_LINE_BYTES}`, `buffer_size = ${32 * 2 ** 20}`];
  const delim = o.delimiter ?? (files[0]?.endsWith(".tsv") ? "\t" : undefined);
  if (delim !== undefined) parts.push(`delim = ${quoteLiteral(delim)}`);
  if (o.encoding !== undefined) parts.push(`encoding = ${quoteLiteral(o.encoding)}`);
  if (o.skipBadRows) parts.push("ignore_errors = true", "store_rejects = true");
  return `read_csv(${parts.join(", ")})`;
}

type Outcome = { columns: string[]; rows: unknown[][] } | { error: string };

async function outcome(engine: Engine, from: string): Promise<Outcome> {
  try {
    const described = await engine.rows<{ column_name: string }>(`DESCRIBE SELECT * FROM ${from}`, "reading");
    const columns = described.map((d) => d.column_name);
    const rows = await engine.rows<Record<string, unknown>>(`SELECT * FROM ${from}`, "reading");
    return { columns, rows: rows.map((r) => columns.map((c) => r[c])) };
  } catch (err) {
    return { error: (err as Error).message };
  }
}

/** The view's outcome and its SQL, and the detecting reader's outcome in a fresh engine. */
async function compare(files: string[], o: SourceOptions = {}, inputs: string[] = files) {
  const pinned = await withEngine({ threads: 2 }, async (engine) => {
    await openSource(engine, inputs, o);
    const [view] = await engine.rows<{ sql: string }>("SELECT sql FROM duckdb_views() WHERE view_name = 'tailsift_src'", "reading the view");
    return { sql: view?.sql ?? "", result: await outcome(engine, "tailsift_src") };
  });
  const detected = await withEngine({ threads: 2 }, (engine) => outcome(engine, detectingReader(files, o)));
  return { ...pinned, detected };
}

const rfcQuote = (v: string, delim: string, q = '"') =>
  v.includes(delim) || v.includes(q) || v.includes("\n") ? `${q}${v.replaceAll(q, q + q)}${q}` : v;
const lines = (n: number, row: (i: number) => string) => Array.from({ length: n }, (_, i) => row(i)).join("\n");

/** `pins`: read_csv options the view's SQL must hold, as DuckDB prints them back (`quote = '"'`). */
interface Case { name: string; text: string | Buffer; options?: SourceOptions; pins: string[]; fails?: true }

/** The read_csv options of a view's SQL as DuckDB prints them back, without the quotes around some names. */
const optionsOf = (sql: string) => [...sql.replace(/\("?(\w+)"? = /g, "($1 = ").matchAll(/\((\w+ = [^()]*(?:\([^()]*\))?[^()]*)\)/g)].map((m) => m[1]);
const DIALECT = ["delim", "quote", "escape", "new_line", "comment", "skip"];

const CASES: Case[] = [
  { name: "semi.csv", text: `clinic;visit;note\nnorth;1;"a;b"\nsouth;2;"say ""hi"""\n${lines(50, (i) => `c${i % 4};${i};n${i}`)}\n`,
    pins: [`delim = ';'`, `quote = '"'`, `escape = '"'`] },
  { name: "squote.csv", text: `pet,owner\n'cat, tabby',ann\n'it''s',bo\n${lines(30, (i) => `'p${i}',o${i % 3}`)}\n`,
    pins: [`delim = ','`, `quote = ''''`, `escape = ''''`] },
  { name: "newlines.csv", text: `id,note\n1,"first line\nsecond, line"\n2,"x ""y"""\n${lines(40, (i) => `${i + 3},"n\n${i}"`)}\n`,
    pins: [`quote = '"'`, `escape = '"'`, `new_line = '\\n'`] },
  { name: "tabs.tsv", text: `species\tweight\tnote\ncat\t4.2\ta, b\ndog\t\t"q"\n${lines(30, (i) => `s${i % 5}\t${i}\tx`)}\n`,
    pins: [`delim = '\t'`] },
  { name: "header-only.csv", text: "clinic,species,visits\n", pins: [`delim = ','`] },
  { name: "one-column.csv", text: `species\ncat\ndog\n\nferret\n${lines(30, (i) => `s${i % 4}`)}\n`, pins: [`skip = 0`] },
  { name: "gz.csv.gz", text: zlib.gzipSync(`a,b\n1,"x,y"\n${lines(40, (i) => `${i},v${i % 3}`)}\n`), pins: [`quote = '"'`] },
  { name: "crlf.csv", text: `a,b\r\n1,x\r\n${lines(20, (i) => `${i},y`).replaceAll("\n", "\r\n")}\r\n`, pins: [`new_line = '\\r\\n'`] },
  { name: "comments.csv", text: `# exported by the front desk\na,b\n1,x\n# a note\n${lines(20, (i) => `${i},y${i % 2}`)}\n`, pins: [`comment = '#'`] },
  { name: "preamble.csv", text: `appointment log\n\na,b,c\n${lines(30, (i) => `${i},${i % 3},z`)}\n`, pins: [`skip = 2`] },
  { name: "backslash.csv", text: `a,b\n1,"x\\"y"\n2,"p\\\\q"\n${lines(20, (i) => `${i},"w"`)}\n`, pins: [`escape = '\\'`] },
  { name: "pipes.csv", text: `a|b|c\n1|2|3\n${lines(20, (i) => `${i}|x|"y|z"`)}\n`, pins: [`delim = '|'`] },
  { name: "bom.csv", text: `\ufeffclinic,visits\nnorth,3\n${lines(20, (i) => `c${i},${i}`)}\n`, pins: [`delim = ','`] },
  { name: "latin1.csv", text: Buffer.from(`pet,owner\nchat,Ren\u00e9e\n${lines(20, (i) => `p${i},caf\u00e9`)}\n`, "latin1"),
    options: { encoding: "latin-1" }, pins: [`encoding = 'latin-1'`, `quote = ''`] },
  { name: "utf16.csv", text: Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(`pet,owner\n"cat, tabby",Ren\u00e9e\n${lines(20, (i) => `p${i},o`)}\n`, "utf16le")]),
    options: { encoding: "utf-16" }, pins: [`encoding = 'utf-16'`, `quote = '"'`] },
  { name: "given-delimiter.csv", text: `a;b,c\n1;2,3\n${lines(20, (i) => `${i};x,y`)}\n`, options: { delimiter: "," }, pins: [`delim = ','`, `quote = ''`] },
  // past DuckDB's 20,480-row detection sample: a quote it did not see, a doubled quote, a ragged row
  { name: "late-quote.csv", text: `a,b\n${lines(25000, (i) => `${i},v${i % 7}`)}\n1,"x,y"\n`, pins: [`quote = ''`], fails: true },
  { name: "late-doubled.csv", text: `a;b\n1;"p;q"\n${lines(25000, (i) => `${i};v${i % 7}`)}\n2;"say ""hi"""\n`, pins: [`quote = '"'`, `escape = '"'`] },
  { name: "late-ragged.csv", text: `a,b\n${lines(25000, (i) => `${i},v`)}\n1,2,3\n`, pins: [`delim = ','`], fails: true },
  { name: "skip-bad.csv", text: `a,b,c\n${lines(300, (i) => (i % 37 === 5 ? `${i},x` : `${i},x,y`))}\n`, options: { skipBadRows: true }, pins: [`ignore_errors = CAST('t' AS BOOLEAN)`, `quote = ''`] },
];

/** A seeded CSV with fields that need quoting (delimiters, quotes, newlines), in one of four dialects. */
function randomCsv(seed: number): { text: string; delim: string } {
  const rand = mulberry32(seed);
  const delim = [",", ";", "\t", "|"][Math.floor(rand() * 4)]!;
  const alphabet = ["a", "b", "Z", " ", "7", delim, '"', "\n", "é", ",", ";"];
  const field = () => Array.from({ length: Math.floor(rand() * 6) }, () => alphabet[Math.floor(rand() * alphabet.length)]).join("");
  const cols = 2 + Math.floor(rand() * 6);
  const header = Array.from({ length: cols }, (_, j) => `col${String.fromCharCode(97 + j)}`).join(delim);
  const body = lines(200 + Math.floor(rand() * 200), (i) => [`r${i}`, ...Array.from({ length: cols - 1 }, field)].map((v) => rfcQuote(v, delim)).join(delim));
  return { text: `${header}\n${body}\n`, delim };
}

describe("the CSV layout is detected once and pinned in the input view", () => {
  it.each(CASES)("$name: the view names the layout and returns what DuckDB's detecting read returns", async (c) => {
    const file = writeFile(dir, c.name, c.text);
    const { sql, result, detected } = await compare([file], c.options);
    const pinned = optionsOf(sql);
    expect(DIALECT.filter((name) => !pinned.some((o) => o.startsWith(`${name} = `)))).toEqual([]);
    for (const pin of c.pins) expect(pinned).toContain(pin);
    expect(result).toEqual(detected);
    if (c.fails) expect(result).toHaveProperty("error", expect.stringMatching(/^cannot read '.*' line 25002: expected 2 fields, found 3/));
    else expect(result).toHaveProperty("rows");
  });

  it.each([1, 2, 3, 4, 5, 6, 7, 8])("random quoted fields, seed %i: same rows as the detecting read", async (seed) => {
    const { text, delim } = randomCsv(seed);
    const file = writeFile(dir, `random-${seed}.csv`, text);
    const { sql, result, detected } = await compare([file]);
    expect(optionsOf(sql)).toContain(`delim = ${quoteLiteral(delim)}`);
    expect(result).toEqual(detected);
    expect((result as { rows: unknown[][] }).rows.length).toBeGreaterThanOrEqual(200);
  });

  it("--skip-bad-rows counts the same skipped rows as DuckDB's detecting read records", async () => {
    const file = writeFile(dir, "skip-count.csv", `a,b,c\n${lines(500, (i) => (i % 41 === 3 ? `${i},x,y,z` : `${i},"x,${i}",y`))}\n`);
    const skipped = await withEngine({ threads: 2 }, async (engine) => {
      const source = await openSource(engine, [file], { skipBadRows: true });
      await engine.rows(`SELECT count(*) FROM ${source.view}`, "reading");
      return countSkippedRows(engine, source);
    });
    const recorded = await withEngine({ threads: 2 }, async (engine) => {
      await engine.rows(`SELECT count(*) FROM ${detectingReader([file], { skipBadRows: true })}`, "reading");
      const [r] = await engine.rows<{ n: number }>("SELECT count(DISTINCT line) AS n FROM reject_errors", "counting");
      return r?.n;
    });
    expect(skipped).toBe(recorded);
    expect(skipped).toBe(Math.floor((500 - 3 - 1) / 41) + 1);
  });
});

describe("several files", () => {
  it("files of one layout, columns in different orders: pinned, the same rows as the detecting read", async () => {
    const files = [
      writeFile(dir, "m-1.csv", `clinic;species\nnorth;"cat;tabby"\n${lines(20, (i) => `c${i};s`)}\n`),
      writeFile(dir, "m-2.csv", `species;clinic;extra\n"dog";south;1\n${lines(20, (i) => `s${i};c;${i}`)}\n`),
      writeFile(dir, "m-3.csv", `clinic;species\neast;"ferret"\n`),
    ];
    const { sql, result, detected } = await compare(files);
    expect(optionsOf(sql)).toEqual(expect.arrayContaining([`delim = ';'`, `quote = '"'`]));
    expect(result).toEqual(detected);
    expect((result as { columns: string[] }).columns).toEqual(["clinic", "species", "extra"]);
  });

  it("files whose layouts differ: nothing pinned, each file read with its own layout as before", async () => {
    const files = [
      writeFile(dir, "d-1.csv", `clinic,species\nnorth,cat\nsouth,dog\n`),
      writeFile(dir, "d-2.csv", `clinic;species\neast;"fer;ret"\nwest;bird\n`),
    ];
    const { sql, result, detected } = await compare(files);
    expect(optionsOf(sql).filter((o) => /^(quote|escape|new_line|skip) = /.test(o))).toEqual([]);
    expect(optionsOf(sql)).toContain("union_by_name = CAST('t' AS BOOLEAN)");
    expect(result).toEqual(detected);
    expect((result as { rows: unknown[][] }).rows).toContainEqual(["east", "fer;ret"]);
  });

  it("a glob of files with --skip-bad-rows: pinned, same rows as the detecting read", async () => {
    const sub = path.join(dir, "glob");
    fs.mkdirSync(sub);
    for (let f = 0; f < 3; f++) writeFile(sub, `part-${f}.csv`, `a,b\n${lines(30, (i) => (i === 7 + f ? `${i}` : `${i},"v,${f}"`))}\n`);
    const files = fs.readdirSync(sub).map((n) => path.join(sub, n)).sort();
    const { sql, result, detected } = await compare(files, { skipBadRows: true }, [path.join(sub, "*.csv")]);
    expect(optionsOf(sql)).toEqual(expect.arrayContaining([`quote = '"'`, "store_rejects = CAST('t' AS BOOLEAN)"]));
    expect(result).toEqual(detected);
    expect((result as { rows: unknown[][] }).rows).toHaveLength(87);
  });

  it("sniffDialect: one layout for files that share it, none when they differ or one cannot be read", async () => {
    const opts = ["header = true", "all_varchar = true"];
    const a = writeFile(dir, "s-a.csv", "x;y\n1;\"2\"\n");
    const b = writeFile(dir, "s-b.csv", "x;y\n3;\"4;5\"\n");
    const c = writeFile(dir, "s-c.csv", "x,y\n3,4\n");
    await withEngine({ threads: 1 }, async (engine) => {
      const ab = await sniffDialect(engine, [a, b], opts);
      expect(ab).toMatchObject({ delim: ";", newLine: "\\n", comment: "", skip: 0 });
      expect(await sniffDialect(engine, [a, c], opts)).toBeNull();
      expect(await sniffDialect(engine, [a, path.join(dir, "missing.csv")], opts)).toBeNull();
    });
  });
});
