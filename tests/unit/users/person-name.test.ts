import { describe, expect, it } from "vitest";
import { personNameField } from "@/lib/users/schemas";

// A person's name is printed in mail and on pages: one line, readable as typed (common practice).
describe("a person's name", () => {
  it("keeps an ordinary name, accents and scripts included", () => {
    for (const name of ["Nadia Ferreira", "Åsa Lindqvist-Øberg", "田中 恵美", "O'Neill, J.", "Amara Diallo 2"]) {
      expect(personNameField.safeParse(name).success, name).toBe(true);
    }
  });
  it("refuses line breaks, direction overrides and names of nothing visible, with a worded message", () => {
    const cases: [string, RegExp][] = [
      ["Mallory\r\nClick here", /one line/],
      ["Eve\u202Egnp.exe", /direction-changing/],
      ["Eve\u2067x", /direction-changing/],
      ["\u200B\u200B\u200B", /at least one letter/],
      ["...", /at least one letter/],
      ["x".repeat(201), /at most 200/],
    ];
    for (const [name, message] of cases) {
      const parsed = personNameField.safeParse(name);
      expect(parsed.success, JSON.stringify(name)).toBe(false);
      expect(parsed.error?.issues[0].message).toMatch(message);
    }
  });
});
