import { describe, expect, it } from "vitest";
import { citationQueryOrThrow, negotiateCitationFormat, parseCitationQueryOrThrow } from "@/lib/citation/request";
import { AppError } from "@/lib/errors";
import { citationRewriteTarget, negotiateDatasetPage, varyOfAnswer } from "@/lib/http/content-negotiation";

const acceptRewritesToCitation = (accept: string) => negotiateDatasetPage(accept) !== "html";

describe("negotiateCitationFormat (RFC 9110 §12.5.1: highest q, then the more specific, then the order written)", () => {
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
    ["application/*", "bibtex"],
    ["*/*;q=0.5, application/x-research-info-systems;q=0.4", "bibtex"],
    [null, null],
  ])("%s → %s", (accept, format) => expect(negotiateCitationFormat(accept)).toBe(format));
});

describe("a dataset page's rewrite to the citation endpoint (proxy.ts), by Accept", () => {
  // RFC 9110 §12.5.1 (quality values; q=0 is "not acceptable") and §8.3.1 (media types are case-insensitive).
  it.each([
    ["application/x-bibtex", true],
    ["APPLICATION/X-BibTeX", true],
    ["text/html;q=0.1, application/x-bibtex", true],
    ["text/x-bibliography; q=1.0, TEXT/HTML;q=0.8", true],
    ["application/x-bibtex;q=0.5", true],
    ["application/vnd.citationstyles.csl+json", true],
    ["application/x-bibtex;q=0", false],
    ["application/x-bibtex; q=0.000, text/html", false],
    ["text/html, application/x-bibtex", false],
    ["Text/HTML, application/x-bibtex", false],
    ["text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8", false],
    ["application/x-bibtexx", false],
    // Quality values decide, whatever the order written (RFC 9110 §12.4.2).
    ["text/html;q=0.5, application/x-bibtex;q=0.9", true],
    ["application/x-bibtex;q=0.4, text/html;q=0.5", false],
    ["text/html;q=0.9, application/x-research-info-systems;q=0.95", true],
    // Wildcards: a range covering the page and a citation type alike gives the page; a named type beats the range.
    ["*/*", false],
    ["text/*", false],
    ["*/*;q=0.1, application/x-bibtex", true],
    ["text/html;q=0.5, */*", true],
    ["text/*;q=0.2, application/vnd.citationstyles.csl+json;q=0.3", true],
    // Ties at equal quality and specificity: the one written first (negotiator's rule).
    ["application/x-bibtex, text/html", true],
    ["text/html;q=0.7, application/x-bibtex;q=0.7", false],
    ["application/x-bibtex;q=0.7, text/html;q=0.7", true],
    ["", false],
  ])("%s → citation: %s", (accept, citation) => {
    expect(acceptRewritesToCitation(accept)).toBe(citation);
    expect(citationRewriteTarget("GET", "/datasets/3/v2", accept) !== null).toBe(citation);
    // Whatever the rewrite passes on, the endpoint reads a format from.
    if (citation) expect(negotiateCitationFormat(accept)).not.toBeNull();
  });
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

describe("citationRewriteTarget (proxy.ts)", () => {
  it("rewrites a version page and a series page to the citation endpoint with the negotiated format", () => {
    expect(citationRewriteTarget("GET", "/datasets/3/v2", "application/x-research-info-systems")).toBe(
      "/api/v1/datasets/3/citation?format=ris&version=2",
    );
    expect(citationRewriteTarget("HEAD", "/datasets/3", "text/x-bibliography; style=apa")).toBe("/api/v1/datasets/3/citation?format=text");
  });
  it("leaves other methods and other paths to the page", () => {
    expect(citationRewriteTarget("POST", "/datasets/3/v2", "application/x-bibtex")).toBeNull();
    expect(citationRewriteTarget("GET", "/datasets/3/v2/edit", "application/x-bibtex")).toBeNull();
    expect(citationRewriteTarget("GET", "/datasets/03", "application/x-bibtex")).toBeNull();
  });
});

describe("varyOfAnswer (the front server, lib/auth/edge-proxy.ts)", () => {
  it("adds Accept to the Vary of every answer at a dataset page's address, once", () => {
    expect(varyOfAnswer("GET", "/datasets/3/v2", "rsc, next-router-state-tree, Accept-Encoding")).toBe(
      "Accept, rsc, next-router-state-tree, Accept-Encoding",
    );
    expect(varyOfAnswer("HEAD", "/datasets/3?k=L+mol-1+s-1", undefined)).toBe("Accept");
    expect(varyOfAnswer("GET", "/datasets/3", "accept, rsc")).toBe("accept, rsc");
    expect(varyOfAnswer("GET", "/datasets/3", "*")).toBe("*");
  });
  it("knows a dataset page's address however it is spelt, as the app routes it (dot segments, escaped digits)", () => {
    for (const url of [
      "/datasets/1/./v1",
      "/datasets/1/x/../v1",
      "/datasets/%31/v1",
      "/datasets/1/%761",
      "/datasets/1/v%31",
      "/datasets/1/%2e/v1",
    ])
      expect(varyOfAnswer("GET", url, undefined), url).toBe("Accept");
    expect(citationRewriteTarget("GET", "/datasets/%31/v%31", "application/x-bibtex")).toBe(
      "/api/v1/datasets/1/citation?format=bibtex&version=1",
    );
    // An escaped slash is not a path's separator: no dataset page.
    expect(varyOfAnswer("GET", "/datasets/1%2Fv1", undefined)).toBeUndefined();
  });
  it("leaves other addresses and methods as they were", () => {
    expect(varyOfAnswer("GET", "/reactions/abc", "rsc")).toBe("rsc");
    expect(varyOfAnswer("POST", "/datasets/3/v2", "rsc")).toBe("rsc");
    expect(varyOfAnswer("GET", "/datasets/3/v2/edit", undefined)).toBeUndefined();
  });
});
