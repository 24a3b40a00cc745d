import { beforeAll, describe, expect, it } from "vitest";
import { acceptInvitation, describeInvitation, inviteCoEditor, listPendingInvitations, revokeInvitation } from "@/lib/datasets/invitations";
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

  it("the accept page names the dataset; accepting lands on its newest version and tells the owner by mail", async () => {
    const v = await draft();
    await inviteCoEditor({ actor: owner, versionId: v.id, email: invitee.email, role: "viewer" });
    const secret = await invitationSecret(invitee.email);
    expect(await describeInvitation({ secret })).toEqual({
      usable: true,
      title: "Invitation test",
      role: "viewer",
      inviter: owner.name,
      email: invitee.email,
    });
    const accepted = await acceptInvitation({ actor: invitee, secret });
    expect(accepted).toMatchObject({ versionId: v.id, title: "Invitation test", role: "viewer" });
    expect(await describeInvitation({ secret })).toMatchObject({ usable: false, why: expect.stringMatching(/already used/) });
    const [mail] = await sql`select data->>'subject' as subject, data->>'text' as text from pgboss.job
      where name = 'mail' and data->>'to' = ${owner.email} and data->>'subject' like '%joined%' order by created_on desc limit 1`;
    expect(mail.subject).toBe(`${invitee.name} joined “Invitation test”`);
    expect(mail.text).toContain(`${invitee.email}) accepted your invitation and is now a viewer`);
    expect(mail.text).toContain(`/deposits/${v.id}`);
  });

  it("owners see pending invitations and revoke them; the link then stops working; others may not", async () => {
    const v = await draft();
    await inviteCoEditor({ actor: owner, versionId: v.id, email: invitee.email, role: "editor" });
    await acceptInvitation({ actor: invitee, secret: await invitationSecret(invitee.email) });
    const address = uniqueEmail("pending");
    await inviteCoEditor({ actor: owner, versionId: v.id, email: address, role: "viewer" });
    const secret = await invitationSecret(address);
    const pending = await listPendingInvitations({ actor: owner, versionId: v.id });
    expect(pending.map((p) => [p.email, p.role, p.expired])).toEqual([[address, "viewer", false]]);
    await expect(listPendingInvitations({ actor: invitee, versionId: v.id })).rejects.toMatchObject({ status: 403 });
    await expect(listPendingInvitations({ actor: other, versionId: v.id })).rejects.toMatchObject({ status: 404 });
    await expect(revokeInvitation({ actor: invitee, invitationId: pending[0].id })).rejects.toMatchObject({ status: 403 });
    await expect(revokeInvitation({ actor: other, invitationId: pending[0].id })).rejects.toMatchObject({ status: 404 });
    await revokeInvitation({ actor: owner, invitationId: pending[0].id });
    expect(await listPendingInvitations({ actor: owner, versionId: v.id })).toEqual([]);
    expect(await describeInvitation({ secret })).toMatchObject({ usable: false, why: expect.stringMatching(/revoked/) });
    const [event] =
      await sql`select details from audit_events where action = 'dataset.invitation_revoked' and subject_id = ${String(v.datasetId)}`;
    expect(event.details).toEqual({ email: address, role: "viewer" });
  });
});
