import { describe, expect, it } from "vitest";
import { citationQueryOrThrow, negotiateCitationFormat, parseCitationQueryOrThrow } from "@/lib/citation/request";
import { AppError } from "@/lib/errors";

describe("negotiateCitationFormat (RFC 9110 §12.5.1: highest q, then the order written)", () => {
  it.each([
    ["application/x-bibtex", "bibtex"],
    ["application/x-research-info-systems", "ris"],
    ["application/vnd.citationstyles.csl+json", "csl-json"],
    ["text/x-bibliography; style=apa", "text"],
    ["application/x-bibtex;q=0.5, application/x-research-info-systems", "ris"],
    ["application/x-research-info-systems, application/x-bibtex", "ris"],
    ["APPLICATION/X-BIBTEX", "bibtex"],
    ["application/x-bibtex;q=0", null],
    ["text/html", null],
    [null, null],
  ])("%s → %s", (accept, format) => expect(negotiateCitationFormat(accept)).toBe(format));
});

describe("citationQueryOrThrow", () => {
  const req = (url: string, accept?: string) => new Request(url, accept ? { headers: { accept } } : undefined);
  it("reads the API's query, with its defaults (BibTeX, APA, every version)", () => {
    expect(citationQueryOrThrow(req("http://x/api/v1/datasets/3/citation?format=ris&version=2"))).toEqual({
      format: "ris",
      style: "apa",
      version: 2,
    });
    expect(citationQueryOrThrow(req("http://x/api/v1/datasets/3/citation"))).toEqual({ format: "bibtex", style: "apa" });
  });
  it("on a dataset page's URL, takes the format from Accept and the version from the path, ignoring the page's own query", () => {
    expect(citationQueryOrThrow(req("http://x/datasets/3/v2?k=L+mol-1+s-1", "application/x-bibtex"))).toEqual({
      format: "bibtex",
      style: "apa",
      version: 2,
    });
    expect(citationQueryOrThrow(req("http://x/datasets/3?style=acs", "text/x-bibliography"))).toEqual({ format: "text", style: "acs" });
    expect(() => citationQueryOrThrow(req("http://x/datasets/3/v2", "text/html"))).toThrow(AppError);
  });
  it("names the parameter of a 400", () => {
    try {
      parseCitationQueryOrThrow(new URLSearchParams("style=chicago&extra=1"));
      expect.unreachable();
    } catch (e) {
      expect((e as AppError).status).toBe(400);
      expect((e as AppError).errors.map((x) => x.parameter).sort()).toEqual(["extra", "style"]);
    }
  });
});
