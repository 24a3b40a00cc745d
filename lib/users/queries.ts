import "server-only";
import type { ApiTokenScope } from "./schemas";
import { and, asc, count, desc, eq, gt, isNull, sql } from "drizzle-orm";
import { getDb, type Database, type Transaction } from "@/db/client";
import { datasetVersions } from "@/db/datasets";
import { creatorPeople } from "@/db/people";
import { apiTokens, oneTimePurposeEnum, oneTimeTokens, orcidSignUps } from "@/db/tokens";
import { users, type Role } from "@/db/users";
import { recordAuditEvent } from "@/lib/audit/record";
import { generateSecret, hashSecret, secretsEqual } from "@/lib/auth/secrets";
import { AppError } from "@/lib/errors";

/** What pages and APIs may see of a person: never the password hash. */
export interface UserDto {
  id: number;
  email: string;
  name: string;
  affiliation: string | null;
  orcid: string | null;
  /** The iD proven at the ORCID provider (shown as verified); `orcid` is the typed-in one. */
  verifiedOrcid: string | null;
  passwordSet: boolean;
  profileListed: boolean;
  role: Role;
  emailVerifiedAt: Date | null;
  deactivatedAt: Date | null;
  createdAt: Date;
}

const userColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  affiliation: users.affiliation,
  orcid: users.orcid,
  verifiedOrcid: users.verifiedOrcid,
  passwordSet: users.passwordSet,
  profileListed: users.profileListed,
  role: users.role,
  emailVerifiedAt: users.emailVerifiedAt,
  deactivatedAt: users.deactivatedAt,
  createdAt: users.createdAt,
};

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

export async function getUserById({ id }: { id: number }): Promise<UserDto | null> {
  const [row] = await getDb().select(userColumns).from(users).where(eq(users.id, id));
  return row ?? null;
}

/** The person plus the session generation a signed-in session must carry to still count. */
export async function getUserForSession({ id }: { id: number }): Promise<(UserDto & { sessionGeneration: number }) | null> {
  const [row] = await getDb()
    .select({ ...userColumns, sessionGeneration: users.sessionGeneration })
    .from(users)
    .where(eq(users.id, id));
  return row ?? null;
}

/** Ends every session of the person: sessions stamped with an older generation are refused. */
export async function endAllSessions({ userId, tx = getDb() }: { userId: number; tx?: Database | Transaction }) {
  await tx
    .update(users)
    .set({ sessionGeneration: sql`${users.sessionGeneration} + 1` })
    .where(eq(users.id, userId));
}

export async function getUserByEmail({ email }: { email: string }): Promise<UserDto | null> {
  const [row] = await getDb()
    .select(userColumns)
    .from(users)
    .where(eq(sql`lower(${users.email})`, normaliseEmail(email)));
  return row ?? null;
}

/** For the sign-in check and password change only; the hash never leaves lib/auth and lib/users. */
export async function getPasswordHash({ email, id }: { email?: string; id?: number }) {
  const where = id !== undefined ? eq(users.id, id) : eq(sql`lower(${users.email})`, normaliseEmail(email ?? ""));
  const [row] = await getDb()
    .select({ ...userColumns, passwordHash: users.passwordHash, sessionGeneration: users.sessionGeneration })
    .from(users)
    .where(where);
  return row ?? null;
}

export async function createUser(input: {
  email: string;
  name: string;
  passwordHash: string;
  role?: Role;
  affiliation?: string | null;
  orcid?: string | null;
  verified?: boolean;
}): Promise<UserDto> {
  const db = getDb();
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(users)
      .values({
        email: normaliseEmail(input.email),
        name: input.name.trim(),
        passwordHash: input.passwordHash,
        role: input.role ?? "researcher",
        affiliation: input.affiliation ?? null,
        orcid: input.orcid ?? null,
        emailVerifiedAt: input.verified ? new Date() : null,
      })
      .onConflictDoNothing()
      .returning(userColumns);
    if (!row) throw new AppError("conflict", "An account with this e-mail already exists");
    await recordAuditEvent(tx, { actorId: row.id, action: "user.sign_up", subjectType: "user", subjectId: row.id });
    return row;
  });
}

