import { z } from "zod";
import { PROBLEM_TYPES, problemTypeUri, type ErrorCode } from "@/lib/errors";
import { API_ENDPOINTS, PATH_PARAMETERS, type Endpoint } from "./endpoints";
import { RESPONSE_SCHEMAS } from "./responses";
import { curlExample, pythonExample } from "./examples";

/**
 * The OpenAPI 3.1 document of the REST API (served at /api/v1/openapi.json, rendered on
 * /docs/api), made from the endpoint list and the zod schemas the handlers parse with, through
 * zod's own JSON Schema output (draft 2020-12, the dialect of OpenAPI 3.1). Pure.
 */

export const API_VERSION = "1.0.0";

/** The rate-limit fields' draft, named in the document and on the docs page. */
export const RATE_LIMIT_DRAFT = "draft-ietf-httpapi-ratelimit-headers-10";

/** JSON Schema of a zod schema as a request reads it (its input) or an answer is written (output), without the dialect line. */
function jsonSchema(schema: z.ZodType, io: "input" | "output" = "input"): Record<string, unknown> {
  const out = z.toJSONSchema(schema, { io, unrepresentable: "any", target: "draft-2020-12" }) as Record<string, unknown>;
  delete out.$schema;
  return out;
}

const problemSchema = z.object({
  type: z.string().describe("Stable URI of the problem type (listed on /docs/api)"),
  title: z.string(),
  status: z.number().int(),
  code: z.enum(Object.keys(PROBLEM_TYPES) as [ErrorCode, ...ErrorCode[]]),
  instance: z.string().optional(),
  errors: z
    .array(
      z.object({
        pointer: z.string().describe("JSON pointer (RFC 6901) to the value at fault"),
        parameter: z.string().optional(),
        message: z.string(),
        value: z.unknown().optional(),
      }),
    )
    .optional(),
});

/** Every endpoint may answer these (a malformed request, a bad token, the rate limit, our failures). */
const COMMON_ERRORS = [400, 401, 429, 500, 503];

const statusTitle = (status: number) =>
  Object.values(PROBLEM_TYPES)
    .filter((p) => p.status === status)
    .map((p) => p.title)
    .join("; ");

const headerRef = (name: string) => ({ $ref: `#/components/headers/${name}` });
const rateHeaders = { RateLimit: headerRef("RateLimit"), "RateLimit-Policy": headerRef("RateLimit-Policy") };

