/**
 * DuckDB's reach: no extension auto-install/auto-load, and with `lockToPaths` no file access
 * beyond the named inputs, the output folder and the temp folder (DuckDB 1.5:
 * allowed_directories / allowed_paths, then enable_external_access = false, which cannot be
 * switched back on while the database runs — all three measured here, not assumed).
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { scan } from "../../src/commands/scan.js";
import { allowedPaths, withEngine } from "../../src/engine/db.js";
import { openSource } from "../../src/engine/source.js";
import { tempDir, writeFile } from "../helpers/tmp.js";

const dir = tempDir("lock");
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const input = writeFile(dir, "visits.csv", "clinic,y\nNorth,1\nSouth,0\nNorth,0\nSouth,1\n");
const outside = writeFile(tempDir("lock-outside"), "secret.csv", "clinic\nHidden\n");
afterAll(() => fs.rmSync(path.dirname(outside), { recursive: true, force: true }));

describe("extensions", () => {
  it("auto-install and auto-load are off; INSTALL and LOAD fail under the lock", async () => {
    await withEngine({}, async (e) => {
      const [s] = await e.rows<{ i: boolean; l: boolean }>(
        "SELECT current_setting('autoinstall_known_extensions') AS i, current_setting('autoload_known_extensions') AS l", "reading settings");
      expect(s).toEqual({ i: false, l: false });
    });
    await withEngine({ lockToPaths: [input] }, async (e) => {
      await expect(e.run("INSTALL httpfs", "installing")).rejects.toMatchObject({ exitCode: 2 });
      await expect(e.run("LOAD httpfs", "loading")).rejects.toMatchObject({ exitCode: 2 });
    });
  });
});

describe("lockToPaths", () => {
  it("reads the named input; other files are refused with one line; the lock cannot be lifted", async () => {
    await withEngine({ lockToPaths: [input] }, async (e) => {
      const source = await openSource(e, [input]);
      const [n] = await e.rows<{ n: number }>(`SELECT count(*) AS n FROM ${source.view}`, "counting");
      expect(n?.n).toBe(4);
      await expect(e.rows("SELECT * FROM read_csv($p)", "reading another file", { p: outside }))
        .rejects.toMatchObject({ code: "path_not_allowed", message: expect.stringContaining(outside) });
      await expect(openSource(e, [outside])).rejects.toMatchObject({ code: "path_not_allowed" });
      await expect(e.run(`COPY (SELECT 1 AS x) TO '${path.join(dir, "written.csv")}'`, "writing")).rejects.toMatchObject({ code: "path_not_allowed" });
      expect(fs.existsSync(path.join(dir, "written.csv"))).toBe(false);
      await expect(e.run("SET enable_external_access = true", "unlocking")).rejects.toMatchObject({ exitCode: 2 });
      await expect(e.run("SET allowed_directories = ['/']", "widening")).rejects.toMatchObject({ exitCode: 2 });
    });
  });

  it("a scan writes levels.parquet into an allowed output folder, and only there", async () => {
    const out = path.join(dir, "plan");
    fs.mkdirSync(out);
    const p = await scan([input], { target: "y", lockToPaths: [input, out], levelTableOut: path.join(out, "levels.parquet") });
    expect(p.input.rows).toBe(4);
    expect(fs.existsSync(path.join(out, "levels.parquet"))).toBe(true);
    const elsewhere = path.join(dir, "elsewhere");
    fs.mkdirSync(elsewhere);
    await expect(scan([input], { target: "y", lockToPaths: [input, out], levelTableOut: path.join(elsewhere, "levels.parquet") }))
      .rejects.toMatchObject({ code: "path_not_allowed" });
    expect(fs.readdirSync(elsewhere)).toEqual([]);
  });

  it("globs, folders of Parquet, relative paths with '..' and --skip-bad-rows work under the lock", async () => {
    const shards = path.join(dir, "shards");
    fs.mkdirSync(shards);
    writeFile(shards, "a.csv", "clinic\nNorth\n");
    writeFile(shards, "b.csv", "clinic\nSouth\nSouth\nNorth,extra\n");
    const glob = path.join(shards, "*.csv");
    expect((await scan([glob], { lockToPaths: [glob], skipBadRows: true })).input.rows).toBe(3);

    const parquet = path.join(dir, "pq");
    fs.mkdirSync(parquet);
    await withEngine({}, (e) => e.run(`COPY (SELECT 'North' AS clinic UNION ALL SELECT 'South') TO '${path.join(parquet, "part.parquet")}' (FORMAT parquet)`, "writing"));
    expect((await scan([parquet], { lockToPaths: [parquet] })).input.rows).toBe(2);

    const relative = path.relative(process.cwd(), input);
    expect(relative.startsWith("..")).toBe(true);
    expect((await scan([relative], { lockToPaths: [relative] })).input.rows).toBe(4);
  });

  it("allows a glob's fixed folder, a folder (with a trailing separator), a file, and the temp folder", () => {
    const allowed = allowedPaths([path.join(dir, "shards", "*.csv"), input, path.join(dir, "new-out")], "/tmp/spill");
    expect(allowed.files).toContain(input);
    expect(allowed.directories).toEqual(expect.arrayContaining([`${path.join(dir, "shards")}/`, `${path.join(dir, "new-out")}/`, "/tmp/spill/"]));
    expect(allowed.directories).not.toContain(`${dir}/`);
  });
});
