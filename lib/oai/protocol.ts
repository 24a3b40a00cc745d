import { describeUnstorableText } from "@/lib/storable-text";

/**
 * OAI-PMH 2.0 requests, read and checked before anything is looked up. PURE: the verbs, their
 * arguments (§4 of the protocol), the error codes (§3.6) and the UTCdatetime rules (§3.3).
 */

export const OAI_VERBS = ["Identify", "ListMetadataFormats", "ListSets", "ListIdentifiers", "ListRecords", "GetRecord"] as const;
export type OaiVerb = (typeof OAI_VERBS)[number];

/** §3.6: the protocol's error codes (noMetadataFormats and noSetHierarchy never arise here: every record has both formats, and sets are kept). */
export type OaiErrorCode =
  | "badVerb"
  | "badArgument"
  | "badResumptionToken"
  | "cannotDisseminateFormat"
  | "idDoesNotExist"
  | "noRecordsMatch"
  | "noMetadataFormats"
  | "noSetHierarchy";

export interface OaiError {
  code: OaiErrorCode;
  message: string;
}

/** §4: each verb's arguments; `exclusive` is the argument that may only come alone (with the verb). */
const VERB_ARGUMENTS: Record<OaiVerb, { required: string[]; optional: string[]; exclusive?: string }> = {
  Identify: { required: [], optional: [] },
  ListMetadataFormats: { required: [], optional: ["identifier"] },
  ListSets: { required: [], optional: [], exclusive: "resumptionToken" },
  GetRecord: { required: ["identifier", "metadataPrefix"], optional: [] },
  ListIdentifiers: { required: ["metadataPrefix"], optional: ["from", "until", "set"], exclusive: "resumptionToken" },
  ListRecords: { required: ["metadataPrefix"], optional: ["from", "until", "set"], exclusive: "resumptionToken" },
};

/** A selective-harvesting bound: the first instant it admits (from) or the first it no longer admits (until). */
export interface DateBound {
  /** As the harvester wrote it, for the echo. */
  text: string;
  granularity: "day" | "seconds";
  /** from: records at or after this instant; until: records strictly before it (the bound's whole second or day). */
  instant: Date;
}

export type OaiRequest =
  | { ok: true; verb: OaiVerb; args: Record<string, string>; from: DateBound | null; until: DateBound | null }
  /** `echo`: whether the response's request element may carry the arguments (§3.2: not after badVerb or badArgument). */
  | { ok: false; errors: OaiError[]; verb: OaiVerb | null; args: Record<string, string>; echo: boolean };

const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;
const SECONDS = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})Z$/;

/** The last instant a four-digit year writes: an `until` of 9999-12-31 ends here. */
const LAST_INSTANT = Date.UTC(9999, 11, 31, 23, 59, 59, 999);

/**
 * §3.3.1: a `from`/`until` value at day (YYYY-MM-DD) or seconds (YYYY-MM-DDThh:mm:ssZ) granularity,
 * or null when it is neither or names no real date. `until` covers its whole day or second.
 */
export function parseDateBound(text: string, role: "from" | "until"): DateBound | null {
  const day = DAY.exec(text);
  const seconds = day ? null : SECONDS.exec(text);
  const m = day ?? seconds;
  if (!m) return null;
  const [y, mo, d, h = "0", mi = "0", s = "0"] = m.slice(1).map((x) => x ?? "0");
  const ms = Date.UTC(Number(y), Number(mo) - 1, Number(d), Number(h), Number(mi), Number(s));
  const instant = new Date(ms);
  // Date.UTC rolls 2024-02-30 over to March: a value that does not come back as written is no date.
  const written = day ? instant.toISOString().slice(0, 10) : formatDatestamp(instant);
  if (written !== text || Number(y) < 1) return null;
  const step = day ? 86_400_000 : 1000;
  const end = Math.min(ms + step, LAST_INSTANT);
  return { text, granularity: day ? "day" : "seconds", instant: role === "from" ? instant : new Date(end) };
}

/** §3.3.2: a UTCdatetime at seconds granularity (`2024-05-01T09:30:00Z`), fractions dropped. */
export function formatDatestamp(date: Date): string {
  return date.toISOString().replace(/\.\d{3}Z$/, "Z");
}

/**
 * Reads a request's arguments (query string or form body, in order, repeats kept) into a verb and
 * its arguments, or the protocol errors it earns: badVerb for a missing, repeated or unknown verb;
 * badArgument for an argument the verb does not take, a repeated or empty one, a missing required
 * one, an exclusive one with company, or dates of the wrong form, of two granularities or in the
 * wrong order.
 */
export function readOaiRequest(pairs: Iterable<[string, string]>): OaiRequest {
  const all = [...pairs];
  const verbs = all.filter(([k]) => k === "verb").map(([, v]) => v);
  const args: Record<string, string> = {};
  const fail = (verb: OaiVerb | null, code: OaiErrorCode, message: string): OaiRequest => ({
    ok: false,
    errors: [{ code, message }],
    verb,
    args: {},
    echo: false,
  });
  if (verbs.length === 0) return fail(null, "badVerb", "The request names no verb.");
  if (verbs.length > 1) return fail(null, "badVerb", "The verb argument is repeated.");
  const verb = OAI_VERBS.find((v) => v === verbs[0]) ?? null;
  if (!verb) return fail(null, "badVerb", `“${verbs[0].slice(0, 60)}” is not an OAI-PMH verb.`);

  const rule = VERB_ARGUMENTS[verb];
  const allowed = new Set([...rule.required, ...rule.optional, ...(rule.exclusive ? [rule.exclusive] : [])]);
  for (const [key, value] of all) {
    if (key === "verb") continue;
    if (!allowed.has(key)) return fail(verb, "badArgument", `${verb} takes no argument “${key.slice(0, 60)}”.`);
    if (Object.hasOwn(args, key)) return fail(verb, "badArgument", `The argument ${key} is repeated.`);
    if (value === "") return fail(verb, "badArgument", `The argument ${key} has no value.`);
    const unstorable = describeUnstorableText(value);
    if (unstorable) return fail(verb, "badArgument", `The argument ${key} ${unstorable}.`);
    args[key] = value;
  }
  if (rule.exclusive && Object.hasOwn(args, rule.exclusive)) {
    if (Object.keys(args).length > 1)
      return fail(verb, "badArgument", `${rule.exclusive} is an exclusive argument: send it alone with the verb.`);
    return { ok: true, verb, args, from: null, until: null };
  }
  for (const key of rule.required) if (!Object.hasOwn(args, key)) return fail(verb, "badArgument", `${verb} needs the argument ${key}.`);

  const from = args.from === undefined ? null : parseDateBound(args.from, "from");
  const until = args.until === undefined ? null : parseDateBound(args.until, "until");
  if (args.from !== undefined && !from)
    return fail(verb, "badArgument", "from must be a date YYYY-MM-DD or a time YYYY-MM-DDThh:mm:ssZ (UTC).");
  if (args.until !== undefined && !until)
    return fail(verb, "badArgument", "until must be a date YYYY-MM-DD or a time YYYY-MM-DDThh:mm:ssZ (UTC).");
  if (from && until && from.granularity !== until.granularity)
    return fail(verb, "badArgument", "from and until must have the same granularity (both days or both seconds).");
  if (from && until && from.instant >= until.instant) return fail(verb, "badArgument", "from is later than until.");
  return { ok: true, verb, args, from, until };
}
