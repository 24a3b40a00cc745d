import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));

import { XMLParser, XMLValidator } from "fast-xml-parser";
import { GET, POST } from "@/app/oai/route";
import type { Transition } from "@/lib/curation/lifecycle";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset, startNextVersion } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { REACTION_CLASSES } from "@/lib/deposits/vocabulary";
import { buildDataciteXml } from "@/lib/identifiers/datacite";
import { getPublicVersionDatacite } from "@/lib/identifiers/public-datacite";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

// Each check names the section of "The Open Archives Initiative Protocol for Metadata Harvesting,
// Protocol Version 2.0 of 2002-06-14" (openarchives.org) whose rule it holds the response to.

const OAI_NS = "http://www.openarchives.org/OAI/2.0/";
const parser = new XMLParser({
  ignoreAttributes: false,
  attributeNamePrefix: "@",
  parseTagValue: false,
  parseAttributeValue: false,
  isArray: (name) => ARRAYS.has(name),
});
const ARRAYS = new Set(["error", "header", "record", "set", "metadataFormat", "setSpec", "dc:title", "dc:identifier", "description"]);

type Node = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any -- parsed XML is untyped by nature

/** The response's XML, checked well-formed (fast-xml-parser's validator), and its parse. */
async function answer(res: Response): Promise<{ xml: string; root: Node }> {
  expect(res.status).toBe(200);
  // §3.1.2.1: the response is XML.
  expect(res.headers.get("content-type")).toBe("text/xml; charset=utf-8");
  const xml = await res.text();
  expect(XMLValidator.validate(xml), xml.slice(0, 400)).toBe(true);
  const root = parser.parse(xml)["OAI-PMH"] as Node;
  // §3.2: the root element in the OAI-PMH namespace, with its schema location; responseDate in UTC at seconds.
  expect(root["@xmlns"]).toBe(OAI_NS);
  expect(root["@xsi:schemaLocation"]).toBe(`${OAI_NS} http://www.openarchives.org/OAI/2.0/OAI-PMH.xsd`);
  expect(root.responseDate).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z$/);
  return { xml, root };
}

const get = async (query: string) => answer(await GET(new Request(`http://127.0.0.1/oai?${query}`), { params: Promise.resolve({}) }));
const post = async (body: string, contentType = "application/x-www-form-urlencoded") =>
  answer(
    await POST(new Request("http://127.0.0.1/oai", { method: "POST", body, headers: { "content-type": contentType } }), {
      params: Promise.resolve({}),
    }),
  );

const errorCodes = (root: Node) => ((root.error ?? []) as Node[]).map((e) => e["@code"]);
const requestAttributes = (root: Node) =>
  typeof root.request === "string" ? {} : Object.fromEntries(Object.entries(root.request as Node).filter(([k]) => k.startsWith("@")));

let owner: UserDto, curator: UserDto;
const walks: Record<string, Transition[]> = {
  draft: [],
  submitted: ["submit"],
  in_review: ["submit", "start_review"],
  returned: ["submit", "start_review", "return"],
  declined: ["submit", "decline"],
  published: ["submit", "accept"],
  retracted: ["submit", "accept", "retract"],
};
const made: Record<string, { versionId: number; datasetId: number; title: string; identifier: string | null }> = {};
const tag = uniqueEmail("oai").slice(0, 14);

async function datasetIn(state: string, reactionClass = "hydrogen-abstraction") {
  const doc = structuredClone(EXAMPLE_DEPOSIT) as unknown as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any -- a document edited for the test
  doc.title = `Harvest test ${tag} (${state})`;
  doc.reaction.class = reactionClass;
  const v = await depositNewDataset({ actor: owner, document: doc as typeof EXAMPLE_DEPOSIT });
  for (const t of walks[state]) {
    const byOwner = t === "submit";
    const reason = t === "retract" ? "Retracted for the test: a calibration error." : byOwner ? undefined : "For the test.";
    await applyTransition({ versionId: v.id, actorId: byOwner ? owner.id : curator.id, transition: t, reason });
  }
  const [row] = await sql<{ version_identifier: string | null }[]>`select version_identifier from dataset_versions where id = ${v.id}`;
  return { versionId: v.id, datasetId: v.datasetId, title: doc.title as string, identifier: row.version_identifier };
}

