import { describe, expect, it } from "vitest";
import { transitionRequestSchema } from "@/lib/curation/transition-request";

describe("transitionRequestSchema: a decision's words reach mails and feeds as written", () => {
  it("keeps several lines and refuses control characters, naming the character and where", () => {
    expect(transitionRequestSchema.safeParse({ transition: "retract", reason: "Wrong units.\nSee the erratum." }).success).toBe(true);
    const bell = transitionRequestSchema.safeParse({ transition: "retract", reason: "Wrong\u0007 units" });
    expect(bell.success).toBe(false);
    expect(bell.error?.issues[0]).toMatchObject({
      path: ["reason"],
      message: "contains U+0007 (a control character) at character 6; remove it",
    });
    expect(transitionRequestSchema.safeParse({ transition: "submit", reply: "Fixed\u0085" }).success).toBe(false);
  });
});
