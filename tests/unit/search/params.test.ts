import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { DEFAULT_REQUEST, parseSearchParams, parseSearchParamsOrThrow, toSearchParams } from "@/lib/search/params";

const errorsOf = (params: Record<string, string | string[]>, strict = false) => {
  const r = parseSearchParams(params, { strict });
  return r.ok ? [] : r.errors;
};

describe("parseSearchParams", () => {
  it("gives the defaults for an empty query string", () => {
    expect(parseSearchParams(new URLSearchParams(""))).toEqual({ ok: true, request: DEFAULT_REQUEST });
  });

  it("reads every parameter", () => {
    const r = parseSearchParamsOrThrow(
      new URLSearchParams(
        "q=+OH+%2B+CH4+&view=reactions&sort=widest&limit=50&class=hydrogen-abstraction,addition&phase=gas&method=experiment&method=theory&bathGas=He&bathGas=N2&licence=CC0-1.0&flag=curved&creator=Tanaka,%20E.&tMin=200&tMax=400&tCovers=true&pMin=0&pMax=1e5&yearMin=1990&yearMax=2026",
      ),
    );
    expect(r).toEqual({
      q: "OH + CH4",
      view: "reactions",
      sort: "widest",
      limit: 50,
      cursor: null,
      filters: {
        reactionClass: ["hydrogen-abstraction", "addition"],
        phase: ["gas"],
        methodCategory: ["experiment", "theory"],
        bathGas: ["He", "N2"],
        licence: ["CC0-1.0"],
        flags: ["curved"],
        // Free-text values are never split at commas (names hold them).
        creator: ["Tanaka, E."],
        tMin: 200,
        tMax: 400,
        tCovers: true,
        pMin: 0,
        pMax: 1e5,
        yearMin: 1990,
        yearMax: 2026,
      },
    });
  });

  it("reads a retired class id as the current one", () => {
    expect(parseSearchParamsOrThrow({ class: "h_abstraction" }).filters.reactionClass).toEqual(["hydrogen-abstraction"]);
  });

  it("treats empty values as not set (a form sends its blank fields)", () => {
    expect(parseSearchParamsOrThrow({ q: "", tMin: "", view: "", class: "" })).toEqual(DEFAULT_REQUEST);
  });

  it.each([
    [{ q: "x".repeat(501) }, "q"],
    [{ q: "a\u0000b" }, "q"],
    [{ view: "table" }, "view"],
    [{ sort: "oldest" }, "sort"],
    [{ limit: "0" }, "limit"],
    [{ limit: "101" }, "limit"],
    [{ limit: "2.5" }, "limit"],
    [{ class: "made-up" }, "class"],
    [{ phase: "plasma" }, "phase"],
    [{ method: "guess" }, "method"],
    [{ licence: "MIT" }, "licence"],
    [{ flag: "odd" }, "flag"],
    [{ tMin: "-5" }, "tMin"],
    [{ tMax: "hot" }, "tMax"],
    [{ tMin: "0x10" }, "tMin"],
    [{ pMin: "Infinity" }, "pMin"],
    [{ tMin: "400", tMax: "300" }, "tMax"],
    [{ pMin: "2", pMax: "1" }, "pMax"],
    [{ yearMin: "2000.5" }, "yearMin"],
    [{ yearMin: "2147483648" }, "yearMin"],
    [{ yearMax: "1e20" }, "yearMax"],
    [{ yearMin: "2020", yearMax: "2010" }, "yearMax"],
    [{ tCovers: "yes" }, "tCovers"],
    [{ tCovers: "true", tMin: "300" }, "tCovers"],
    [{ view: ["datasets", "reactions"] }, "view"],
  ])("refuses %j naming %s", (params, parameter) => {
    const errors = errorsOf(params as Record<string, string>);
    expect(errors.map((e) => e.parameter)).toEqual([parameter]);
    expect(errors[0].pointer).toBe(`/${parameter}`);
    expect(errors[0].message).toMatch(new RegExp(parameter));
  });

  it("names an unknown value and the allowed ones", () => {
    const [error] = errorsOf({ flag: "curved,wobbly" });
    expect(error.message).toContain("“wobbly”");
    expect(error.message).toContain("“outliers”");
  });

  it("refuses unknown parameters only when strict (the API)", () => {
    expect(errorsOf({ tmin: "300" })).toEqual([]);
    expect(errorsOf({ tmin: "300" }, true).map((e) => e.parameter)).toEqual(["tmin"]);
  });

  it("throws one 400 problem listing every parameter at fault", () => {
    try {
      parseSearchParamsOrThrow({ view: "x", limit: "0" });
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(AppError);
      expect((err as AppError).status).toBe(400);
      expect((err as AppError).errors.map((e) => e.parameter)).toEqual(["view", "limit"]);
    }
  });
});

describe("toSearchParams", () => {
  it("leaves defaults out", () => {
    expect(toSearchParams(DEFAULT_REQUEST).toString()).toBe("");
  });

  it("round-trips a full request", () => {
    const request = parseSearchParamsOrThrow({
      q: "CH4 -> CH3",
      view: "reactions",
      sort: "points",
      limit: "10",
      class: "addition,other",
      creator: ["Varga, B.", "Emi Tanaka"],
      bathGas: "He",
      tMin: "250.5",
      tMax: "300",
      tCovers: "1",
      yearMin: "2001",
      cursor: "abc.def",
    });
    expect(parseSearchParamsOrThrow(toSearchParams(request))).toEqual(request);
    expect(toSearchParams(request, { cursor: false }).has("cursor")).toBe(false);
  });
});
