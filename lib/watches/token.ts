import "server-only";
import { createHmac, timingSafeEqual } from "node:crypto";
import { searchCursorSecret } from "@/lib/config";

/**
 * The stop-watching link of a notification mail: "<watch id>.<user id>.<MAC>", HMAC-SHA-256 under
 * the server key with its own label, so it can do one thing only — end that one watch of that one
 * person — and cannot be forged or turned to another watch. Nothing is stored; ending a watch that
 * is already gone is harmless, so the link may be used twice.
 */
const mac = (watchId: number, userId: number) =>
  createHmac("sha256", searchCursorSecret()).update(`watch-stop\n${watchId}.${userId}`).digest();

export function signStopToken(watchId: number, userId: number): string {
  return `${watchId}.${userId}.${mac(watchId, userId).toString("base64url")}`;
}

/** The watch and person a stop link names, or null when it was altered or made with another key. */
export function readStopToken(token: string): { watchId: number; userId: number } | null {
  // Ids as signStopToken writes them (no leading zeros): one link, one spelling.
  const m = /^([1-9]\d{0,9})\.([1-9]\d{0,9})\.([A-Za-z0-9_-]{43})$/.exec(token);
  if (!m) return null;
  const watchId = Number(m[1]);
  const userId = Number(m[2]);
  const given = Buffer.from(m[3], "base64url");
  const expected = mac(watchId, userId);
  return given.length === expected.length && timingSafeEqual(given, expected) ? { watchId, userId } : null;
}
