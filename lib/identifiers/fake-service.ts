// A local stand-in for a DOI registration agency's REST API, for development and tests: PUT and
// GET /dois/{doi} with JSON:API bodies, records kept in memory and (optionally) a JSON file so
// they survive restarts. It checks the little that catches our own mistakes (resource type, DOI
// in body = DOI in path, our prefix, the fields a findable DOI needs) and nothing more.
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { doiPrefix, isDoiSyntax } from "./mint";

/** One identifier as the fake holds it. */
export interface FakeDoiRecord {
  doi: string;
  /** `findable` after a `publish` event, `registered` after `register`/`hide`, else `draft`. */
  state: "draft" | "registered" | "findable";
  attributes: Record<string, unknown>;
  /** ISO 8601 times of creation (the mint) and of the last update. */
  created: string;
  updated: string;
  /** Accepted PUTs for this identifier (the first one created it). */
  writes: number;
}

/** One request to `/dois/…` as the fake answered it, in arrival order. */
export interface FakeDoiRequest {
  method: string;
  doi: string;
  status: number;
}

export interface FakeDoiService {
  /** Base URL to give the client, e.g. `http://127.0.0.1:5100`. */
  url: string;
  port: number;
  close(): Promise<void>;
  /**
   * Answers the next `n` requests to `/dois/…` with 500. `before` (default) drops them
   * unprocessed; `after` stores a PUT and then fails, as if the answer were lost on the way.
   */
  failNext(n: number, options?: { when?: "before" | "after" }): void;
  records(): FakeDoiRecord[];
  requests(): FakeDoiRequest[];
}

export interface FakeDoiServiceOptions {
  /** TCP port; 0 picks a free one. */
  port: number;
  /** Listen address; loopback unless told otherwise. */
  host?: string;
  /** Folder for `dois.json`; records stay in memory only when absent. */
  dataDir?: string | null;
  /** The only prefix accepted (default: DOI_PREFIX or the test prefix). */
  prefix?: string;
  /** Basic-auth account required on every `/dois` request; none when absent. */
  auth?: { user: string; password: string } | null;
}

const JSON_API = "application/vnd.api+json";
const MAX_BODY_BYTES = 1_000_000;

