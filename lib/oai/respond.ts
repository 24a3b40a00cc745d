import "server-only";
import { create } from "xmlbuilder2";
import { appUrl, oaiAdminEmail, oaiPageSize } from "@/lib/config";
import { REACTION_CLASSES } from "@/lib/deposits/vocabulary";
import { appendDataciteResource, DATACITE_KERNEL, xmlBuilderText, type XmlNode } from "@/lib/identifiers/datacite";
import { buildRegistrationBody } from "@/lib/identifiers/register";
import { appendDublinCore, DC_NAMESPACE, OAI_DC } from "./dublin-core";
import { formatDatestamp, readOaiRequest, type OaiError, type OaiVerb } from "./protocol";
import {
  countOaiHeaders,
  getOaiEarliestDatestamp,
  getOaiHeader,
  listOaiHeaders,
  listOaiRecordSubjects,
  type OaiHeaderRow,
  type OaiListFilter,
} from "./queries";
import { readResumptionToken, RESUMPTION_TOKEN_SECONDS, signResumptionToken, type ListPosition } from "./token";

/**
 * The OAI-PMH 2.0 repository at /oai: one request's arguments in, the whole XML response out.
 * Protocol errors are part of the response (§3.6), never an HTTP error.
 */

const OAI_NS = "http://www.openarchives.org/OAI/2.0/";
const OAI_SCHEMA = "http://www.openarchives.org/OAI/2.0/OAI-PMH.xsd";
const XSI_NS = "http://www.w3.org/2001/XMLSchema-instance";
const OAI_IDENTIFIER = {
  namespace: "http://www.openarchives.org/OAI/2.0/oai-identifier",
  schema: "http://www.openarchives.org/OAI/2.0/oai-identifier.xsd",
};

/** The formats every record is offered in: prefix → schema and namespace (ListMetadataFormats). */
export const OAI_METADATA_FORMATS = {
  oai_dc: OAI_DC,
  oai_datacite: DATACITE_KERNEL,
} as const;
type MetadataPrefix = keyof typeof OAI_METADATA_FORMATS;
const isPrefix = (p: string): p is MetadataPrefix => Object.hasOwn(OAI_METADATA_FORMATS, p);

/** The repository's base URL (§3.1: the address every request is sent to). */
export const oaiBaseUrl = () => `${appUrl()}/oai`;

/** The repository identifier of OAI identifiers: the host of the public address. */
const repositoryHost = () => new URL(appUrl()).hostname;

/** `oai:<host>:<version identifier>` — the item of one published version (its identifier is already unique). */
export function oaiIdentifier(versionIdentifier: string): string {
  return `oai:${repositoryHost()}:${versionIdentifier}`;
}

/** The version identifier an OAI identifier of ours names, or null. */
export function versionIdentifierOf(oaiId: string): string | null {
  const prefix = `oai:${repositoryHost()}:`;
  return oaiId.startsWith(prefix) && oaiId.length > prefix.length ? oaiId.slice(prefix.length) : null;
}

const text = (value: string) => xmlBuilderText(value);

export interface OaiOptions {
  /** Records in one list response (OAI_PAGE_SIZE). */
  pageSize?: number;
  now?: Date;
  /** Why a POST's body could not be read as arguments (then the answer is badVerb saying so). */
  unreadableBody?: string;
}