/** `getDatasetsByIdVersionsByN`: unique per method and path. */
export function operationId(e: Pick<Endpoint, "method" | "path">): string {
  const words = e.path
    .replace(/^\/api\/v1\//, "")
    .split("/")
    .map((seg) => (seg.startsWith(":") ? `by-${seg.slice(1)}` : seg))
    .join("-")
    .split(/[^A-Za-z0-9]+/)
    .filter(Boolean);
  return e.method.toLowerCase() + words.map((w) => w[0].toUpperCase() + w.slice(1)).join("");
}

/** `/api/v1/datasets/:id` → `/api/v1/datasets/{id}`. */
export const openApiPath = (path: string) => path.replace(/:(\w+)/g, "{$1}");

function operation(e: Endpoint, base: string) {
  const pathParams = [...e.path.matchAll(/:(\w+)/g)].map(([, name]) => ({
    name,
    in: "path",
    required: true,
    schema: jsonSchema(e.pathParameters?.[name] ?? PATH_PARAMETERS[name] ?? z.string()),
    ...(e.pathExample?.[name] ? { example: e.pathExample[name] } : {}),
  }));
  const query = (e.query ?? []).map((q) => ({
    name: q.name,
    in: "query",
    required: false,
    schema: jsonSchema(q.schema),
    ...(q.description ? { description: q.description } : {}),
    ...(q.example !== undefined ? { example: q.example } : {}),
  }));
  const headers = (e.headers ?? []).map((h) => ({
    name: h.name,
    in: "header",
    required: h.required,
    description: h.description,
    schema: { type: "string" },
  }));
  const errors = [...new Set([...e.errors, ...COMMON_ERRORS])].sort((a, b) => a - b);
  const okHeaders = { ...rateHeaders, ...(e.cached ? { ETag: headerRef("ETag"), "Cache-Control": headerRef("Cache-Control") } : {}) };
  const responses: Record<string, unknown> = {
    [e.ok.status]: {
      description: e.ok.description,
      headers: okHeaders,
      ...(e.ok.status === 204
        ? {}
        : {
            content: {
              [e.ok.contentType]: {
                schema: e.ok.schema
                  ? { $ref: `#/components/schemas/${e.ok.schema}` }
                  : e.ok.contentType === "application/json"
                    ? { type: "object" }
                    : { type: "string" },
              },
            },
          }),
    },
  };
  if (e.cached)
    responses["304"] = {
      description: "Not modified: the If-None-Match tag is current",
      headers: { ETag: headerRef("ETag"), "Cache-Control": headerRef("Cache-Control") },
    };
  for (const status of errors)
    responses[status] = {
      description: statusTitle(status),
      headers: status === 429 || status === 503 ? { ...rateHeaders, "Retry-After": headerRef("Retry-After") } : rateHeaders,
      content: { "application/problem+json": { schema: { $ref: "#/components/schemas/Problem" } } },
    };
  return {
    operationId: operationId(e),
    tags: [e.tag],
    summary: e.summary,
    description: [e.description, `Who: ${e.who}.`, e.scope ? `Token scope: \`${e.scope}\`.` : "No sign-in needed."]
      .filter(Boolean)
      .join(" "),
    ...(pathParams.length + query.length + headers.length ? { parameters: [...pathParams, ...query, ...headers] } : {}),
    ...(e.body
      ? {
          requestBody: {
            required: true,
            description: e.body.description,
            content: { [e.body.contentType]: { schema: e.body.schema ? jsonSchema(e.body.schema) : { type: "object" } } },
          },
        }
      : {}),
    responses,
    // A public endpoint takes no credential, but a token sent anyway must be valid.
    security: e.scope ? [{ token: [e.scope] }] : [{}, { token: [] }],
    "x-codeSamples": [
      { lang: "Shell", label: "curl", source: curlExample(e, base) },
      { lang: "Python", label: "Python (requests)", source: pythonExample(e, base) },
    ],
  };
}

/** The whole document, with `base` (the site's address) as its server. */
export function buildOpenApiDocument(base: string) {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const e of API_ENDPOINTS) (paths[openApiPath(e.path)] ??= {})[e.method.toLowerCase()] = operation(e, base);
  return {
    openapi: "3.1.0",
    info: {
      title: "Arrhenia REST API",
      version: API_VERSION,
      description:
        "Published rate-constant datasets, their re-fits and consensus expressions; deposits with a personal token. " +
        "Errors are RFC 9457 problem details. Public reads send ETag and Cache-Control and answer 304 to If-None-Match. " +
        `Every answer carries RateLimit and RateLimit-Policy (${RATE_LIMIT_DRAFT}); a spent budget is 429 with Retry-After.`,
      license: { name: "The data: each dataset's own licence (SPDX)", identifier: "CC-BY-4.0" },
    },
    servers: [{ url: base }],
    tags: [...new Set(API_ENDPOINTS.map((e) => e.tag))].map((name) => ({ name })),
    paths,
    components: {
      securitySchemes: {
        token: {
          type: "http",
          scheme: "bearer",
          description:
            "A personal token from Settings; scopes deposit:read, deposit:write, admin. A signed-in browser session holds every scope.",
        },
      },
      schemas: {
        Problem: { ...jsonSchema(problemSchema), description: "RFC 9457 problem details" },
        // The main JSON answers, as the handlers write them (checked against them by tests/integration/api-responses.test.ts).
        ...Object.fromEntries(Object.entries(RESPONSE_SCHEMAS).map(([name, schema]) => [name, jsonSchema(schema, "output")])),
      },
      headers: {
        RateLimit: {
          description: `Remaining budget and seconds to its reset (${RATE_LIMIT_DRAFT}): "api";r=598;t=42`,
          schema: { type: "string" },
        },
        "RateLimit-Policy": {
          description: `The client's quota per window of seconds (${RATE_LIMIT_DRAFT}): "api";q=600;w=60`,
          schema: { type: "string" },
        },
        "Retry-After": { description: "Seconds to wait before retrying", schema: { type: "integer" } },
        ETag: { description: "Strong entity tag of the answer; send it back as If-None-Match", schema: { type: "string" } },
        "Cache-Control": { description: "public, max-age=60", schema: { type: "string" } },
      },
    },
  };
}

/** Every problem type with its URI, status and meaning, as the docs page lists them. */
export function problemTypeList() {
  return (Object.keys(PROBLEM_TYPES) as ErrorCode[]).map((code) => ({ code, uri: problemTypeUri(code), ...PROBLEM_TYPES[code] }));
}