const host = () => new URL(process.env.APP_URL!).hostname;
const oaiId = (versionIdentifier: string) => `oai:${host()}:${versionIdentifier}`;
/** The exact datestamp the database keeps for a version's record (drizzle/0028). */
const changedAt = async (versionId: number) => {
  const [row] = await sql<{ d: Date }[]>`select changed_at as d from oai_record_datestamps where version_id = ${versionId}`;
  return row?.d ?? null;
};
const atSeconds = (d: Date) => d.toISOString().replace(/\.\d{3}Z$/, "Z");
const datestampOf = async (versionId: number) => atSeconds((await changedAt(versionId))!);
const shift = (stamp: string, seconds: number) => new Date(Date.parse(stamp) + seconds * 1000).toISOString().replace(/\.\d{3}Z$/, "Z");

beforeAll(async () => {
  const mk = (t: string, role: UserDto["role"]) => createUser({ email: uniqueEmail(t), name: t, passwordHash: "x", role, verified: true });
  [owner, curator] = await Promise.all([mk("oai-owner", "researcher"), mk("oai-curator", "curator")]);
  for (const state of Object.keys(walks)) made[state] = await datasetIn(state);
  made.insertion = await datasetIn("published", "insertion");
}, 180_000);

afterEach(() => {
  vi.useRealTimers();
  delete process.env.OAI_PAGE_SIZE;
});

describe("Identify (§4.2)", () => {
  it("names the repository, base URL, protocol version, earliest datestamp, deleted-record policy and granularity", async () => {
    const { root } = await get("verb=Identify");
    const id = root.Identify as Node;
    expect(id.repositoryName).toBe("Arrhenia");
    expect(id.baseURL).toBe(`${process.env.APP_URL}/oai`);
    expect(id.protocolVersion).toBe("2.0");
    expect(id.adminEmail).toMatch(/@/);
    // §2.5.1: deleted records are kept for good; §3.3: seconds granularity.
    expect(id.deletedRecord).toBe("persistent");
    expect(id.granularity).toBe("YYYY-MM-DDThh:mm:ssZ");
    // §4.2 earliestDatestamp: a lower bound of every datestamp in the repository.
    const [{ min }] = await sql<{ min: Date }[]>`select min(changed_at) as min from oai_record_datestamps`;
    expect(Date.parse(id.earliestDatestamp)).toBeLessThanOrEqual(min.getTime());
    expect(id.earliestDatestamp).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z$/);
    // §3.2 request: the verb echoed, the base URL as its text.
    expect(root.request).toEqual({ "#text": `${process.env.APP_URL}/oai`, "@verb": "Identify" });
    // The identifier form is stated (a description container, §4.2).
    expect(JSON.stringify(id.description)).toContain(`oai:${host()}:`);
  });

  it("states the oai-identifier scheme when the public host is a domain name", async () => {
    const before = process.env.APP_URL;
    process.env.APP_URL = "https://kinetics.example.org";
    try {
      const { root } = await get("verb=Identify");
      const described = (root.Identify.description as Node[]).find((d) => d["oai-identifier"])?.["oai-identifier"];
      expect(described).toMatchObject({ scheme: "oai", repositoryIdentifier: "kinetics.example.org", delimiter: ":" });
      expect(described.sampleIdentifier).toMatch(/^oai:kinetics\.example\.org:10\.5072\/ARH-/);
    } finally {
      process.env.APP_URL = before;
    }
  });

  it("an argument beside the verb is badArgument, and the request element then carries no attributes (§3.2)", async () => {
    const { root } = await get("verb=Identify&metadataPrefix=oai_dc");
    expect(errorCodes(root)).toEqual(["badArgument"]);
    expect(root.request).toBe(`${process.env.APP_URL}/oai`);
    expect(root.Identify).toBeUndefined();
  });
});