export async function startFakeDoiService({
  port,
  host = "127.0.0.1",
  dataDir = null,
  prefix = doiPrefix(),
  auth = null,
}: FakeDoiServiceOptions): Promise<FakeDoiService> {
  const file = dataDir ? path.join(dataDir, "dois.json") : null;
  // DOIs are case-insensitive: keys are lower case, records keep the spelling first sent.
  const store = new Map<string, FakeDoiRecord>();
  if (file) {
    await mkdir(dataDir!, { recursive: true });
    const saved = await readFile(file, "utf8").then(
      (t) => JSON.parse(t) as FakeDoiRecord[],
      () => [],
    );
    for (const r of saved) store.set(r.doi.toLowerCase(), r);
  }
  const log: FakeDoiRequest[] = [];
  const failures: ("before" | "after")[] = [];
  let saving = Promise.resolve();

  // Writes go one after another through a temporary file, so a crash never leaves half a file.
  function persist(): Promise<void> {
    if (!file) return Promise.resolve();
    const snapshot = JSON.stringify([...store.values()], null, 2);
    saving = saving.then(async () => {
      // The folder may have been cleaned away while the service ran.
      await mkdir(path.dirname(file), { recursive: true });
      await writeFile(`${file}.tmp`, snapshot);
      await rename(`${file}.tmp`, file);
    });
    return saving;
  }

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const url = new URL(req.url ?? "/", "http://fake.invalid");
    if (url.pathname === "/heartbeat" && req.method === "GET") {
      res.writeHead(200, { "content-type": "text/plain" }).end("OK");
      return;
    }
    const match = /^\/dois\/(.+)$/.exec(url.pathname);
    if (!match) return sendErrors(res, 404, [{ status: "404", title: "The resource you are looking for doesn't exist." }]);
    const doi = decodeURIComponent(match[1]);
    const answer = (status: number, body: unknown) => {
      log.push({ method: req.method ?? "", doi, status });
      res.writeHead(status, { "content-type": JSON_API }).end(JSON.stringify(body));
    };
    if (auth && !authorised(req.headers.authorization, auth)) return answer(401, errorsBody(401, "Bad credentials."));
    if (req.method !== "GET" && req.method !== "PUT") {
      res.setHeader("allow", "GET, PUT");
      return answer(405, errorsBody(405, `Method ${req.method} is not allowed here.`));
    }
    const failure = failures.shift();
    if (failure === "before") return answer(500, errorsBody(500, "Simulated failure of the registration service."));

    if (req.method === "GET") {
      const record = store.get(doi.toLowerCase());
      return record ? answer(200, toResource(record)) : answer(404, errorsBody(404, "The resource you are looking for doesn't exist."));
    }

    const raw = await readBody(req);
    if (raw === null) return answer(413, errorsBody(413, `Body larger than ${MAX_BODY_BYTES} bytes.`));
    let body: unknown;
    try {
      body = JSON.parse(raw);
    } catch {
      return answer(400, errorsBody(400, "Body is not JSON."));
    }
    const problems = validate(body, doi, prefix);
    if (problems.length) {
      log.push({ method: "PUT", doi, status: 422 });
      res
        .writeHead(422, { "content-type": JSON_API })
        .end(JSON.stringify({ errors: problems.map((p) => ({ status: "422", source: p.source, title: p.title })) }));
      return;
    }
    const attributes = (body as { data: { attributes: Record<string, unknown> } }).data.attributes;
    const now = new Date().toISOString();
    const existing = store.get(doi.toLowerCase());
    const { event, ...kept } = attributes;
    const record: FakeDoiRecord = {
      doi: existing?.doi ?? doi,
      state: nextState(existing?.state, event),
      attributes: { ...(existing?.attributes ?? {}), ...kept },
      created: existing?.created ?? now,
      updated: now,
      writes: (existing?.writes ?? 0) + 1,
    };
    store.set(doi.toLowerCase(), record);
    await persist();
    if (failure === "after") return answer(500, errorsBody(500, "Simulated failure after the record was stored."));
    answer(existing ? 200 : 201, toResource(record));
  }

  const server = createServer((req, res) => {
    handle(req, res).catch((err) => {
      console.error("[fake-doi] request failed", err);
      if (!res.headersSent) res.writeHead(500, { "content-type": JSON_API });
      res.end(JSON.stringify(errorsBody(500, "Internal error of the fake service.")));
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const bound = (server.address() as AddressInfo).port;

  return {
    url: `http://${host.includes(":") ? `[${host}]` : host}:${bound}`,
    port: bound,
    close: async () => {
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
      await saving;
    },
    failNext: (n, { when = "before" } = {}) => {
      for (let i = 0; i < n; i++) failures.push(when);
    },
    records: () => [...store.values()].map((r) => structuredClone(r)),
    requests: () => log.map((r) => ({ ...r })),
  };
}

function nextState(current: FakeDoiRecord["state"] | undefined, event: unknown): FakeDoiRecord["state"] {
  if (event === "publish") return "findable";
  if (event === "register" || event === "hide") return "registered";
  return current ?? "draft";
}

function toResource(r: FakeDoiRecord) {
  const slash = r.doi.indexOf("/");
  return {
    data: {
      id: r.doi.toLowerCase(),
      type: "dois",
      attributes: {
        ...r.attributes,
        doi: r.doi.toLowerCase(),
        prefix: r.doi.slice(0, slash),
        suffix: r.doi.slice(slash + 1),
        state: r.state,
        created: r.created,
        updated: r.updated,
      },
    },
  };
}

/** The checks a real agency would fail us on, kept to what our own metadata could get wrong. */
function validate(body: unknown, pathDoi: string, prefix: string): { source: string; title: string }[] {
  const data = (body as { data?: { type?: unknown; attributes?: Record<string, unknown> } } | null)?.data;
  if (!data || data.type !== "dois") return [{ source: "type", title: 'Resource type must be "dois".' }];
  const a = data.attributes ?? {};
  const problems: { source: string; title: string }[] = [];
  const doi = typeof a.doi === "string" ? a.doi : "";
  if (doi.toLowerCase() !== pathDoi.toLowerCase())
    problems.push({ source: "doi", title: "DOI in the body must equal the DOI in the path." });
  if (!isDoiSyntax(pathDoi)) problems.push({ source: "doi", title: "Not DOI syntax." });
  if (!pathDoi.toLowerCase().startsWith(`${prefix.toLowerCase()}/`)) problems.push({ source: "doi", title: `Prefix must be ${prefix}.` });
  if (a.event === "publish") {
    if (typeof a.url !== "string" || !/^https?:\/\//.test(a.url))
      problems.push({ source: "url", title: "A findable DOI needs an http(s) URL." });
    if (!nonEmptyArray(a.titles)) problems.push({ source: "titles", title: "Can't be blank." });
    if (!nonEmptyArray(a.creators)) problems.push({ source: "creators", title: "Can't be blank." });
    if (!a.publisher) problems.push({ source: "publisher", title: "Can't be blank." });
    if (!Number.isInteger(Number(a.publicationYear))) problems.push({ source: "publicationYear", title: "Must be a year." });
    if (!(a.types as { resourceTypeGeneral?: unknown } | undefined)?.resourceTypeGeneral)
      problems.push({ source: "types", title: "resourceTypeGeneral can't be blank." });
  }
  return problems;
}

function nonEmptyArray(value: unknown): boolean {
  return Array.isArray(value) && value.length > 0;
}

function authorised(header: string | undefined, auth: { user: string; password: string }): boolean {
  if (!header?.startsWith("Basic ")) return false;
  return Buffer.from(header.slice(6), "base64").toString("utf8") === `${auth.user}:${auth.password}`;
}

function errorsBody(status: number, title: string) {
  return { errors: [{ status: String(status), title }] };
}

function sendErrors(res: ServerResponse, status: number, errors: { status: string; title: string }[]): void {
  res.writeHead(status, { "content-type": JSON_API }).end(JSON.stringify({ errors }));
}

/** The request body as text, or null when it exceeds the limit. */
async function readBody(req: IncomingMessage): Promise<string | null> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req) {
    size += (chunk as Buffer).length;
    if (size > MAX_BODY_BYTES) return null;
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks).toString("utf8");
}
