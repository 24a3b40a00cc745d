import { describe, expect, it } from "vitest";
import { databaseUnavailable } from "@/lib/errors";

describe("database connection failures answer 503 with Retry-After", () => {
  it.each([
    ["a refused connection", Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5432"), { code: "ECONNREFUSED" })],
    ["a closed connection (postgres driver)", Object.assign(new Error("write CONNECTION_CLOSED"), { code: "CONNECTION_CLOSED" })],
    ["a server shutting down (57P01)", Object.assign(new Error("terminating connection due to administrator command"), { code: "57P01" })],
    ["a server starting up (57P03)", Object.assign(new Error("the database system is starting up"), { code: "57P03" })],
    // node-postgres's pool behind the rate limits, all its connections busy for 3 s (a burst of 400 posts, found by an outside attack: was a 500).
    ["the rate limits' pool waiting too long for a connection", new Error("timeout exceeded when trying to connect")],
    ["a wrapped cause", Object.assign(new Error("Failed query"), { cause: Object.assign(new Error("x"), { code: "ECONNRESET" }) })],
  ])("%s", (_what, err) => {
    expect(databaseUnavailable(err)).toMatchObject({ status: 503, code: "unavailable", retryAfterSeconds: 5 });
  });

  it("leaves every other error alone", () => {
    expect(databaseUnavailable(Object.assign(new Error("duplicate key"), { code: "23505" }))).toBeNull();
    expect(databaseUnavailable(new Error("plain"))).toBeNull();
    expect(databaseUnavailable("text")).toBeNull();
  });
});