describe("badVerb and badArgument (§3.6)", () => {
  it.each([
    ["", "no verb"],
    ["verb=Harvest", "an unknown verb"],
    ["verb=Identify&verb=Identify", "a repeated verb"],
  ])("%s → badVerb (%s), request without attributes", async (query) => {
    const { root } = await get(query);
    expect(errorCodes(root)).toEqual(["badVerb"]);
    expect(requestAttributes(root)).toEqual({});
  });

  it.each([
    ["verb=GetRecord&metadataPrefix=oai_dc", "missing identifier"],
    ["verb=ListRecords", "missing metadataPrefix"],
    ["verb=ListIdentifiers&metadataPrefix=oai_dc&metadataPrefix=oai_dc", "repeated argument"],
    ["verb=ListRecords&metadataPrefix=oai_dc&colour=red", "an argument the verb does not take"],
    ["verb=ListRecords&metadataPrefix=oai_dc&set=", "an empty argument"],
    ["verb=ListIdentifiers&metadataPrefix=oai_dc&resumptionToken=x", "the exclusive resumptionToken with company"],
    ["verb=ListRecords&metadataPrefix=oai_dc&from=2024-01-01T00:00:00.000Z", "from finer than seconds"],
    ["verb=ListRecords&metadataPrefix=oai_dc&from=2024-13-01", "no such month"],
    ["verb=ListRecords&metadataPrefix=oai_dc&until=2024-02-30", "no such day"],
    ["verb=ListRecords&metadataPrefix=oai_dc&from=2024-01-01T00:00:00+01:00", "a time zone other than Z"],
    // §3.3.1: both bounds of one request have the same granularity.
    ["verb=ListRecords&metadataPrefix=oai_dc&from=2024-01-01&until=2024-02-01T00:00:00Z", "two granularities"],
    // Common practice (harvesters' validators): from after until is a bad argument, not an empty list.
    ["verb=ListRecords&metadataPrefix=oai_dc&from=2024-02-01&until=2024-01-01", "from after until"],
    // Text PostgreSQL cannot store is refused in the protocol's own terms, in XML, not as a JSON problem.
    ["verb=ListRecords&metadataPrefix=oai_dc&set=a%00b", "a NUL in an argument"],
  ])("%s → badArgument (%s)", async (query) => {
    const { root } = await get(query);
    expect(errorCodes(root)).toEqual(["badArgument"]);
    expect(requestAttributes(root)).toEqual({});
  });
});

describe("ListMetadataFormats (§4.4) and ListSets (§4.6)", () => {
  it("offers oai_dc and oai_datacite, each with its schema and namespace, for the repository and for one item", async () => {
    for (const query of [
      "verb=ListMetadataFormats",
      `verb=ListMetadataFormats&identifier=${encodeURIComponent(oaiId(made.published.identifier!))}`,
    ]) {
      const { root } = await get(query);
      expect(root.ListMetadataFormats.metadataFormat).toEqual([
        {
          metadataPrefix: "oai_dc",
          schema: "http://www.openarchives.org/OAI/2.0/oai_dc.xsd",
          metadataNamespace: "http://www.openarchives.org/OAI/2.0/oai_dc/",
        },
        {
          metadataPrefix: "oai_datacite",
          schema: "http://schema.datacite.org/meta/kernel-4/metadata.xsd",
          metadataNamespace: "http://datacite.org/schema/kernel-4",
        },
      ]);
    }
  });

  it("an identifier that names no item is idDoesNotExist, with the valid arguments echoed", async () => {
    const id = `oai:${host()}:10.5072/ARH-0000-0000/9`;
    const { root } = await get(`verb=ListMetadataFormats&identifier=${encodeURIComponent(id)}`);
    expect(errorCodes(root)).toEqual(["idDoesNotExist"]);
    expect(requestAttributes(root)).toEqual({ "@verb": "ListMetadataFormats", "@identifier": id });
  });

  it("lists one set per reaction class, setSpec in the protocol's alphabet; a resumptionToken is badResumptionToken", async () => {
    const { root } = await get("verb=ListSets");
    const sets = root.ListSets.set as Node[];
    expect(sets.map((s) => s.setSpec[0])).toEqual(REACTION_CLASSES.map((c) => c.id));
    // §2.6: setSpec is a colon-separated list of unreserved URI characters.
    for (const s of sets) expect(s.setSpec[0]).toMatch(/^[A-Za-z0-9\-_.!~*'()]+(:[A-Za-z0-9\-_.!~*'()]+)*$/);
    expect(sets[0].setName).toBe(REACTION_CLASSES[0].label);
    const again = await get("verb=ListSets&resumptionToken=abc");
    expect(errorCodes(again.root)).toEqual(["badResumptionToken"]);
  });
});

