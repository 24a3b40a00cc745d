import type { Endpoint } from "./endpoints";

/**
 * The curl and Python (requests) example of each endpoint, made from its entry in the endpoint
 * list, as the OpenAPI document (x-codeSamples) and /docs/api show them. Pure.
 */

/** The example address: path parameters filled in, example query values appended. */
export function exampleUrl(e: Endpoint, base: string): { url: string; query: [string, string][] } {
  const path = e.path.replace(/:(\w+)/g, (_, name: string) => encodeURIComponent(e.pathExample?.[name] ?? "1"));
  const query = (e.query ?? []).filter((q) => q.example !== undefined).map((q): [string, string] => [q.name, q.example!]);
  return { url: `${base}${path}`, query };
}

const shellQuote = (s: string) => `'${s.replace(/'/g, `'\\''`)}'`;

export function curlExample(e: Endpoint, base: string): string {
  const { url, query } = exampleUrl(e, base);
  const qs = query.length ? `?${new URLSearchParams(query).toString()}` : "";
  const lines = [`curl -s${e.method === "GET" ? "" : ` -X ${e.method}`} ${shellQuote(url + qs)}`];
  if (e.scope) lines.push(`-H "Authorization: Bearer $ARRHENIA_TOKEN"`);
  for (const h of e.headers ?? []) if (h.required) lines.push(`-H ${shellQuote(`${h.name}: "3"`)}`);
  const example = e.body?.example;
  if (e.body && example !== undefined) {
    if (e.body.contentType === "multipart/form-data") lines.push(`-F ${shellQuote(example)}`);
    else {
      lines.push(`-H 'content-type: ${e.body.contentType}'`);
      lines.push(example.startsWith("@") ? `--data-binary ${example}` : `-d ${shellQuote(example)}`);
    }
  }
  return lines.join(" \\\n  ");
}

/** A JSON value written as a Python literal. */
function pythonLiteral(v: unknown): string {
  if (v === null) return "None";
  if (v === true) return "True";
  if (v === false) return "False";
  if (typeof v === "number") return String(v);
  if (typeof v === "string") return JSON.stringify(v);
  if (Array.isArray(v)) return `[${v.map(pythonLiteral).join(", ")}]`;
  return `{${Object.entries(v as Record<string, unknown>)
    .map(([k, x]) => `${JSON.stringify(k)}: ${pythonLiteral(x)}`)
    .join(", ")}}`;
}

export function pythonExample(e: Endpoint, base: string): string {
  const { url, query } = exampleUrl(e, base);
  const args = [`    ${JSON.stringify(url)},`];
  if (query.length) args.push(`    params=${pythonLiteral(Object.fromEntries(query))},`);
  const headers: string[] = [];
  if (e.scope) headers.push(`"Authorization": f"Bearer {os.environ['ARRHENIA_TOKEN']}"`);
  for (const h of e.headers ?? []) if (h.required) headers.push(`${JSON.stringify(h.name)}: '"3"'`);
  const example = e.body?.example;
  if (e.body && example !== undefined) {
    if (e.body.contentType === "multipart/form-data") {
      const [field, file] = example.split("=@");
      args.push(`    files={${JSON.stringify(field)}: open(${JSON.stringify(file)}, "rb")},`);
    } else if (example.startsWith("@")) {
      headers.push(`"content-type": ${JSON.stringify(e.body.contentType)}`);
      args.push(`    data=open(${JSON.stringify(example.slice(1))}, "rb"),`);
    } else args.push(`    json=${pythonLiteral(JSON.parse(example))},`);
  }
  if (headers.length) args.push(`    headers={${headers.join(", ")}},`);
  const show =
    e.ok.status === 204
      ? 'print("done")'
      : e.ok.contentType === "application/json"
        ? "print(response.json())"
        : e.ok.contentType === "application/octet-stream"
          ? 'open("download", "wb").write(response.content)'
          : "print(response.text)";
  return [
    ...(e.scope ? ["import os", ""] : []),
    "import requests",
    "",
    `response = requests.${e.method.toLowerCase()}(`,
    ...args,
    ")",
    "response.raise_for_status()",
    show,
  ].join("\n");
}
