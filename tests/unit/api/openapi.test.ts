import { validate } from "@readme/openapi-parser";
import { describe, expect, it } from "vitest";
import { API_ENDPOINTS } from "@/lib/api/endpoints";
import { curlExample, pythonExample } from "@/lib/api/examples";
import { buildOpenApiDocument, operationId, openApiPath } from "@/lib/api/openapi";
import { describeSchema } from "@/app/docs/api/api-reference";

const BASE = "https://arrhenia.example";

describe("the OpenAPI document", () => {
  const doc = buildOpenApiDocument(BASE);

  it("is a valid OpenAPI 3.1 document (checked by @readme/openapi-parser, a registry validator of the OpenAPI schemas)", async () => {
    // The validator resolves and may rewrite references in place: give it a copy.
    const result = await validate(structuredClone(doc) as never);
    expect(result.valid ? [] : result.errors).toEqual([]);
    expect(doc.openapi).toBe("3.1.0");
    // The same validator refuses a parameter "in" the body (OpenAPI 2's place, not 3.1's).
    const broken = structuredClone(doc) as { paths: Record<string, Record<string, { parameters: { in: string }[] }>> };
    broken.paths["/api/v1/datasets/{id}"].get.parameters[0].in = "body";
    expect((await validate(broken as never)).valid).toBe(false);
  });

  it("has exactly one operation per entry of the endpoint list, with unique operation ids", () => {
    const ops = Object.entries(doc.paths).flatMap(([path, methods]) => Object.keys(methods).map((m) => `${m.toUpperCase()} ${path}`));
    expect(ops.sort()).toEqual(API_ENDPOINTS.map((e) => `${e.method} ${openApiPath(e.path)}`).sort());
    const ids = API_ENDPOINTS.map(operationId);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it("describes query parameters with the handlers' own zod schemas (the search limit's pattern, the citation formats)", () => {
    const params = (path: string) =>
      (doc.paths[path].get as { parameters: { name: string; schema: Record<string, unknown> }[] }).parameters;
    expect(params("/api/v1/datasets").find((p) => p.name === "limit")?.schema).toMatchObject({ type: "string", pattern: "^\\d{1,4}$" });
    expect(params("/api/v1/datasets/{id}/citation").find((p) => p.name === "format")?.schema.enum).toContain("bibtex");
  });

  it("types every path parameter: integer ids (1 … 2³¹−1), version numbers, InChIKeys and reaction keys by pattern", () => {
    type Param = { name: string; in: string; schema: Record<string, unknown> };
    const pathParams = (path: string, method = "get") =>
      ((doc.paths[path] as Record<string, { parameters: Param[] }>)[method].parameters ?? []).filter((p) => p.in === "path");
    for (const [path, methods] of Object.entries(doc.paths))
      for (const op of Object.values(methods as Record<string, { parameters?: Param[] }>))
        for (const p of (op.parameters ?? []).filter((x) => x.in === "path"))
          expect(p.schema, `${path} ${p.name}`).not.toEqual({ type: "string" });
    expect(pathParams("/api/v1/datasets/{id}")[0].schema).toMatchObject({ type: "integer", minimum: 1, maximum: 2147483647 });
    const n = pathParams("/api/v1/datasets/{id}/versions/{n}").find((p) => p.name === "n")!.schema;
    expect(n).toMatchObject({ type: "integer", minimum: 1 });
    const inchikey = pathParams("/api/v1/species/{inchikey}")[0].schema;
    expect(new RegExp(inchikey.pattern as string).test("VNWKTOKETHGBQD-UHFFFAOYSA-N")).toBe(true);
    expect(new RegExp(inchikey.pattern as string).test("methane")).toBe(false);
    const reaction = pathParams("/api/v1/reactions/{id}")[0].schema as { anyOf: { pattern?: string }[] };
    const keyPattern = new RegExp(reaction.anyOf.find((s) => s.pattern)!.pattern!);
    expect(
      keyPattern.test("TUJKJAMUKRIRHC-UHFFFAOYSA-N+VNWKTOKETHGBQD-UHFFFAOYSA-N~WCYWZMWISLQXQU-UHFFFAOYSA-N+XLYOFNOQVPJJNP-UHFFFAOYSA-N"),
    ).toBe(true);
    expect(keyPattern.test("OH+CH4")).toBe(false);
    // The reference page words them.
    expect(describeSchema(pathParams("/api/v1/datasets/{id}")[0].schema)).toBe("integer, 1 to 2147483647");
    expect(describeSchema(pathParams("/api/v1/reactions/{id}")[0].schema)).toMatch(/^integer, 1 to 2147483647, or string, matching \^/);
  });

  it("describes the main JSON answers by schema and every problem answer by the Problem schema", () => {
    const schemas = doc.components.schemas as Record<string, Record<string, unknown>>;
    const ok = (path: string, method = "get", status = "200") =>
      (doc.paths[path] as Record<string, { responses: Record<string, { content: Record<string, { schema: { $ref?: string } }> }> }>)[method]
        .responses[status].content;
    expect(ok("/api/v1/datasets/{id}")["application/json"].schema.$ref).toBe("#/components/schemas/DatasetSeries");
    expect(ok("/api/v1/search")["application/json"].schema.$ref).toBe("#/components/schemas/SearchAnswer");
    expect(ok("/api/v1/datasets", "post", "201")["application/json"].schema.$ref).toBe("#/components/schemas/CreatedDraft");
    expect(schemas.DatasetSeries).toMatchObject({ type: "object", required: ["data"] });
    for (const [path, methods] of Object.entries(doc.paths))
      for (const op of Object.values(
        methods as Record<string, { responses: Record<string, { content?: Record<string, { schema: unknown }> }> }>,
      ))
        for (const [status, answer] of Object.entries(op.responses))
          if (Number(status) >= 400)
            expect(answer.content?.["application/problem+json"].schema, `${path} ${status}`).toEqual({
              $ref: "#/components/schemas/Problem",
            });
  });

  it("names the scope of every token endpoint and marks public reads as cacheable (304)", () => {
    const put = doc.paths["/api/v1/versions/{id}"].put as { security: unknown; responses: Record<string, unknown> };
    expect(put.security).toEqual([{ token: ["deposit:write"] }]);
    expect(Object.keys(put.responses)).toEqual(expect.arrayContaining(["412", "428"]));
    const read = doc.paths["/api/v1/datasets/{id}"].get as { responses: Record<string, unknown> };
    expect(Object.keys(read.responses)).toEqual(expect.arrayContaining(["200", "304", "404", "429"]));
  });
});

describe("examples", () => {
  const find = (method: string, path: string) => API_ENDPOINTS.find((e) => e.method === method && e.path === path)!;

  it("curl sends the token, If-Match and the document where the endpoint needs them", () => {
    const put = curlExample(find("PUT", "/api/v1/versions/:id"), BASE);
    expect(put).toContain("curl -s -X PUT 'https://arrhenia.example/api/v1/versions/1'");
    expect(put).toContain('-H "Authorization: Bearer $ARRHENIA_TOKEN"');
    expect(put).toContain(`-H 'If-Match: "3"'`);
    expect(put).toContain("--data-binary @deposit.json");
    expect(curlExample(find("GET", "/api/v1/datasets"), BASE)).toBe(
      "curl -s 'https://arrhenia.example/api/v1/datasets?q=OH+%2B+CH4&limit=20'",
    );
  });

  it("Python uses requests with params, json and the token from the environment", () => {
    const py = pythonExample(find("POST", "/api/v1/analyses"), BASE);
    expect(py).toContain("response = requests.post(");
    expect(py).toContain('json={"order": 2, "points": [{"T": 250, "k": 2.1e-15}');
    expect(py).not.toContain("ARRHENIA_TOKEN");
    const deposits = pythonExample(find("GET", "/api/v1/deposits"), BASE);
    expect(deposits).toContain(`headers={"Authorization": f"Bearer {os.environ['ARRHENIA_TOKEN']}"}`);
    expect(pythonExample(find("GET", "/api/v1/datasets"), BASE)).toContain('params={"q": "OH + CH4", "limit": "20"}');
  });
});