describe("GetRecord (§4.1)", () => {
  it("oai_dc: the header (identifier, datestamp, set) and unqualified Dublin Core of the version", async () => {
    const p = made.published;
    const { root } = await get(`verb=GetRecord&metadataPrefix=oai_dc&identifier=${encodeURIComponent(oaiId(p.identifier!))}`);
    const [record] = root.GetRecord.record as Node[];
    const [header] = record.header as Node[];
    expect(header.identifier).toBe(oaiId(p.identifier!));
    expect(header.datestamp).toBe(await datestampOf(p.versionId));
    expect(header.setSpec).toEqual(["hydrogen-abstraction"]);
    expect(header["@status"]).toBeUndefined();
    const dc = record.metadata["oai_dc:dc"] as Node;
    expect(dc["@xmlns:oai_dc"]).toBe("http://www.openarchives.org/OAI/2.0/oai_dc/");
    expect(dc["@xmlns:dc"]).toBe("http://purl.org/dc/elements/1.1/");
    expect(dc["dc:title"]).toEqual([p.title]);
    expect(dc["dc:identifier"]).toContain(`https://doi.org/${p.identifier}`);
    expect(dc["dc:type"]).toBe("Dataset");
    expect(requestAttributes(root)).toMatchObject({ "@verb": "GetRecord", "@metadataPrefix": "oai_dc" });
  });

  it("oai_datacite: the same DataCite kernel-4 resource the datacite.xml endpoint serves (one builder)", async () => {
    const p = made.published;
    const { root } = await get(`verb=GetRecord&metadataPrefix=oai_datacite&identifier=${encodeURIComponent(oaiId(p.identifier!))}`);
    const resource = root.GetRecord.record[0].metadata.resource as Node;
    expect(resource["@xmlns"]).toBe("http://datacite.org/schema/kernel-4");
    const body = await getPublicVersionDatacite({ datasetId: p.datasetId, versionNumber: 1 });
    const alone = parser.parse(buildDataciteXml(body!.data.attributes)).resource as Node;
    expect(resource).toEqual(alone);
    expect(resource.identifier).toEqual({ "#text": p.identifier, "@identifierType": "DOI" });
  });

  it("a retracted version is a deleted record: header with status deleted, its retraction's datestamp, no metadata (§2.5.1)", async () => {
    const r = made.retracted;
    const { root } = await get(`verb=GetRecord&metadataPrefix=oai_dc&identifier=${encodeURIComponent(oaiId(r.identifier!))}`);
    const [record] = root.GetRecord.record as Node[];
    expect(record.header[0]["@status"]).toBe("deleted");
    const [{ retracted_at }] = await sql<{ retracted_at: Date }[]>`select retracted_at from dataset_versions where id = ${r.versionId}`;
    expect(record.header[0].datestamp).toBe(retracted_at.toISOString().replace(/\.\d{3}Z$/, "Z"));
    expect(record.metadata).toBeUndefined();
  });

  it("cannotDisseminateFormat, idDoesNotExist (also for another host's identifier), both at once", async () => {
    const id = encodeURIComponent(oaiId(made.published.identifier!));
    expect(errorCodes((await get(`verb=GetRecord&metadataPrefix=marc&identifier=${id}`)).root)).toEqual(["cannotDisseminateFormat"]);
    const elsewhere = encodeURIComponent(`oai:elsewhere.example:${made.published.identifier}`);
    expect(errorCodes((await get(`verb=GetRecord&metadataPrefix=oai_dc&identifier=${elsewhere}`)).root)).toEqual(["idDoesNotExist"]);
    expect(errorCodes((await get(`verb=GetRecord&metadataPrefix=marc&identifier=nothing`)).root)).toEqual([
      "cannotDisseminateFormat",
      "idDoesNotExist",
    ]);
  });
});

