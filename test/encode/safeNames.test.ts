/**
 * The safe output-name rule (encode/safeNames), checked case by case against the rule as the
 * task states it (runs of characters outside [A-Za-z0-9_] → one `_`, trim `_`, `col` when
 * empty, `c_` before a leading digit, then `_2`, `_3`, … for names taken case-insensitively, in
 * output order). Scoring SQL written elsewhere must give the same names; these cases are its
 * contract. The rule is our own (no external source): docs/references.md "Encode output".
 */
import { describe, expect, it } from "vitest";
import { safeName, safeOutputNames } from "../../src/encode/safeNames.js";

describe("safeName", () => {
  it.each([
    ["clinic=Yarrowby Vets 24", "clinic_Yarrowby_Vets_24"],
    ["booking_channel=walk-in", "booking_channel_walk_in"],
    ["amount", "amount"],
    ["shop__text", "shop__text"], // `_` is kept, runs of it too
    ["a  =  b", "a_b"], // one run → one `_`
    ["__x__", "x"],
    ["=", "col"],
    ["", "col"],
    ["7up", "c_7up"],
    ["=7", "c_7"], // trimmed first, then the digit rule
    ["größe=groß", "gr_e_gro"], // non-ASCII letters are outside [A-Za-z0-9_]
    ["=HYPERLINK(\"http://x\")", "HYPERLINK_http_x"],
  ])("%j → %j", (raw, safe) => {
    expect(safeName(raw)).toBe(safe);
    expect(safe).toMatch(/^[A-Za-z_][A-Za-z0-9_]*$/);
  });
});

describe("safeOutputNames", () => {
  it("makes names unique case-insensitively in output order with _2, _3, …", () => {
    expect(safeOutputNames(["a b", "a_b", "A-B", "fold"])).toEqual(["a_b", "a_b_2", "A_B_3", "fold"]);
  });
  it("skips a suffix that is already taken by a later-looking raw name", () => {
    expect(safeOutputNames(["x_2", "x", "x"])).toEqual(["x_2", "x", "x_3"]);
  });
  it("gives `col`, `col_2` for names with no usable character, and is pure", () => {
    const raw = ["=", "+", "", "9"];
    expect(safeOutputNames(raw)).toEqual(["col", "col_2", "col_3", "c_9"]);
    expect(safeOutputNames(raw)).toEqual(safeOutputNames([...raw]));
  });
});