/** The response to one request, given its arguments in order (repeats kept). */
export async function answerOaiRequest(
  pairs: Iterable<[string, string]>,
  { pageSize = oaiPageSize(), now = new Date(), unreadableBody }: OaiOptions = {},
) {
  const read = readOaiRequest(pairs);
  const request: typeof read = unreadableBody
    ? { ok: false, errors: [{ code: "badVerb", message: unreadableBody }], verb: null, args: {}, echo: false }
    : read;
  const doc = create({ version: "1.0", encoding: "UTF-8" });
  const root = doc.ele(OAI_NS, "OAI-PMH").att(XSI_NS, "xsi:schemaLocation", `${OAI_NS} ${OAI_SCHEMA}`);
  root.ele("responseDate").txt(formatDatestamp(now));
  const requestEl = root.ele("request");
  const finish = (errors: OaiError[], echo: boolean, verb: OaiVerb | null, args: Record<string, string>) => {
    // §3.2: after badVerb or badArgument the request element carries the base URL only.
    if (echo && verb) {
      requestEl.att("verb", verb);
      for (const [k, v] of Object.entries(args)) requestEl.att(k, text(v));
    }
    requestEl.txt(text(oaiBaseUrl()));
    for (const e of errors) root.ele("error", { code: e.code }).txt(text(e.message));
    return doc.end({ prettyPrint: true }) + "\n";
  };
  if (!request.ok) return finish(request.errors, request.echo, request.verb, request.args);

  const { verb, args } = request;
  const errors: OaiError[] = [];
  const holder = root.ele(verb);
  switch (verb) {
    case "Identify":
      await identify(holder);
      break;
    case "ListMetadataFormats":
      if (args.identifier !== undefined && !(await findHeader(args.identifier))) errors.push(noSuchIdentifier(args.identifier));
      else
        for (const [prefix, f] of Object.entries(OAI_METADATA_FORMATS)) {
          const el = holder.ele("metadataFormat");
          el.ele("metadataPrefix").txt(prefix);
          el.ele("schema").txt(f.schema);
          el.ele("metadataNamespace").txt(f.namespace);
        }
      break;
    case "ListSets":
      // Every set fits in one response, so no token is ever issued.
      if (args.resumptionToken !== undefined)
        errors.push({ code: "badResumptionToken", message: "This repository issues no resumption tokens for ListSets." });
      else listSets(holder);
      break;
    case "GetRecord": {
      if (!isPrefix(args.metadataPrefix)) errors.push(cannotDisseminate(args.metadataPrefix));
      const header = await findHeader(args.identifier);
      if (!header) errors.push(noSuchIdentifier(args.identifier));
      if (header && isPrefix(args.metadataPrefix)) await appendRecords(holder, [header], args.metadataPrefix);
      break;
    }
    case "ListIdentifiers":
    case "ListRecords":
      errors.push(...(await list(holder, verb, args, request, { pageSize, now })));
      break;
  }
  if (errors.length) holder.remove();
  return finish(errors, true, verb, args);
}

const noSuchIdentifier = (id: string): OaiError => ({
  code: "idDoesNotExist",
  message: `“${id.slice(0, 200)}” is not the identifier of a record here (records are ${oaiIdentifier("<version identifier>")}).`,
});
const cannotDisseminate = (prefix: string): OaiError => ({
  code: "cannotDisseminateFormat",
  message: `“${prefix.slice(0, 60)}” is not a metadata format of this repository; it offers ${Object.keys(OAI_METADATA_FORMATS).join(" and ")}.`,
});

async function findHeader(oaiId: string): Promise<OaiHeaderRow | null> {
  const identifier = versionIdentifierOf(oaiId);
  return identifier ? getOaiHeader({ identifier }) : null;
}

/** §4.2 Identify. */
async function identify(el: XmlNode) {
  const earliest = await getOaiEarliestDatestamp();
  el.ele("repositoryName").txt("Arrhenia");
  el.ele("baseURL").txt(text(oaiBaseUrl()));
  el.ele("protocolVersion").txt("2.0");
  el.ele("adminEmail").txt(text(oaiAdminEmail()));
  // With nothing public yet, any instant is a lower bound of the (no) datestamps.
  el.ele("earliestDatestamp").txt(formatDatestamp(earliest ?? new Date(0)));
  el.ele("deletedRecord").txt("persistent");
  el.ele("granularity").txt("YYYY-MM-DDThh:mm:ssZ");
  const host = repositoryHost();
  const sample = oaiIdentifier("10.5072/ARH-4F7K-9QXM/2");
  // The OAI identifier scheme's own description, where its rules allow the host (a domain name with a dot).
  if (/^[a-zA-Z][a-zA-Z0-9-]*(\.[a-zA-Z][a-zA-Z0-9-]*)+$/.test(host)) {
    const d = el
      .ele("description")
      .ele(OAI_IDENTIFIER.namespace, "oai-identifier")
      .att(XSI_NS, "xsi:schemaLocation", `${OAI_IDENTIFIER.namespace} ${OAI_IDENTIFIER.schema}`);
    d.ele("scheme").txt("oai");
    d.ele("repositoryIdentifier").txt(host);
    d.ele("delimiter").txt(":");
    d.ele("sampleIdentifier").txt(text(sample));
  }
  describeInDublinCore(
    el.ele("description"),
    "Arrhenia: reviewed, versioned datasets of chemical rate constants k(T). Each record is one published version of a dataset; " +
      `its identifier is oai:${host}: followed by the version identifier, e.g. ${sample}. A retracted version stays as a deleted ` +
      "record, dated when it was retracted. Sets are reaction classes. Metadata formats: oai_dc and oai_datacite (DataCite kernel 4).",
  );
}

/** A description container in oai_dc (§4.2 and §4.6 allow any schema-described XML there). */
function describeInDublinCore(el: XmlNode, description: string) {
  el.ele(OAI_DC.namespace, "oai_dc:dc")
    .att("xmlns:dc", DC_NAMESPACE)
    .att(XSI_NS, "xsi:schemaLocation", `${OAI_DC.namespace} ${OAI_DC.schema}`)
    .ele(DC_NAMESPACE, "dc:description")
    .txt(text(description));
}

