// A local stand-in for ORCID's OpenID Connect sign-in, for development and tests (started by
// scripts/serve.ts when ORCID_ISSUER is unset). The protocol is oidc-provider's (discovery,
// authorization with PKCE, token, signed ID tokens whose `sub` is the iD, as ORCID's are); the
// sign-in and consent pages are our own plain forms. Anyone may sign in as any iD whose check digit
// is right: it proves nothing and answers only on 127.0.0.1.
import { generateKeyPairSync, randomBytes } from "node:crypto";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import Provider, { errors, type Configuration } from "oidc-provider";
import { normaliseOrcid } from "./orcid";

/** Invented people with invented iDs (valid ISO 7064 MOD 11-2 check digits), offered on the stand-in's sign-in page. */
export const STAND_IN_PEOPLE: { orcid: string; givenName: string; familyName: string }[] = [
  { orcid: "0009-0003-4172-518X", givenName: "Emi", familyName: "Tanaka" },
  { orcid: "0009-0007-2635-9045", givenName: "Jonas", familyName: "Lindqvist" },
  { orcid: "0009-0001-8850-2368", givenName: "Amara", familyName: "Diallo" },
];

export interface OrcidStandIn {
  url: string;
  close(): Promise<void>;
}

const escapeHtml = (text: string) =>
  text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width">