/** Every header of a list, following resumption tokens; checks §3.5's cursor and completeListSize on the way. */
async function walk(verb: "ListIdentifiers" | "ListRecords", first: string, pageSize: number) {
  process.env.OAI_PAGE_SIZE = String(pageSize);
  const headers: Node[] = [];
  const records: Node[] = [];
  let query = `verb=${verb}&${first}`;
  let pages = 0;
  let size: number | null = null;
  for (;;) {
    const { root } = await get(query);
    expect(errorCodes(root)).toEqual([]);
    const list = root[verb] as Node;
    const page = verb === "ListIdentifiers" ? (list.header as Node[]) : (list.record as Node[]);
    expect(page.length).toBeLessThanOrEqual(pageSize);
    if (verb === "ListRecords") records.push(...page);
    headers.push(...(verb === "ListIdentifiers" ? page : page.map((r) => r.header[0])));
    pages++;
    const token = list.resumptionToken as Node | string | undefined;
    if (token === undefined) {
      // A list complete in one response carries no token.
      expect(pages).toBe(1);
      break;
    }
    const t = typeof token === "string" ? { "#text": token } : token;
    // §3.5.1: completeListSize, and cursor = elements returned before this response.
    expect(Number(t["@cursor"])).toBe(headers.length - page.length);
    size ??= Number(t["@completeListSize"]);
    expect(Number(t["@completeListSize"])).toBe(size);
    if (!t["#text"]) {
      // §3.5: the last part of an incomplete list carries an empty resumptionToken.
      expect(t["@expirationDate"]).toBeUndefined();
      break;
    }
    expect(page.length).toBe(pageSize);
    expect(Date.parse(t["@expirationDate"])).toBeGreaterThan(Date.now());
    query = `verb=${verb}&resumptionToken=${encodeURIComponent(t["#text"])}`;
  }
  if (size !== null) expect(headers.length).toBe(size);
  return { headers, records, pages };
}

