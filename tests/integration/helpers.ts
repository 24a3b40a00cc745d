import { randomBytes } from "node:crypto";
import postgres from "postgres";
import { CLIENT_ADDRESS_HEADER, EDGE_KEY_HEADER } from "@/lib/auth/client-address";
import { captureSmtpPort, databaseUrl } from "@/lib/config";
import { getSender } from "@/lib/jobs/boss";
import { startWorkers } from "@/lib/jobs/worker";
import { startCaptureServer } from "@/lib/mail/capture-server";
import type { Transition } from "@/lib/curation/lifecycle";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { reactionPath } from "@/lib/reactions/paths";
import { labelledAlkaneDeposit } from "../fixtures/labelled-alkane-deposit";
import { createUser, type UserDto } from "@/lib/users/queries";

export const sql = postgres(databaseUrl(), { max: 3, onnotice: () => {} });

export function uniqueEmail(tag: string): string {
  return `${tag}-${randomBytes(5).toString("hex")}@test.arrhenia.invalid`;
}

/** Headers as the front server (lib/auth/edge-proxy.ts) sets them for a client at `ip`. */
export function fromAddress(ip: string): Record<string, string> {
  return { [CLIENT_ADDRESS_HEADER]: ip, [EDGE_KEY_HEADER]: process.env.ARRHENIA_EDGE_KEY ?? "" };
}

export function uniqueIp(): string {
  const b = randomBytes(3);
  return `10.${b[0]}.${b[1]}.${b[2]}`;
}

/**
 * The local SMTP capture plus the mail worker, as `npm start` runs them. Mails that earlier test
 * files queued with no worker running (every submission mails every curator) are dropped first:
 * a file waits only for its own mails, never behind a backlog of hundreds.
 */
export async function startMailPipeline() {
  await (await getSender()).purgeQueue("mail");
  const capture = await startCaptureServer({ sql, port: captureSmtpPort() });
  const workers = await startWorkers();
  return {
    stop: async () => {
      await workers.stop();
      await capture.close();
    },
  };
}

/** Polls the captured mail until a message to `to` arrives. */
export async function waitForMail(to: string, { timeoutMs = 20_000, subject }: { timeoutMs?: number; subject?: RegExp } = {}) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const rows = await sql<{ id: number; subject: string; text: string; html: string | null }[]>`
      select id, subject, text, html from captured_mail where ${to} = any(to_addresses) order by id desc`;
    const hit = rows.find((r) => !subject || subject.test(r.subject));
    if (hit) return hit;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
}

export function linkToken(text: string, path: string): string {
  const m = new RegExp(`${path}\\?token=([A-Za-z0-9_%-]+)`).exec(text);
  if (!m) throw new Error(`no ${path} link in:\n${text}`);
  return decodeURIComponent(m[1]);
}

export function asDto(u: Partial<UserDto> & { id: number; role: UserDto["role"] }): UserDto {
  return {
    email: "x@y.invalid",
    name: "Test",
    affiliation: null,
    orcid: null,
    verifiedOrcid: null,
    passwordSet: true,
    profileListed: true,
    emailVerifiedAt: new Date(),
    deactivatedAt: null,
    createdAt: new Date(),
    ...u,
  };
}

/** The people a per-role test acts as: the owner of the deposits, another researcher, a curator and an admin. */
export interface RolePeople {
  owner: UserDto;
  other: UserDto;
  curator: UserDto;
  admin: UserDto;
}

/** Four new people for a per-role test, their e-mails tagged `<tag>-owner`, `<tag>-other`, … */
export async function createRolePeople(tag: string): Promise<RolePeople> {
  const mk = (who: string, role: UserDto["role"]) =>
    createUser({ email: uniqueEmail(`${tag}-${who}`), name: `${tag}-${who}`, passwordHash: "x", role, verified: true });
  const [owner, other, curator, admin] = await Promise.all([
    mk("owner", "researcher"),
    mk("other", "researcher"),
    mk("curator", "curator"),
    mk("admin", "admin"),
  ]);
  return { owner, other, curator, admin };
}

/** The transitions that bring a new deposit to each state: the owner submits, a curator does the rest. */
export const WALKS_TO_STATE = {
  draft: [],
  submitted: ["submit"],
  in_review: ["submit", "start_review"],
  returned: ["submit", "start_review", "return"],
  declined: ["submit", "decline"],
  published: ["submit", "accept"],
  retracted: ["submit", "accept", "retract"],
} satisfies Record<string, Transition[]>;

export type WalkState = keyof typeof WALKS_TO_STATE;

/** Deposits `document` as `owner` and walks the new version to `state` (a curator decides, with a reason). */
export async function depositInState({
  owner,
  curator,
  document,
  state,
}: {
  owner: UserDto;
  curator: UserDto;
  document: unknown;
  state: WalkState;
}) {
  const v = await depositNewDataset({ actor: owner, document });
  for (const t of WALKS_TO_STATE[state] as Transition[]) {
    const byOwner = t === "submit";
    const reason = t === "retract" ? "Retracted for the test: a calibration error." : byOwner ? undefined : "For the test.";
    await applyTransition({ versionId: v.id, actorId: byOwner ? owner.id : curator.id, transition: t, reason });
  }
  return v;
}

/** A published dataset of a reaction of its own (an invented labelled alkane) and its pages. */
export async function publishedAlkanePages(tag: string, people: RolePeople) {
  const document = labelledAlkaneDeposit({ title: `Kept pages ${tag}`, name: `kept-${tag}-alkane` });
  const v = await depositInState({ ...people, document, state: "published" });
  const [row] = await sql<{ dataset_id: number; reaction_id: number; key: string; alkane: string }[]>`
    select v.dataset_id, v.reaction_id, r.key,
      (select s.inchi_key from reaction_participants p join species s on s.id = p.species_id
        where p.reaction_id = r.id and p.side = 'reactant' and s.formula <> 'HO' order by s.id limit 1) as alkane
    from dataset_versions v join reactions r on r.id = v.reaction_id where v.id = ${v.id}`;
  return {
    document,
    versionId: v.id,
    reactionId: row.reaction_id,
    dataset: `/datasets/${row.dataset_id}/v1`,
    reaction: reactionPath(row.key),
    species: `/species/${row.alkane}`,
  };
}