/** What the admin list (and GET /api/v1/users) shows of each person: whether a password is set stays private too. */
const listedUserColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  affiliation: users.affiliation,
  orcid: users.orcid,
  verifiedOrcid: users.verifiedOrcid,
  profileListed: users.profileListed,
  role: users.role,
  emailVerifiedAt: users.emailVerifiedAt,
  deactivatedAt: users.deactivatedAt,
  createdAt: users.createdAt,
};

export async function listUsers({ limit = 200, offset = 0 }: { limit?: number; offset?: number } = {}) {
  return getDb().select(listedUserColumns).from(users).orderBy(asc(users.name)).limit(limit).offset(offset);
}

/** Curators who should hear of new submissions. */
export async function listActiveCurators() {
  return getDb()
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(and(eq(users.role, "curator"), isNull(users.deactivatedAt)));
}

export async function countUsers(): Promise<number> {
  const [row] = await getDb().select({ n: count() }).from(users).where(isNull(users.deactivatedAt));
  return row?.n ?? 0;
}

export async function countUsersByRole(): Promise<Record<Role, number>> {
  const rows = await getDb().select({ role: users.role, n: count() }).from(users).where(isNull(users.deactivatedAt)).groupBy(users.role);
  const out: Record<Role, number> = { researcher: 0, curator: 0, admin: 0 };
  for (const r of rows) out[r.role] = r.n;
  return out;
}

const roleRank: Record<Role, number> = { researcher: 0, curator: 1, admin: 2 };

export async function changeUserRole({ actorId, userId, role }: { actorId: number; userId: number; role: Role }) {
  return getDb().transaction(async (tx) => {
    const [before] = await tx.select({ role: users.role }).from(users).where(eq(users.id, userId)).for("update");
    if (!before) throw new AppError("not_found", "No such person");
    if (before.role === role) return;
    if (actorId === userId && role !== "admin") {
      throw new AppError("conflict", "You cannot remove your own admin role; ask another admin");
    }
    await tx.update(users).set({ role }).where(eq(users.id, userId));
    // Losing a role ends the person's sessions, so no open page keeps acting with the old one.
    if (roleRank[role] < roleRank[before.role]) await endAllSessions({ userId, tx });
    await recordAuditEvent(tx, {
      actorId,
      action: "user.role_changed",
      subjectType: "user",
      subjectId: userId,
      details: { from: before.role, to: role },
    });
  });
}

/** Deactivates or reactivates an account; returns the datasets naming it (their pages show its creator link only while it is active). */
export async function setUserActive({ actorId, userId, active }: { actorId: number; userId: number; active: boolean }): Promise<number[]> {
  if (actorId === userId) throw new AppError("conflict", "You cannot deactivate your own account");
  return getDb().transaction(async (tx) => {
    const [row] = await tx
      .update(users)
      .set({ deactivatedAt: active ? null : new Date() })
      .where(eq(users.id, userId))
      .returning({ id: users.id });
    if (!row) throw new AppError("not_found", "No such person");
    await recordAuditEvent(tx, {
      actorId,
      action: active ? "user.reactivated" : "user.deactivated",
      subjectType: "user",
      subjectId: userId,
    });
    if (!active) {
      // A deactivated account keeps no working API tokens and no open session.
      await endAllSessions({ userId, tx });
      await tx
        .update(apiTokens)
        .set({ revokedAt: new Date() })
        .where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)));
    }
    return linkedDatasetIds(tx, userId);
  });
}

export async function updateProfile({
  userId,
  name,
  orcid,
  affiliation,
}: {
  userId: number;
  name: string;
  orcid: string | null;
  affiliation: string | null;
}) {
  await getDb().transaction(async (tx) => {
    await tx.update(users).set({ name, orcid, affiliation }).where(eq(users.id, userId));
    await recordAuditEvent(tx, {
      actorId: userId,
      action: "user.profile_updated",
      subjectType: "user",
      subjectId: userId,
      details: { orcid },
    });
  });
}

export async function setPasswordHash({ userId, passwordHash, actorId }: { userId: number; passwordHash: string; actorId: number | null }) {
  await getDb().transaction((tx) => writePassword(tx, { userId, passwordHash, actorId }));
}