describe("ListIdentifiers (§4.3) and ListRecords (§4.5) with resumption (§3.5)", () => {
  it("walks the whole repository a few records at a time: every public version once, in datestamp order, nothing else", async () => {
    const { headers, pages } = await walk("ListIdentifiers", "metadataPrefix=oai_dc", 7);
    expect(pages).toBeGreaterThan(2);
    const ids = headers.map((h) => h.identifier as string);
    expect(new Set(ids).size).toBe(ids.length);
    const rows = await sql<{ version_identifier: string; state: string }[]>`
      select version_identifier, state from dataset_versions where state in ('published', 'retracted')`;
    expect(ids.sort()).toEqual(rows.map((r) => oaiId(r.version_identifier)).sort());
    const stamps = headers.map((h) => h.datestamp as string);
    expect([...stamps].sort()).toEqual(stamps.slice().sort());
    // §2.5.1: retracted versions are there, as deleted records.
    const deleted = new Set(headers.filter((h) => h["@status"] === "deleted").map((h) => h.identifier));
    expect(deleted).toEqual(new Set(rows.filter((r) => r.state === "retracted").map((r) => oaiId(r.version_identifier))));
    expect(deleted.has(oaiId(made.retracted.identifier!))).toBe(true);
  });

  it("ListRecords over pages: records of public versions only (drafts, submissions, returned and declined never show)", async () => {
    const since = shift(await datestampOf(made.published.versionId), -1);
    const { records } = await walk("ListRecords", `metadataPrefix=oai_dc&from=${since}`, 2);
    const titles = records.flatMap((r) => (r.metadata ? (r.metadata["oai_dc:dc"]["dc:title"] as string[]) : []));
    expect(titles).toContain(made.published.title);
    expect(titles).toContain(made.insertion.title);
    for (const state of ["draft", "submitted", "in_review", "returned", "declined", "retracted"])
      expect(titles, state).not.toContain(made[state].title);
    for (const r of records) expect(Boolean(r.metadata)).toBe(r.header[0]["@status"] !== "deleted");
  });

  it("from and until are inclusive at seconds and at day granularity (§3.3.1, §2.7.1)", async () => {
    const p = made.insertion;
    const stamp = await datestampOf(p.versionId);
    const day = stamp.slice(0, 10);
    const has = async (args: string) => {
      const { root } = await get(`verb=ListIdentifiers&metadataPrefix=oai_dc&set=insertion&${args}`);
      if (errorCodes(root).includes("noRecordsMatch")) return false;
      return (root.ListIdentifiers.header as Node[]).some((h) => h.identifier === oaiId(p.identifier!));
    };
    process.env.OAI_PAGE_SIZE = "10000";
    expect(await has(`from=${stamp}`)).toBe(true);
    expect(await has(`until=${stamp}`)).toBe(true);
    expect(await has(`from=${stamp}&until=${stamp}`)).toBe(true);
    expect(await has(`from=${shift(stamp, 1)}`)).toBe(false);
    expect(await has(`until=${shift(stamp, -1)}`)).toBe(false);
    expect(await has(`from=${day}&until=${day}`)).toBe(true);
    // The last day a four-digit year writes is a bound like any other (its end is not year 10000).
    expect(await has(`until=9999-12-31`)).toBe(true);
    expect(await has(`from=${day}&until=9999-12-31`)).toBe(true);
    expect(await has(`until=9999-12-31T23:59:59Z`)).toBe(true);
    const nextDay = new Date(Date.parse(day) + 86_400_000).toISOString().slice(0, 10);
    const dayBefore = new Date(Date.parse(day) - 86_400_000).toISOString().slice(0, 10);
    expect(await has(`from=${nextDay}`)).toBe(false);
    expect(await has(`until=${dayBefore}`)).toBe(false);
  });

  it("a set selects the records of one reaction class (§2.7.2); an unknown set or an empty selection is noRecordsMatch", async () => {
    process.env.OAI_PAGE_SIZE = "10000";
    const { root } = await get("verb=ListIdentifiers&metadataPrefix=oai_dc&set=insertion");
    const headers = root.ListIdentifiers.header as Node[];
    expect(headers.map((h) => h.identifier)).toContain(oaiId(made.insertion.identifier!));
    expect(headers.map((h) => h.identifier)).not.toContain(oaiId(made.published.identifier!));
    for (const h of headers) expect(h.setSpec).toEqual(["insertion"]);
    expect(errorCodes((await get("verb=ListRecords&metadataPrefix=oai_dc&set=no-such-class")).root)).toEqual(["noRecordsMatch"]);
    expect(errorCodes((await get("verb=ListRecords&metadataPrefix=oai_dc&until=1990-01-01")).root)).toEqual(["noRecordsMatch"]);
    expect(errorCodes((await get("verb=ListRecords&metadataPrefix=mods")).root)).toEqual(["cannotDisseminateFormat"]);
  });

  it("a resumption token cannot be forged, carried to another verb, or used after it expires (badResumptionToken)", async () => {
    process.env.OAI_PAGE_SIZE = "2";
    const { root } = await get("verb=ListIdentifiers&metadataPrefix=oai_dc");
    const token = root.ListIdentifiers.resumptionToken["#text"] as string;
    expect(token).toBeTruthy();
    const [body, mac] = token.split(".");
    const changed = Buffer.from(JSON.stringify({ ...JSON.parse(Buffer.from(body, "base64url").toString()), cursor: 0 })).toString(
      "base64url",
    );
    for (const bad of [`${changed}.${mac}`, "garbage", `${body}.${mac}x`]) {
      const { root: r } = await get(`verb=ListIdentifiers&resumptionToken=${encodeURIComponent(bad)}`);
      expect(errorCodes(r), bad).toEqual(["badResumptionToken"]);
      expect(requestAttributes(r)).toMatchObject({ "@verb": "ListIdentifiers" });
    }
    expect(errorCodes((await get(`verb=ListRecords&resumptionToken=${encodeURIComponent(token)}`)).root)).toEqual(["badResumptionToken"]);
    expect(errorCodes((await get(`verb=ListIdentifiers&resumptionToken=${encodeURIComponent(token)}`)).root)).toEqual([]);
    // The token says when it expires; a day and a bit later it is refused.
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(Date.parse(root.ListIdentifiers.resumptionToken["@expirationDate"]) + 2000);
    expect(errorCodes((await get(`verb=ListIdentifiers&resumptionToken=${encodeURIComponent(token)}`)).root)).toEqual([
      "badResumptionToken",
    ]);
  });
});

