import { timingSafeEqual } from "node:crypto";
import { isIP } from "node:net";
import { edgeKey } from "@/lib/config";

// The front server (lib/auth/edge-proxy.ts, started by scripts/serve.ts) removes any client-sent
// copy of these headers and sets them from the socket (or a trusted proxy's X-Forwarded-For).
export const CLIENT_ADDRESS_HEADER = "x-arrhenia-client-address";
export const EDGE_KEY_HEADER = "x-arrhenia-edge-key";

/** Every address the front server cannot vouch for shares this one key, so limits still bind. */
export const UNKNOWN_ADDRESS = "unknown";

type HeaderSource = Request | Headers | Record<string, string | string[] | undefined> | null | undefined;

function headerValue(source: HeaderSource, name: string): string | undefined {
  if (!source) return undefined;
  if (source instanceof Request) return source.headers.get(name) ?? undefined;
  if (source instanceof Headers) return source.get(name) ?? undefined;
  const raw = source[name];
  return Array.isArray(raw) ? raw[0] : raw;
}

/**
 * Set on globalThis by the inner server (scripts/inner-server.ts), where every request reaching
 * Next has passed the key check of lib/auth/inner-gate.ts, which then removed the key header.
 */
export const INNER_GATE_MARK = Symbol.for("arrhenia.inner-gate");

function behindInnerGate(): boolean {
  return (globalThis as Record<symbol, unknown>)[INNER_GATE_MARK] === true;
}

function sameSecret(given: string, expected: string): boolean {
  const a = Buffer.from(given);
  const b = Buffer.from(expected);
  return a.length === b.length && timingSafeEqual(a, b);
}

/**
 * The address every per-address limit counts by. Only the front server's header is believed (it
 * applies TRUST_PROXY): behind the inner gate every request is the front server's; elsewhere (a
 * handler called directly) only one carrying the key. X-Forwarded-For from a client never is.
 */
export function clientAddress(source: HeaderSource): string {
  if (!behindInnerGate()) {
    const key = edgeKey();
    const given = headerValue(source, EDGE_KEY_HEADER);
    if (!key || !given || !sameSecret(given, key)) return UNKNOWN_ADDRESS;
  }
  const address = headerValue(source, CLIENT_ADDRESS_HEADER)?.trim();
  return address && isIP(address) ? address : UNKNOWN_ADDRESS;
}