async function writePassword(
  tx: Transaction,
  { userId, passwordHash, actorId }: { userId: number; passwordHash: string; actorId: number | null },
) {
  await tx.update(users).set({ passwordHash, passwordSet: true }).where(eq(users.id, userId));
  // A new password ends every session, and no reset or sign-in link issued before it still works.
  await endAllSessions({ userId, tx });
  await voidOneTimeTokens({ userId, purpose: "reset_password", tx });
  await voidOneTimeTokens({ userId, purpose: "unlock_sign_in", tx });
  await recordAuditEvent(tx, { actorId, action: "user.password_changed", subjectType: "user", subjectId: userId });
}

export async function markEmailVerified({ userId }: { userId: number }) {
  await getDb().transaction((tx) => writeEmailVerified(tx, userId));
}

async function writeEmailVerified(tx: Transaction, userId: number) {
  await tx
    .update(users)
    .set({ emailVerifiedAt: new Date() })
    .where(and(eq(users.id, userId), isNull(users.emailVerifiedAt)));
  await recordAuditEvent(tx, { actorId: userId, action: "user.email_verified", subjectType: "user", subjectId: userId });
}

// ---- one-time tokens (e-mail verification, password reset) ----

export type OneTimePurpose = "verify_email" | "reset_password" | "unlock_sign_in";

const ttlMs: Record<OneTimePurpose, number> = {
  verify_email: 48 * 3600_000,
  reset_password: 3600_000,
  unlock_sign_in: 30 * 60_000,
};

/** Purposes where only the newest link counts: issuing one voids the ones sent before. */
const newestOnly: ReadonlySet<OneTimePurpose> = new Set(["reset_password", "unlock_sign_in"]);

/** Marks every unused link of this purpose as spent. */
export async function voidOneTimeTokens({
  userId,
  purpose,
  tx = getDb(),
}: {
  userId: number;
  purpose: OneTimePurpose;
  tx?: Database | Transaction;
}) {
  await tx
    .update(oneTimeTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(oneTimeTokens.userId, userId), eq(oneTimeTokens.purpose, purpose), isNull(oneTimeTokens.usedAt)));
}

/**
 * Creates a single-use link secret; only its hash is stored. With `sentTo`, the link is made only
 * while the account still has that address (checked under the account's row lock, which every
 * change of address takes): a link is never mailed to an address the account no longer has.
 * Returns null when the address changed.
 */
export async function createOneTimeToken(input: { userId: number; purpose: OneTimePurpose }): Promise<string>;
export async function createOneTimeToken(input: { userId: number; purpose: OneTimePurpose; sentTo: string }): Promise<string | null>;
export async function createOneTimeToken({
  userId,
  purpose,
  sentTo,
}: {
  userId: number;
  purpose: OneTimePurpose;
  sentTo?: string;
}): Promise<string | null> {
  return getDb().transaction(async (tx) => {
    if (sentTo !== undefined) {
      const [row] = await tx.select({ email: users.email }).from(users).where(eq(users.id, userId)).for("update");
      if (!row || normaliseEmail(row.email) !== normaliseEmail(sentTo)) return null;
    }
    return insertOneTimeToken(tx, { userId, purpose });
  });
}

async function insertOneTimeToken(tx: Transaction, { userId, purpose }: { userId: number; purpose: OneTimePurpose }): Promise<string> {
  const secret = generateSecret("", 32);
  if (newestOnly.has(purpose)) await voidOneTimeTokens({ userId, purpose, tx });
  await tx
    .insert(oneTimeTokens)
    .values({ userId, purpose, tokenHash: hashSecret(secret), expiresAt: new Date(Date.now() + ttlMs[purpose]) });
  return secret;
}

/** The row of a live link: this secret, this purpose, unused and unexpired. */
const liveToken = (secret: string, purpose: OneTimePurpose) =>
  and(
    eq(oneTimeTokens.tokenHash, hashSecret(secret)),
    eq(oneTimeTokens.purpose, purpose),
    isNull(oneTimeTokens.usedAt),
    gt(oneTimeTokens.expiresAt, new Date()),
  );

/** Marks the token used and returns its user, or throws when it is unknown, used or expired. */
export async function consumeOneTimeTokenOrThrow({ secret, purpose }: { secret: string; purpose: OneTimePurpose }): Promise<number> {
  const [row] = await getDb()
    .update(oneTimeTokens)
    .set({ usedAt: new Date() })
    .where(liveToken(secret, purpose))
    .returning({ userId: oneTimeTokens.userId });
  if (!row) {
    throw new AppError("not_found", "This link is invalid, has expired, or was already used. Ask for a new one.");
  }
  return row.userId;
}

