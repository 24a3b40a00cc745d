import { describe, expect, it } from "vitest";
import { returnConversation } from "@/lib/curation/conversation";

describe("returnConversation", () => {
  it("puts returns and replies in time order and leaves out other decisions and empty replies", () => {
    const entries = returnConversation(
      [
        { decision: "accept", reason: "Fine now.", curator: "B", createdAt: "2024-05-04T00:00:00.000Z" },
        { decision: "return", reason: "Second.", curator: "B", createdAt: "2024-05-03T00:00:00.000Z" },
        { decision: "return", reason: "First.", curator: "A", createdAt: "2024-05-01T00:00:00.000Z" },
      ],
      [
        { reply: null, submittedBy: "Owner", createdAt: "2024-04-30T00:00:00.000Z" },
        { reply: "Answer.", submittedBy: null, createdAt: "2024-05-02T00:00:00.000Z" },
      ],
    );
    expect(entries.map((e) => [e.kind, e.who, e.text])).toEqual([
      ["return", "A", "First."],
      ["reply", "the owner", "Answer."],
      ["return", "B", "Second."],
    ]);
  });

  it("puts a return before a reply stored at the same instant", () => {
    const at = "2024-05-01T00:00:00.000Z";
    const entries = returnConversation(
      [{ decision: "return", reason: "R", curator: "A", createdAt: at }],
      [{ reply: "Y", submittedBy: "O", createdAt: at }],
    );
    expect(entries.map((e) => e.kind)).toEqual(["return", "reply"]);
  });
});
