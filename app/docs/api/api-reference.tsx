import { ScrollRegion } from "@/components/scroll-region";
import { buildOpenApiDocument, problemTypeList } from "@/lib/api/openapi";

/**
 * The endpoint reference of /docs/api, rendered on the server from the OpenAPI document itself
 * (lib/api/openapi.ts), so the page and /api/v1/openapi.json never disagree.
 */

interface Parameter {
  name: string;
  in: string;
  required: boolean;
  description?: string;
  schema: Record<string, unknown>;
}
interface Operation {
  operationId: string;
  tags: string[];
  summary: string;
  description: string;
  parameters?: Parameter[];
  requestBody?: { description: string; content: Record<string, unknown> };
  responses: Record<string, { description: string }>;
  "x-codeSamples": { label: string; source: string }[];
}

/** A JSON Schema in a few words: type, allowed values, pattern, bounds, default. */
export function describeSchema(s: Record<string, unknown>): string {
  if (Array.isArray(s.anyOf)) return (s.anyOf as Record<string, unknown>[]).map(describeSchema).join(", or ");
  const parts: string[] = [];
  const items = s.items as Record<string, unknown> | undefined;
  if (s.type === "array" && items) parts.push(`list of ${describeSchema(items)}`);
  else if (Array.isArray(s.enum)) parts.push(`one of ${s.enum.join(", ")}`);
  else if (typeof s.type === "string") parts.push(s.type);
  if (typeof s.pattern === "string") parts.push(`matching ${s.pattern}`);
  if (typeof s.minimum === "number" && typeof s.maximum === "number") parts.push(`${s.minimum} to ${s.maximum}`);
  if (typeof s.maxLength === "number") parts.push(`at most ${s.maxLength} characters`);
  if (typeof s.maxItems === "number") parts.push(`at most ${s.maxItems} values`);
  if (s.default !== undefined) parts.push(`default ${String(s.default)}`);
  return parts.join(", ") || "any";
}

const slug = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, "-");