/** The account a live (unused, unexpired) link belongs to, without using the link up. */
export async function accountOfOneTimeToken({ secret, purpose }: { secret: string; purpose: OneTimePurpose }): Promise<number | null> {
  const [row] = await getDb().select({ userId: oneTimeTokens.userId }).from(oneTimeTokens).where(liveToken(secret, purpose));
  return row?.userId ?? null;
}

export const LINK_NOT_LIVE = "This link is invalid, has expired, or was already used. Ask for a new one.";

/**
 * Uses a live link inside one transaction that holds its account's row lock (taken before the
 * link's, as every change of address takes it): nothing about the account can change between the
 * checks `body` makes and what it writes. `body` says whether the link is used up.
 */
async function withLiveToken<T>(
  { secret, purpose }: { secret: string; purpose: OneTimePurpose },
  body: (tx: Transaction, user: UserDto) => Promise<{ use: boolean; value: T }>,
): Promise<T> {
  const owner = await accountOfOneTimeToken({ secret, purpose });
  if (owner === null) throw new AppError("not_found", LINK_NOT_LIVE);
  return getDb().transaction(async (tx) => {
    const [user] = await tx.select(userColumns).from(users).where(eq(users.id, owner)).for("update");
    const [token] = await tx
      .select({ id: oneTimeTokens.id })
      .from(oneTimeTokens)
      .where(and(liveToken(secret, purpose), eq(oneTimeTokens.userId, owner)))
      .for("update");
    if (!user || !token) throw new AppError("not_found", LINK_NOT_LIVE);
    const { use, value } = await body(tx, user);
    if (use) await tx.update(oneTimeTokens).set({ usedAt: new Date() }).where(eq(oneTimeTokens.id, token.id));
    return value;
  });
}

/** For the confirmation page: the iD of the pending ORCID sign-up a live link belongs to, or null. */
export async function pendingOrcidOfLink({ secret }: { secret: string }): Promise<string | null> {
  const owner = await accountOfOneTimeToken({ secret, purpose: "verify_email" });
  const user = owner === null ? null : await getUserById({ id: owner });
  return user && isPendingOrcidSignUp(user) ? user.verifiedOrcid : null;
}

/** `orcidOnly`: the account has no password yet, so its holder signs in with ORCID. */
export type AddressConfirmation =
  | { kind: "verified"; orcidOnly: boolean; /** The datasets naming the account: their pages now show its iD. */ datasetIds: number[] }
  | { kind: "other_browser"; orcid: string };

/**
 * The confirmation link: confirms the account's address. A pending ORCID sign-up's address is
 * confirmed only in the browser of its newest confirmation (`browserKeyHash` gives the hash of this
 * browser's key); anywhere else nothing changes and the answer names the iD.
 */
export async function confirmAddressWithToken({
  secret,
  browserKeyHash,
}: {
  secret: string;
  browserKeyHash: () => Promise<string | null>;
}): Promise<AddressConfirmation> {
  return withLiveToken<AddressConfirmation>({ secret, purpose: "verify_email" }, async (tx, user) => {
    if (isPendingOrcidSignUp(user) && user.verifiedOrcid) {
      const [newest] = await tx
        .select({ browserKeyHash: orcidSignUps.browserKeyHash })
        .from(orcidSignUps)
        .where(eq(orcidSignUps.userId, user.id))
        .orderBy(desc(orcidSignUps.id))
        .limit(1);
      const here = await browserKeyHash();
      if (!newest || !here || !secretsEqual(newest.browserKeyHash, here)) {
        return { use: false, value: { kind: "other_browser", orcid: user.verifiedOrcid } };
      }
    }
    await writeEmailVerified(tx, user.id);
    return { use: true, value: { kind: "verified", orcidOnly: !user.passwordSet, datasetIds: await linkedDatasetIds(tx, user.id) } };
  });
}

/**
 * The reset link: a new password, which also proves the address. A pending ORCID sign-up loses its
 * iD (whoever typed the address at the sign-up need not own it). Returns the account and whether
 * the iD was taken off.
 */