describe("datestamps move when a record changes (§2.7.1: the date of creation, modification or deletion)", () => {
  /** Waits until the clock is in a later second than `d` (datestamps are compared at seconds). */
  const nextSecond = async (d: Date) => {
    const wait = Math.floor(d.getTime() / 1000) * 1000 + 1000 - Date.now();
    if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait + 20));
  };
  const publish = async (versionId: number, reply?: string) => {
    await applyTransition({ versionId, actorId: owner.id, transition: "submit", reply });
    await applyTransition({ versionId, actorId: curator.id, transition: "accept", reason: "For the test." });
  };
  const relationsOf = async (identifier: string, from: string) => {
    process.env.OAI_PAGE_SIZE = "10000";
    const { root } = await get(`verb=ListRecords&metadataPrefix=oai_datacite&set=elimination&from=${from}`);
    const record = ((root.ListRecords?.record ?? []) as Node[]).find((r) => r.header[0].identifier === oaiId(identifier));
    if (!record) return null;
    const related = record.metadata.resource.relatedIdentifiers.relatedIdentifier as Node | Node[];
    return (Array.isArray(related) ? related : [related]).map((r) => `${r["@relationType"]} ${r["#text"]}`);
  };

  it("publishing v2 moves v1's datestamp: a harvest from that moment gets v1 again, with its link to v2", async () => {
    const v1 = await datasetIn("published", "elimination");
    const first = (await changedAt(v1.versionId))!;
    const [{ published_at }] = await sql<{ published_at: Date }[]>`select published_at from dataset_versions where id = ${v1.versionId}`;
    expect(first).toEqual(published_at);
    await nextSecond(first);
    const v2 = await startNextVersion({ actor: owner, versionId: v1.versionId });
    // A draft, a submission, a return and a declined version change no record.
    await applyTransition({ versionId: v2.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v2.id, actorId: curator.id, transition: "return", reason: "For the test." });
    expect(await changedAt(v1.versionId)).toEqual(first);
    expect(await changedAt(v2.id)).toBeNull();
    await publish(v2.id, "Resubmitted as it was.");
    const [v2Row] = await sql<{ published_at: Date; version_identifier: string }[]>`
      select published_at, version_identifier from dataset_versions where id = ${v2.id}`;
    expect(await changedAt(v2.id)).toEqual(v2Row.published_at);
    expect(await changedAt(v1.versionId)).toEqual(v2Row.published_at);
    // A harvester that last came just after v1's publication gets v1 again, now naming v2.
    const since = atSeconds(v2Row.published_at);
    expect(since > atSeconds(first)).toBe(true);
    expect(await relationsOf(v1.identifier!, since)).toContain(`IsPreviousVersionOf ${v2Row.version_identifier}`);
    expect(await relationsOf(v2Row.version_identifier, since)).toContain(`IsNewVersionOf ${v1.identifier}`);

    // A third version declined, and v2's retraction, leave v1's record as it is (v2 keeps its identifier and the link).
    await nextSecond(v2Row.published_at);
    const v3 = await startNextVersion({ actor: owner, versionId: v2.id });
    await applyTransition({ versionId: v3.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v3.id, actorId: curator.id, transition: "decline", reason: "For the test." });
    await applyTransition({ versionId: v2.id, actorId: curator.id, transition: "retract", reason: "Retracted for the test." });
    const [{ retracted_at }] = await sql<{ retracted_at: Date }[]>`select retracted_at from dataset_versions where id = ${v2.id}`;
    expect(await changedAt(v2.id)).toEqual(retracted_at);
    expect(await changedAt(v1.versionId)).toEqual(v2Row.published_at);
    expect(await changedAt(v3.id)).toBeNull();
    expect(await relationsOf(v1.identifier!, since)).toContain(`IsPreviousVersionOf ${v2Row.version_identifier}`);

    // v1's own retraction moves it, and it is listed from then on as a deleted record.
    await nextSecond(retracted_at);
    await applyTransition({ versionId: v1.versionId, actorId: curator.id, transition: "retract", reason: "Retracted for the test." });
    const [{ retracted_at: v1Retracted }] = await sql<
      { retracted_at: Date }[]
    >`select retracted_at from dataset_versions where id = ${v1.versionId}`;
    expect(await changedAt(v1.versionId)).toEqual(v1Retracted);
    process.env.OAI_PAGE_SIZE = "10000";
    const { root } = await get(`verb=ListIdentifiers&metadataPrefix=oai_dc&set=elimination&from=${atSeconds(v1Retracted)}`);
    const header = (root.ListIdentifiers.header as Node[]).find((h) => h.identifier === oaiId(v1.identifier!));
    expect(header).toMatchObject({ "@status": "deleted", datestamp: atSeconds(v1Retracted) });
  }, 60_000);

  it("the runtime role cannot write a datestamp (only the trigger of a change of state does)", async () => {
    const id = made.published.versionId;
    await expect(sql`update oai_record_datestamps set changed_at = now() where version_id = ${id}`).rejects.toThrow(/permission denied/);
    await expect(sql`delete from oai_record_datestamps where version_id = ${id}`).rejects.toThrow(/permission denied/);
    await expect(sql`insert into oai_record_datestamps (version_id, changed_at) values (${made.draft.versionId}, now())`).rejects.toThrow(
      /permission denied/,
    );
  });
});

describe("POST (§3.1.1.2)", () => {
  it("answers a form-encoded body as it answers the same query", async () => {
    const id = oaiId(made.published.identifier!);
    const query = `verb=GetRecord&metadataPrefix=oai_dc&identifier=${encodeURIComponent(id)}`;
    const viaPost = await post(query);
    const viaGet = await get(query);
    expect({ ...viaPost.root, responseDate: null }).toEqual({ ...viaGet.root, responseDate: null });
  });

  it("a body of another type reads as no arguments: badVerb saying how to send them", async () => {
    const { root } = await post(JSON.stringify({ verb: "Identify" }), "application/json");
    expect(errorCodes(root)).toEqual(["badVerb"]);
    expect(root.error[0]["#text"]).toMatch(/x-www-form-urlencoded/);
  });
});