/** Text with `backticked` parts set as code (the endpoint list writes names that way). */
function Inline({ text }: { text: string }) {
  return text
    .split(/(`[^`]+`)/)
    .map((part, i) => (part.length > 2 && part.startsWith("`") && part.endsWith("`") ? <code key={i}>{part.slice(1, -1)}</code> : part));
}

/** A path that may break after its slashes on a narrow screen, never inside a word. */
function BreakablePath({ path }: { path: string }) {
  return path.split("/").map((segment, i) => (
    <span key={i}>
      {i > 0 && "/"}
      {i > 0 && <wbr />}
      {segment}
    </span>
  ));
}

/**
 * One endpoint, folded to its method, path and summary (details/summary: opens without JavaScript,
 * and a link to `#op-…` opens it); its examples fold again inside it.
 */
function OperationBlock({ method, path, op }: { method: string; path: string; op: Operation }) {
  const headingId = `op-${op.operationId}`;
  return (
    <details id={headingId} className="border-t border-line py-2">
      <summary className="cursor-pointer py-1">
        <h4 className="inline font-semibold [overflow-wrap:anywhere]">
          <code>
            {method.toUpperCase()} <BreakablePath path={path} />
          </code>
        </h4>
        <span className="block text-sm">
          <Inline text={op.summary} />
        </span>
      </summary>
      <div className="space-y-2 pt-2">
        <p className="text-sm text-muted">
          <Inline text={op.description} />
        </p>
        {op.parameters && op.parameters.length > 0 && (
          <ScrollRegion label={`Parameters of ${method.toUpperCase()} ${path}`}>
            <table className="table text-sm">
              <caption className="sr-only">
                Parameters of {method.toUpperCase()} {path}
              </caption>
              <thead>
                <tr>
                  <th scope="col">Name</th>
                  <th scope="col">In</th>
                  <th scope="col">Value</th>
                </tr>
              </thead>
              <tbody>
                {op.parameters.map((p) => (
                  <tr key={`${p.in}-${p.name}`}>
                    <td className="whitespace-nowrap">
                      <code>{p.name}</code>
                      {p.required ? " (required)" : ""}
                    </td>
                    <td>{p.in}</td>
                    <td>
                      {describeSchema(p.schema)}
                      {p.description ? (
                        <>
                          . <Inline text={p.description} />
                        </>
                      ) : (
                        ""
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        )}
        {op.requestBody && (
          <p className="text-sm">
            Body ({Object.keys(op.requestBody.content).join(", ")}): <Inline text={op.requestBody.description} />
          </p>
        )}
        <p className="text-sm">
          Answers:{" "}
          <Inline
            text={Object.entries(op.responses)
              .map(([status, r]) => `${status} ${r.description}`)
              .join(" · ")}
          />
        </p>
        <details className="text-sm">
          <summary className="cursor-pointer">Examples: {op["x-codeSamples"].map((sample) => sample.label).join(", ")}</summary>
          <div className="space-y-2 pt-2">
            {op["x-codeSamples"].map((sample) => (
              <ScrollRegion key={sample.label} label={`${sample.label} example of ${method.toUpperCase()} ${path}`}>
                <pre className="w-max min-w-full rounded-md border border-line bg-panel p-3 text-xs">
                  <span className="sr-only">{sample.label}: </span>
                  {sample.source}
                </pre>
              </ScrollRegion>
            ))}
          </div>
        </details>
      </div>
    </details>
  );
}

export function ApiReference({ base }: { base: string }) {
  const doc = buildOpenApiDocument(base);
  const operations = Object.entries(doc.paths).flatMap(([path, methods]) =>
    Object.entries(methods).map(([method, op]) => ({ path, method, op: op as Operation })),
  );
  return (
    <>
      <section className="space-y-3" aria-labelledby="reference">
        <h2 id="reference" className="text-2xl font-semibold">
          Endpoints
        </h2>
        <p className="text-sm">
          Every endpoint, made from the same description as the machine-readable <a href="/api/v1/openapi.json">OpenAPI 3.1 document</a>,
          with an example in curl and in Python (the <code>requests</code> package). Examples that need a token read it from the{" "}
          <code>ARRHENIA_TOKEN</code> environment variable. Each endpoint opens to its parameters, answers and examples.
        </p>
        <nav aria-label="Endpoint groups">
          <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
            {doc.tags.map(({ name }) => (
              <li key={name}>
                <a href={`#tag-${slug(name)}`}>
                  {name} ({operations.filter((o) => o.op.tags.includes(name)).length})
                </a>
              </li>
            ))}
            <li>
              <a href="#problems">Problem types</a>
            </li>
          </ul>
        </nav>
        {doc.tags.map(({ name }) => (
          <section key={name} className="space-y-1" aria-labelledby={`tag-${slug(name)}`}>
            <h3 id={`tag-${slug(name)}`} className="pt-2 text-xl font-semibold">
              {name}
            </h3>
            {operations
              .filter((o) => o.op.tags.includes(name))
              .map((o) => (
                <OperationBlock key={o.op.operationId} {...o} />
              ))}
          </section>
        ))}
      </section>
      <details className="border-t border-line pt-2">
        <summary className="cursor-pointer">
          <h2 id="problems" className="inline text-2xl font-semibold">
            Problem types
          </h2>
        </summary>
        <div className="space-y-3 pt-3">
          <p className="text-sm">
            Every error is <code>application/problem+json</code> (RFC 9457): <code>type</code> (one of the URIs below, stable),{" "}
            <code>title</code>, <code>status</code>, <code>code</code>, <code>instance</code> (the path asked for) and, where values are at
            fault, <code>errors</code> with a JSON pointer (RFC 6901) for each.
          </p>
          <ScrollRegion label="Problem types">
            <table className="table text-sm">
              <thead>
                <tr>
                  <th scope="col">Type</th>
                  <th scope="col">Status</th>
                  <th scope="col">When</th>
                </tr>
              </thead>
              <tbody>
                {problemTypeList().map((p) => (
                  <tr key={p.code} id={`problem-${p.code.replace(/_/g, "-")}`}>
                    <td>
                      <code>{p.uri}</code>
                    </td>
                    <td>
                      {p.status} {p.title}
                    </td>
                    <td>{p.when}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        </div>
      </details>
    </>
  );
}