export async function resetPasswordWithToken({ secret, passwordHash }: { secret: string; passwordHash: string }) {
  return withLiveToken({ secret, purpose: "reset_password" }, async (tx, user) => {
    const pendingOrcid = isPendingOrcidSignUp(user) && user.verifiedOrcid ? user.verifiedOrcid : null;
    const datasetIds = pendingOrcid ? await linkedDatasetIds(tx, user.id) : [];
    await writePassword(tx, { userId: user.id, passwordHash, actorId: user.id });
    if (pendingOrcid) await takeOrcidOff(tx, { userId: user.id, orcid: pendingOrcid, actorId: user.id, action: "user.orcid_unlinked" });
    await writeEmailVerified(tx, user.id);
    return { use: true, value: { userId: user.id, datasetIds } };
  });
}

/**
 * "This was not me" on a pending ORCID sign-up's confirmation link: the sign-up is cancelled — the
 * iD leaves it, its address is freed (the account keeps a placeholder address and is deactivated)
 * and no link sent for it works any more. Returns the iD.
 */
export async function refuseOrcidSignUpWithToken({ secret }: { secret: string }): Promise<{ orcid: string; datasetIds: number[] }> {
  return withLiveToken({ secret, purpose: "verify_email" }, async (tx, user) => {
    if (!isPendingOrcidSignUp(user) || !user.verifiedOrcid) throw new AppError("not_found", LINK_NOT_LIVE);
    // Read before the iD leaves: then the creator entries no longer name the account.
    const datasetIds = await linkedDatasetIds(tx, user.id);
    await takeOrcidOff(tx, { userId: user.id, orcid: user.verifiedOrcid, actorId: null, action: "user.orcid_sign_up_refused" });
    // The sign-up is cancelled and the address freed: its owner may make an account with it later.
    await tx
      .update(users)
      .set({ email: `cancelled-sign-up-${user.id}@accounts.arrhenia.invalid`, deactivatedAt: new Date() })
      .where(eq(users.id, user.id));
    for (const purpose of oneTimePurposeEnum.enumValues) await voidOneTimeTokens({ userId: user.id, purpose, tx });
    return { use: true, value: { orcid: user.verifiedOrcid, datasetIds } };
  });
}

// ---- personal API tokens ----

export { apiTokenScopes, type ApiTokenScope } from "./schemas";

export interface ApiTokenDto {
  id: number;
  name: string;
  prefix: string;
  scopes: string[];
  lastUsedAt: Date | null;
  revokedAt: Date | null;
  createdAt: Date;
}

const tokenColumns = {
  id: apiTokens.id,
  name: apiTokens.name,
  prefix: apiTokens.prefix,
  scopes: apiTokens.scopes,
  lastUsedAt: apiTokens.lastUsedAt,
  revokedAt: apiTokens.revokedAt,
  createdAt: apiTokens.createdAt,
};

/** Creates a token and returns its secret: the only time the secret is ever available. */
export async function createApiToken({ userId, name, scopes }: { userId: number; name: string; scopes: ApiTokenScope[] }) {
  const secret = generateSecret("arh_key_", 32);
  const token = await getDb().transaction(async (tx) => {
    const [row] = await tx
      .insert(apiTokens)
      .values({ userId, name, scopes, tokenHash: hashSecret(secret), prefix: secret.slice(0, 12) })
      .returning(tokenColumns);
    await recordAuditEvent(tx, {
      actorId: userId,
      action: "api_token.created",
      subjectType: "api_token",
      subjectId: row.id,
      details: { name, scopes },
    });
    return row;
  });
  return { token, secret };
}

export async function listApiTokens({ userId }: { userId: number }): Promise<ApiTokenDto[]> {
  return getDb().select(tokenColumns).from(apiTokens).where(eq(apiTokens.userId, userId)).orderBy(desc(apiTokens.createdAt));
}

/** Revokes one of the person's own tokens; someone else's token is "not found". */
export async function revokeApiToken({ userId, tokenId }: { userId: number; tokenId: number }) {
  await getDb().transaction(async (tx) => {
    const [row] = await tx
      .update(apiTokens)
      .set({ revokedAt: new Date() })
      .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
      .returning({ id: apiTokens.id });
    if (!row) throw new AppError("not_found", "No such active token");
    await recordAuditEvent(tx, { actorId: userId, action: "api_token.revoked", subjectType: "api_token", subjectId: tokenId });
  });
}

