import { beforeAll, describe, expect, it } from "vitest";
import { acceptInvitation, inviteCoEditor } from "@/lib/datasets/invitations";
import { createDatasetDraft, getVersionWithRole, type AnalysisSummary } from "@/lib/datasets/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { linkToken, sql, uniqueEmail } from "./helpers";

const analysis: AnalysisSummary = { engineVersion: "test", result: null, checks: [] };
let owner: UserDto, invitee: UserDto, other: UserDto;

beforeAll(async () => {
  const mk = (tag: string) => createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", verified: true });
  [owner, invitee, other] = await Promise.all([mk("owner"), mk("invitee"), mk("other")]);
});

async function draft() {
  return createDatasetDraft({ ownerId: owner.id, title: "Invitation test", payload: {}, points: [], analysis });
}

async function invitationSecret(email: string) {
  const [job] =
    await sql`select data->>'text' as text from pgboss.job where name = 'mail' and data->>'to' = ${email} order by created_on desc limit 1`;
  return linkToken(job.text, "/invitations/accept");
}

describe("co-editor invitations", () => {
  it("the owner invites by e-mail; the invitee accepts once and becomes an editor", async () => {
    const v = await draft();
    await inviteCoEditor({ actor: owner, versionId: v.id, email: invitee.email.toUpperCase(), role: "editor" });
    const secret = await invitationSecret(invitee.email);
    const [row] =
      await sql`select token_hash, round(extract(epoch from expires_at - created_at) / 3600) as ttl_hours from dataset_invitations where dataset_id = ${v.datasetId}`;
    expect(row.token_hash).not.toContain(secret);
    expect(Number(row.ttl_hours)).toBe(168);
    await expect(acceptInvitation({ actor: other, secret })).rejects.toMatchObject({ status: 403 });
    const accepted = await acceptInvitation({ actor: invitee, secret });
    expect(accepted).toMatchObject({ datasetId: v.datasetId, role: "editor", versionId: v.id });
    expect((await getVersionWithRole({ versionId: v.id, userId: invitee.id }))?.datasetRole).toBe("editor");
    await expect(acceptInvitation({ actor: invitee, secret })).rejects.toThrow(/already used/);
  });

  it("only the owner invites", async () => {
    const v = await draft();
    await inviteCoEditor({ actor: owner, versionId: v.id, email: invitee.email, role: "editor" });
    await acceptInvitation({ actor: invitee, secret: await invitationSecret(invitee.email) });
    await expect(inviteCoEditor({ actor: invitee, versionId: v.id, email: other.email, role: "viewer" })).rejects.toMatchObject({
      status: 403,
    });
    await expect(inviteCoEditor({ actor: other, versionId: v.id, email: other.email, role: "viewer" })).rejects.toMatchObject({
      status: 404,
    });
  });

  it("an expired link does not work", async () => {
    const v = await draft();
    await inviteCoEditor({ actor: owner, versionId: v.id, email: other.email, role: "viewer" });
    const secret = await invitationSecret(other.email);
    await sql`update dataset_invitations set expires_at = now() - interval '1 minute' where dataset_id = ${v.datasetId}`;
    await expect(acceptInvitation({ actor: other, secret })).rejects.toThrow(/expired/);
  });
});
