// GET and POST /oai — the OAI-PMH 2.0 repository: every public version as a record (lib/oai)
import { withApi } from "@/lib/auth/api";
import { BODY_LIMITS, readTextBodyOrThrow } from "@/lib/http/read-body";
import { answerOaiRequest } from "@/lib/oai/respond";

// §3.1.2.1: responses are XML, encoded in UTF-8.
const XML_HEADERS = { "content-type": "text/xml; charset=utf-8", "x-content-type-options": "nosniff", "cache-control": "no-store" };

export const GET = withApi(
  async ({ req }) => new Response(await answerOaiRequest(new URL(req.url).searchParams), { headers: XML_HEADERS }),
  // lib/oai/protocol.ts answers a NUL or lone surrogate as badArgument, in XML like every other OAI error.
  { scope: null, checksQuery: true },
);

// §3.1.1.2: POST carries the same arguments as an application/x-www-form-urlencoded body.
export const POST = withApi(
  async ({ req }) => {
    const form = /^application\/x-www-form-urlencoded\b/i.test(req.headers.get("content-type") ?? "");
    const body = await readTextBodyOrThrow(req, { limit: BODY_LIMITS.form, what: "OAI-PMH request" });
    const xml = await answerOaiRequest(form ? new URLSearchParams(body) : [], {
      unreadableBody: form ? undefined : "A POST request sends its arguments as application/x-www-form-urlencoded.",
    });
    return new Response(xml, { headers: XML_HEADERS });
  },
  { scope: null },
);