/** Resolves a bearer secret to its active owner and records the use. */
export async function getUserByApiToken({ secret }: { secret: string }) {
  const db = getDb();
  const [row] = await db
    .select({ tokenId: apiTokens.id, scopes: apiTokens.scopes, user: userColumns })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .where(and(eq(apiTokens.tokenHash, hashSecret(secret)), isNull(apiTokens.revokedAt), isNull(users.deactivatedAt)));
  if (!row) return null;
  await db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, row.tokenId));
  return { user: row.user, scopes: row.scopes as ApiTokenScope[] };
}

// ---- ORCID iDs proven at the provider ----

/** The account holding a verified iD, with what sign-in needs. */
export async function getUserByVerifiedOrcid({ orcid }: { orcid: string }) {
  const [row] = await getDb()
    .select({ ...userColumns, sessionGeneration: users.sessionGeneration })
    .from(users)
    .where(eq(users.verifiedOrcid, orcid));
  return row ?? null;
}

/** An account made by a first ORCID sign-in whose address was never confirmed: a later sign-in with the iD may take its place. */
export function isPendingOrcidSignUp(user: { passwordSet: boolean; emailVerifiedAt: Date | null; verifiedOrcid: string | null }) {
  return !user.passwordSet && user.emailVerifiedAt === null && user.verifiedOrcid !== null;
}

/** The datasets whose versions name the account as a creator, read after a change committed. */
export async function listLinkedDatasetIds({ userId }: { userId: number }): Promise<number[]> {
  return linkedDatasetIds(getDb(), userId);
}

/** The datasets whose versions name the account as a creator (their pages show the verified iD). */
async function linkedDatasetIds(tx: Database | Transaction, userId: number): Promise<number[]> {
  const rows = await tx
    .selectDistinct({ datasetId: datasetVersions.datasetId })
    .from(creatorPeople)
    .innerJoin(datasetVersions, eq(datasetVersions.id, creatorPeople.versionId))
    .where(eq(creatorPeople.userId, userId));
  return rows.map((r) => r.datasetId);
}

/**
 * Links a verified iD to the account `userId`. An iD held by another account is refused (409),
 * unless that account is a pending ORCID sign-up, which gives it up. The triggers of drizzle/0030
 * attach the account to every creator entry naming the iD. Returns the datasets concerned.
 */
export async function linkVerifiedOrcid({ userId, orcid }: { userId: number; orcid: string }): Promise<number[]> {
  return getDb().transaction(async (tx) => {
    const [holder] = await tx.select(userColumns).from(users).where(eq(users.verifiedOrcid, orcid)).for("update");
    if (holder?.id === userId) return [];
    if (holder) {
      if (!isPendingOrcidSignUp(holder)) throw new AppError("conflict", "This ORCID iD is already linked to another account");
      await tx.update(users).set({ verifiedOrcid: null, orcidLinkedAt: null }).where(eq(users.id, holder.id));
      await recordAuditEvent(tx, {
        actorId: userId,
        action: "user.orcid_released",
        subjectType: "user",
        subjectId: holder.id,
        details: { orcid, reason: "a pending, unconfirmed sign-up gave way to a signed-in account" },
      });
    }
    const before = await linkedDatasetIds(tx, userId);
    await tx.update(users).set({ verifiedOrcid: orcid, orcidLinkedAt: new Date() }).where(eq(users.id, userId));
    await recordAuditEvent(tx, {
      actorId: userId,
      action: "user.orcid_linked",
      subjectType: "user",
      subjectId: userId,
      details: { orcid },
    });
    return [...new Set([...before, ...(await linkedDatasetIds(tx, userId))])];
  });
}

/** Unlinks the account's verified iD; needs a password set, so nobody locks themselves out. Returns the datasets concerned. */
export async function unlinkVerifiedOrcid({ userId }: { userId: number }): Promise<number[]> {
  return getDb().transaction(async (tx) => {
    const [row] = await tx.select(userColumns).from(users).where(eq(users.id, userId)).for("update");
    if (!row?.verifiedOrcid) throw new AppError("conflict", "No ORCID iD is linked to this account");
    if (!row.passwordSet) {
      throw new AppError("conflict", "Choose a password first (we can e-mail you a link): without ORCID it is how you sign in");
    }
    const before = await linkedDatasetIds(tx, userId);
    await takeOrcidOff(tx, { userId, orcid: row.verifiedOrcid, actorId: userId, action: "user.orcid_unlinked" });
    return before;
  });
}

