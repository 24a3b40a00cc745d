/**
 * Responses built from bytes already in memory, and a reader that takes those bytes back without
 * running them through the body's stream. A public read's answer passes through several layers
 * (the handler, its validators in ./conditional.ts, the front server's writer in ./front-routes.ts);
 * each used to read the body's web stream and build a new one, which cost more of the thread than
 * a kept search answer itself. The bytes of such a response are never changed after it is built.
 */
const known = new WeakMap<Response, Uint8Array>();

/** A response whose body is `bytes` (not copied: they must not change afterwards). */
export function bytesResponse(bytes: Uint8Array, init?: ResponseInit): Response {
  const res = new Response(bytes as Uint8Array<ArrayBuffer>, init);
  known.set(res, bytes);
  return res;
}

/** The bytes `res` was built from by bytesResponse (its headers may still be changed), else undefined. */
export function builtFromBytes(res: Response): Uint8Array | undefined {
  return known.get(res);
}

/** The body's bytes: the ones a response was built from, else read from its stream (which uses it up). */
export async function bodyBytes(res: Response): Promise<Uint8Array> {
  return known.get(res) ?? new Uint8Array(await res.arrayBuffer());
}
