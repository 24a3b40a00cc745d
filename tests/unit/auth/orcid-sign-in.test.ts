import { describe, expect, it } from "vitest";
import { normaliseOrcid, orcidCheckDigit, orcidChecksumValid } from "@/lib/auth/orcid";
import { STAND_IN_PEOPLE } from "@/lib/auth/orcid-stand-in";
import { ORCID_TICKET_SECONDS, readOrcidTicket, signOrcidTicket } from "@/lib/auth/orcid-ticket";
import { freshOrcid } from "../../support/orcid";

// The check character is ISO 7064:2003 MOD 11-2 (ISO/IEC 7064, "Information technology — Security
// techniques — Check character systems"), the system ORCID's documentation names for iDs.
describe("ISO 7064 MOD 11-2 check character", () => {
  it("gives the documented example's check digit", () => {
    // 0000-0002-1825-0097: the example iD of ORCID's documentation (quoted from memory).
    expect(orcidCheckDigit("000000021825009")).toBe("7");
  });
  it("writes 10 as X", () => expect(orcidCheckDigit("000000021694233")).toBe("X"));
  it("is valid for every invented stand-in person", () => {
    for (const p of STAND_IN_PEOPLE) expect(orcidChecksumValid(p.orcid), p.orcid).toBe(true);
  });
  it("freshOrcid makes valid, distinct iDs", () => {
    const ids = Array.from({ length: 50 }, freshOrcid);
    for (const id of ids) expect(normaliseOrcid(id)).toBe(id);
    expect(new Set(ids).size).toBe(ids.length);
  });
});

describe("the first-sign-in ticket", () => {
  const now = new Date("2026-05-01T10:00:00Z");
  it("carries the iD and name until it expires", () => {
    const ticket = signOrcidTicket({ orcid: "0009-0003-4172-518X", name: "Emi Tanaka" }, now);
    expect(readOrcidTicket(ticket, now)).toMatchObject({ orcid: "0009-0003-4172-518X", name: "Emi Tanaka" });
    expect(readOrcidTicket(ticket, new Date(now.getTime() + (ORCID_TICKET_SECONDS + 1) * 1000))).toBeNull();
  });
  it("refuses a ticket pointed at another iD", () => {
    const ticket = signOrcidTicket({ orcid: "0009-0003-4172-518X", name: "Emi Tanaka" }, now);
    const [body, mac] = ticket.split(".");
    const other = Buffer.from(
      JSON.stringify({ ...JSON.parse(Buffer.from(body, "base64url").toString()), orcid: "0009-0007-2635-9045" }),
    ).toString("base64url");
    expect(readOrcidTicket(`${other}.${mac}`, now)).toBeNull();
    expect(readOrcidTicket("garbage", now)).toBeNull();
    expect(readOrcidTicket(`${body}.${mac}.x`, now)).toBeNull();
  });
});