/** The verified iD leaves the account, with the audit event saying who took it off and why. */
async function takeOrcidOff(
  tx: Transaction,
  { userId, orcid, actorId, action }: { userId: number; orcid: string; actorId: number | null; action: string },
) {
  await tx.update(users).set({ verifiedOrcid: null, orcidLinkedAt: null }).where(eq(users.id, userId));
  await recordAuditEvent(tx, { actorId, action, subjectType: "user", subjectId: userId, details: { orcid } });
}

/**
 * The account of a first ORCID sign-in: a new unconfirmed researcher holding the iD, with a
 * password nobody knows (`passwordSet` false), or, when a pending sign-up already holds the iD,
 * that one with the newly confirmed name and address. Returns the account, or null when the
 * address belongs to another account (or the iD to a confirmed one): nothing is changed then.
 */
export async function saveOrcidSignUp({
  orcid,
  name,
  email,
  passwordHash,
  ticketId,
  browserKeyHash,
}: {
  orcid: string;
  name: string;
  email: string;
  passwordHash: string;
  /** The confirmation ticket's id: each ticket confirms one sign-up. */
  ticketId: string;
  /** SHA-256 of the key left in the confirming browser's cookie: only that browser confirms the address. */
  browserKeyHash: string;
}): Promise<{ user: UserDto; replaced: boolean; secret: string } | null | "ticket_used"> {
  const address = normaliseEmail(email);
  return getDb().transaction(async (tx) => {
    // Serialised per iD (the holder row lock below, or this advisory lock when there is none yet).
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`orcid-sign-up:${orcid}`}))`);
    const [used] = await tx.select({ userId: orcidSignUps.userId }).from(orcidSignUps).where(eq(orcidSignUps.ticketId, ticketId));
    if (used) return "ticket_used";
    const [holder] = await tx.select(userColumns).from(users).where(eq(users.verifiedOrcid, orcid)).for("update");
    if (holder && !isPendingOrcidSignUp(holder)) return null;
    const [owner] = await tx
      .select({ id: users.id })
      .from(users)
      .where(eq(sql`lower(${users.email})`, address));
    if (owner && owner.id !== holder?.id) return null;
    if (holder) {
      const [row] = await tx.update(users).set({ name: name.trim(), email: address }).where(eq(users.id, holder.id)).returning(userColumns);
      // No link sent to the address typed before works any more: confirmation, reset or sign-in.
      for (const purpose of oneTimePurposeEnum.enumValues) await voidOneTimeTokens({ userId: holder.id, purpose, tx });
      await tx.insert(orcidSignUps).values({ ticketId, userId: holder.id, browserKeyHash });
      await recordAuditEvent(tx, {
        actorId: holder.id,
        action: "user.orcid_sign_up_replaced",
        subjectType: "user",
        subjectId: holder.id,
        details: { orcid, ticket: ticketId },
      });
      return { user: row, replaced: true, secret: await insertOneTimeToken(tx, { userId: holder.id, purpose: "verify_email" }) };
    }
    const [row] = await tx
      .insert(users)
      .values({ email: address, name: name.trim(), passwordHash, passwordSet: false, verifiedOrcid: orcid, orcidLinkedAt: new Date() })
      .onConflictDoNothing()
      .returning(userColumns);
    if (!row) return null;
    await tx.insert(orcidSignUps).values({ ticketId, userId: row.id, browserKeyHash });
    await recordAuditEvent(tx, {
      actorId: row.id,
      action: "user.sign_up",
      subjectType: "user",
      subjectId: row.id,
      details: { through: "orcid", orcid, ticket: ticketId },
    });
    return { user: row, replaced: false, secret: await insertOneTimeToken(tx, { userId: row.id, purpose: "verify_email" }) };
  });
}

export async function setProfileListed({ userId, listed }: { userId: number; listed: boolean }) {
  await getDb().transaction(async (tx) => {
    await tx.update(users).set({ profileListed: listed }).where(eq(users.id, userId));
    await recordAuditEvent(tx, {
      actorId: userId,
      action: "user.profile_listing_changed",
      subjectType: "user",
      subjectId: userId,
      details: { listed },
    });
  });
}