<title>${escapeHtml(title)} — ORCID stand-in</title>
<style>body{font-family:system-ui,sans-serif;max-width:34rem;margin:2rem auto;padding:0 1rem;line-height:1.5}
.note{background:#fff4d6;border:1px solid #b58900;padding:.5rem .75rem}.error{color:#a4161a;font-weight:600}
label{display:block;margin-top:.75rem;font-weight:600}input{font:inherit;padding:.3rem;width:100%;box-sizing:border-box}
button{font:inherit;margin-top:1rem;margin-right:.5rem;padding:.4rem 1rem}</style></head>
<body><main><p class="note">Local stand-in for ORCID sign-in: nothing here is checked with ORCID.</p>
<h1>${escapeHtml(title)}</h1>${body}</main></body></html>`;
}

function send(res: ServerResponse, status: number, html: string) {
  res.writeHead(status, { "content-type": "text/html; charset=utf-8", "cache-control": "no-store" });
  res.end(html);
}

async function readForm(req: IncomingMessage): Promise<URLSearchParams> {
  let body = "";
  for await (const chunk of req) {
    body += chunk;
    if (body.length > 10_000) throw new Error("form too large");
  }
  return new URLSearchParams(body);
}

function loginForm(uid: string, error?: string, typed = "", name = ""): string {
  const people = STAND_IN_PEOPLE.map((p) => `<li><code>${p.orcid}</code> — ${escapeHtml(`${p.givenName} ${p.familyName}`)}</li>`).join("");
  return page(
    "Sign in with your ORCID iD",
    `${error ? `<p class="error" role="alert">${escapeHtml(error)}</p>` : ""}
<form method="post" action="/interaction/${uid}/login">
<label for="orcid">ORCID iD</label><input id="orcid" name="orcid" value="${escapeHtml(typed)}" autocomplete="off" required>
<label for="name">Name to report (optional)</label><input id="name" name="name" value="${escapeHtml(name)}">
<button type="submit" name="action" value="sign-in">Sign in</button><button type="submit" name="action" value="cancel" formnovalidate>Cancel</button>
</form><p>Demo people:</p><ul>${people}</ul>`,
  );
}

function consentForm(uid: string, clientName: string): string {
  return page(
    "Share your iD?",
    `<p>${escapeHtml(clientName)} asks to read your ORCID iD and name.</p>
<form method="post" action="/interaction/${uid}/consent">
<button type="submit" name="action" value="allow">Allow</button><button type="submit" name="action" value="deny">Deny</button></form>`,
  );
}

/**
 * Starts the stand-in on 127.0.0.1:`port` (0: a free port). `redirectUri` is the one callback
 * address the client may use; `appUrl` is where the expired-session page sends people back.
 */
export async function startOrcidStandIn({
  port,
  clientId,
  clientSecret,
  redirectUri,
  appUrl,
}: {
  port: number;
  clientId: string;
  clientSecret: string;
  redirectUri: string;
  appUrl: string;
}): Promise<OrcidStandIn> {
  const server = createServer();
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => resolve());
  });
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  // Names typed on the sign-in page, by iD, reported in the ID token.
  const typedNames = new Map<string, { givenName: string; familyName: string }>();
  const { privateKey } = generateKeyPairSync("rsa", { modulusLength: 2048 });
  const restart = `<p><a href="${escapeHtml(appUrl)}/sign-in">Back to the sign-in page</a> to start again.</p>`;

  const configuration: Configuration = {
    clients: [
      {
        client_id: clientId,
        client_secret: clientSecret,
        client_name: "Arrhenia",
        redirect_uris: [redirectUri],
        response_types: ["code"],
        grant_types: ["authorization_code"],
      },
    ],
    pkce: { required: () => true },
    features: { devInteractions: { enabled: false } },
    interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
    claims: { openid: ["sub", "name", "given_name", "family_name"] },
    // ORCID puts the names in the ID token itself.
    conformIdTokenClaims: false,
    cookies: { keys: [randomBytes(32).toString("hex")] },
    jwks: {
      keys: [{ ...(privateKey.export({ format: "jwk" }) as object), kid: "stand-in", use: "sig", alg: "RS256" }],
    } as Configuration["jwks"],
    ttl: { Interaction: 600, Session: 3600, Grant: 3600, AuthorizationCode: 60, AccessToken: 600, IdToken: 600 },
    findAccount: (_ctx, sub) => {
      const orcid = normaliseOrcid(sub);
      if (!orcid) return undefined;
      const known = STAND_IN_PEOPLE.find((p) => p.orcid === orcid) ?? typedNames.get(orcid);
      return {
        accountId: orcid,
        claims: () => ({
          sub: orcid,
          ...(known ? { given_name: known.givenName, family_name: known.familyName, name: `${known.givenName} ${known.familyName}` } : {}),
        }),
      };
    },
    renderError: (ctx, out) => {
      ctx.type = "html";
      ctx.body = page(
        "Sign-in could not go on",
        `<p class="error">${escapeHtml(String(out.error_description ?? out.error))}</p>${restart}`,
      );
    },
  };
  const provider = new Provider(url, configuration);
  const callback = provider.callback();

  async function interaction(req: IncomingMessage, res: ServerResponse, uid: string, step: string | undefined) {
    let details;
    try {
      details = await provider.interactionDetails(req, res);
    } catch (err) {
      if (err instanceof errors.SessionNotFound || err instanceof errors.InvalidRequest) {
        return send(
          res,
          400,
          page("Your sign-in here has expired", `<p>This sign-in page was open too long or was already used.</p>${restart}`),
        );
      }
      throw err;
    }
    if (details.uid !== uid) return send(res, 400, page("Your sign-in here has expired", restart));
    if (req.method === "GET") {
      if (details.prompt.name === "login") return send(res, 200, loginForm(uid));
      return send(res, 200, consentForm(uid, "Arrhenia"));
    }
    const form = await readForm(req);
    const declined = form.get("action") === "cancel" || form.get("action") === "deny";
    if (declined) {
      return provider.interactionFinished(
        req,
        res,
        { error: "access_denied", error_description: "The person declined" },
        { mergeWithLastSubmission: false },
      );
    }
    if (step === "login" && details.prompt.name === "login") {
      const typed = String(form.get("orcid") ?? "");
      const name = String(form.get("name") ?? "").trim();
      const orcid = normaliseOrcid(typed);
      if (!orcid)
        return send(
          res,
          422,
          loginForm(uid, "This is not an ORCID iD: 16 digits (the last may be X) with a right check digit.", typed, name),
        );
      if (name) {
        const parts = name.split(/\s+/);
        typedNames.set(orcid, { givenName: parts.slice(0, -1).join(" ") || parts[0], familyName: parts.length > 1 ? parts.at(-1)! : "" });
      }
      return provider.interactionFinished(req, res, { login: { accountId: orcid } }, { mergeWithLastSubmission: false });
    }
    if (step === "consent" && details.prompt.name === "consent") {
      const grant = new provider.Grant({ accountId: details.session!.accountId, clientId: String(details.params.client_id) });
      grant.addOIDCScope("openid");
      const grantId = await grant.save();
      return provider.interactionFinished(req, res, { consent: { grantId } }, { mergeWithLastSubmission: true });
    }
    return send(res, 400, page("Your sign-in here has expired", restart));
  }

  server.on("request", (req, res) => {
    const match = /^\/interaction\/([\w-]+)(?:\/(login|consent))?$/.exec(new URL(req.url ?? "/", url).pathname);
    if (!match) return void callback(req, res);
    interaction(req, res, match[1], match[2]).catch((err: unknown) => {
      console.error("[orcid stand-in]", err);
      if (!res.headersSent) send(res, 500, page("Sign-in could not go on", restart));
    });
  });
  return {
    url,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
