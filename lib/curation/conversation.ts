/**
 * The exchange between curators and authors on one version, oldest first: each return with its
 * reason, each resubmission with the authors' reply. Pure; times are ISO 8601 strings.
 */
export interface ConversationEntry {
  kind: "return" | "reply";
  /** The curator who returned it, or the person who submitted the reply. */
  who: string;
  text: string;
  at: string;
}

export function returnConversation(
  decisions: readonly { decision: string; reason: string; curator: string; createdAt: string }[],
  replies: readonly { reply: string | null; submittedBy: string | null; createdAt: string }[],
): ConversationEntry[] {
  const entries: ConversationEntry[] = [
    ...decisions
      .filter((d) => d.decision === "return")
      .map((d) => ({ kind: "return" as const, who: d.curator, text: d.reason, at: d.createdAt })),
    ...replies
      .filter((r) => r.reply)
      .map((r) => ({ kind: "reply" as const, who: r.submittedBy ?? "the owner", text: r.reply!, at: r.createdAt })),
  ];
  // A reply always answers an earlier return, so at the same instant the return comes first.
  return entries.sort((a, b) => Date.parse(a.at) - Date.parse(b.at) || (a.kind === b.kind ? 0 : a.kind === "return" ? -1 : 1));
}