/** §4.6 ListSets: one set per reaction class. */
function listSets(el: XmlNode) {
  for (const c of REACTION_CLASSES) {
    const set = el.ele("set");
    set.ele("setSpec").txt(c.id);
    set.ele("setName").txt(text(c.label));
    describeInDublinCore(set.ele("setDescription"), c.hint);
  }
}

/** §2.5 records (GetRecord, ListRecords): header, and metadata unless deleted (§2.5.1). */
async function appendRecords(el: XmlNode, headers: OaiHeaderRow[], prefix: MetadataPrefix) {
  const subjects = await listOaiRecordSubjects({ versionIds: headers.filter((h) => !h.deleted).map((h) => h.versionId) });
  for (const h of headers) {
    const record = el.ele("record");
    appendHeader(record, h);
    const subject = subjects.get(h.versionId);
    if (h.deleted || !subject) continue;
    const attributes = buildRegistrationBody(subject).data.attributes;
    const metadata = record.ele("metadata");
    if (prefix === "oai_datacite") appendDataciteResource(metadata, attributes);
    else appendDublinCore(metadata, attributes);
  }
}

function appendHeader(el: XmlNode, h: OaiHeaderRow) {
  const header = el.ele("header", h.deleted ? { status: "deleted" } : {});
  header.ele("identifier").txt(text(oaiIdentifier(h.identifier)));
  header.ele("datestamp").txt(formatDatestamp(h.datestamp));
  if (h.setSpec && REACTION_CLASSES.some((c) => c.id === h.setSpec)) header.ele("setSpec").txt(h.setSpec);
}

/** §4.3 ListIdentifiers and §4.5 ListRecords, a page at a time with §3.5 resumption tokens. */
async function list(
  el: XmlNode,
  verb: "ListIdentifiers" | "ListRecords",
  args: Record<string, string>,
  request: { from: { instant: Date } | null; until: { instant: Date } | null },
  { pageSize, now }: { pageSize: number; now: Date },
): Promise<OaiError[]> {
  let position: Omit<ListPosition, "after" | "cursor" | "expires"> & Partial<ListPosition>;
  if (args.resumptionToken !== undefined) {
    const read = readResumptionToken(args.resumptionToken, now);
    if ("refused" in read) return [{ code: "badResumptionToken", message: read.refused }];
    if (read.position.verb !== verb)
      return [{ code: "badResumptionToken", message: `The resumption token continues a ${read.position.verb} list, not ${verb}.` }];
    position = read.position;
  } else {
    if (!isPrefix(args.metadataPrefix)) return [cannotDisseminate(args.metadataPrefix)];
    if (args.set !== undefined && !REACTION_CLASSES.some((c) => c.id === args.set))
      return [{ code: "noRecordsMatch", message: `There is no set “${args.set.slice(0, 60)}”; ListSets names every set.` }];
    position = {
      verb,
      metadataPrefix: args.metadataPrefix,
      set: args.set ?? null,
      from: request.from?.instant.toISOString() ?? null,
      until: request.until?.instant.toISOString() ?? null,
    };
  }
  const prefix = position.metadataPrefix;
  if (!isPrefix(prefix)) return [cannotDisseminate(prefix)];
  const filter: OaiListFilter = {
    from: position.from ? new Date(position.from) : null,
    until: position.until ? new Date(position.until) : null,
    set: position.set,
  };
  const rows = await listOaiHeaders({ filter, after: position.after ?? null, limit: pageSize + 1 });
  const resumed = position.after !== undefined;
  if (!rows.length && !resumed) return [{ code: "noRecordsMatch", message: "No record matches these arguments." }];
  const page = rows.slice(0, pageSize);
  if (verb === "ListIdentifiers") for (const h of page) appendHeader(el, h);
  else await appendRecords(el, page, prefix);

  const more = rows.length > pageSize;
  if (!more && !resumed) return [];
  const cursor = position.cursor ?? 0;
  const attributes: Record<string, string> = {
    completeListSize: String(await countOaiHeaders({ filter })),
    cursor: String(cursor),
  };
  if (!more) {
    // §3.5: the last part of an incomplete list carries an empty token.
    el.ele("resumptionToken", attributes);
    return [];
  }
  const last = page[page.length - 1];
  const expires = Math.floor(now.getTime() / 1000) + RESUMPTION_TOKEN_SECONDS;
  const token = signResumptionToken({
    verb,
    metadataPrefix: prefix,
    set: position.set,
    from: position.from,
    until: position.until,
    after: { at: last.position, id: last.versionId },
    cursor: cursor + page.length,
    expires,
  });
  el.ele("resumptionToken", { ...attributes, expirationDate: formatDatestamp(new Date(expires * 1000)) }).txt(token);
  return [];
}
