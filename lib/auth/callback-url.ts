// Where to send someone after sign-in: only a path on this site, never another origin.

// C0 and C1 controls, DEL and the Unicode line separators: browsers strip or reinterpret them.
const CONTROL = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;

/** A form browsers could read as another host: `//host`, `/\host`, or anything with a backslash. */
function looksOffSite(s: string): boolean {
  return CONTROL.test(s) || s.includes("\\") || s.startsWith("//");
}

/**
 * Returns `value` as a normalised same-origin path (`/path?query#hash`), or "/" when it is not
 * one. Absolute URLs are accepted only when their origin is `origin`. Every percent-decoding
 * layer is checked, so `/%5Cevil.example` or `/%2F%2Fevil.example` cannot become `//evil.example`
 * after a router or browser decodes them.
 */
export function safeCallbackPath(value: unknown, origin: string): string {
  const raw = Array.isArray(value) ? value[0] : value;
  if (typeof raw !== "string" || raw === "" || raw.length > 2048 || CONTROL.test(raw)) return "/";
  let base: URL;
  try {
    base = new URL(origin);
  } catch {
    return "/";
  }
  let candidate = raw;
  if (!raw.startsWith("/")) {
    let absolute: URL;
    try {
      absolute = new URL(raw);
    } catch {
      return "/";
    }
    if (absolute.origin !== base.origin || raw.includes("\\")) return "/";
    candidate = absolute.pathname + absolute.search + absolute.hash;
  }
  let layer = candidate;
  for (let depth = 0; ; depth++) {
    if (looksOffSite(layer)) return "/";
    let decoded: string;
    try {
      decoded = decodeURIComponent(layer);
    } catch {
      return "/";
    }
    if (decoded === layer) break;
    if (depth === 3) return "/"; // encoded four times over: no honest link does that
    layer = decoded;
  }
  let resolved: URL;
  try {
    resolved = new URL(candidate, base);
  } catch {
    return "/";
  }
  if (resolved.origin !== base.origin) return "/";
  const path = resolved.pathname + resolved.search + resolved.hash;
  return path.startsWith("/") && !looksOffSite(path) ? path : "/";
}
