import "server-only";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import type { CitableVersion } from "@/lib/citation/subjects";

/** What a public profile shows: never the e-mail address. */
export interface PublicProfileDto {
  id: number;
  name: string;
  affiliation: string | null;
  /** Proven at the ORCID provider. */
  verifiedOrcid: string | null;
  /** Typed in by the person, shown as not verified (only when no iD is verified). */
  typedOrcid: string | null;
  listed: boolean;
}

/** One published dataset on a profile: its newest published version, and how the person took part. */
export interface ProfileDatasetDto extends Omit<CitableVersion, "state" | "retractedAt"> {
  state: "published";
  retractedAt: Date | null;
  created: boolean;
  deposited: boolean;
}

/**
 * Who has a profile: an active account whose address is confirmed (an unconfirmed ORCID sign-up
 * shows nothing), with a verified iD or a published dataset they created or deposited.
 */
const HAS_PROFILE = sql`u.email_verified_at is not null and u.deactivated_at is null and (u.verified_orcid is not null
  or exists (select 1 from datasets d join dataset_versions v on v.dataset_id = d.id where d.owner_id = u.id and v.state = 'published')
  or exists (select 1 from creator_people cp join dataset_versions v on v.id = cp.version_id where cp.user_id = u.id and v.state = 'published'))`;

type ProfileRow = {
  id: number;
  name: string;
  affiliation: string | null;
  verified_orcid: string | null;
  orcid: string | null;
  profile_listed: boolean;
};

const toProfile = (r: ProfileRow): PublicProfileDto => ({
  id: Number(r.id),
  name: r.name,
  affiliation: r.affiliation,
  verifiedOrcid: r.verified_orcid,
  typedOrcid: r.verified_orcid ? null : r.orcid,
  listed: r.profile_listed,
});

export async function getPublicProfile({ id }: { id: number }): Promise<PublicProfileDto | null> {
  const rows = await getDb().execute<ProfileRow>(sql`
    select u.id, u.name, u.affiliation, u.verified_orcid, u.orcid, u.profile_listed from users u where u.id = ${id} and ${HAS_PROFILE}`);
  return rows[0] ? toProfile(rows[0]) : null;
}

export const PROFILES_PAGE_SIZE = 100;

/** Listed profiles by name, a page at a time, with the count of all. */
export async function listPublicProfiles({ page }: { page: number }): Promise<{ profiles: PublicProfileDto[]; total: number }> {
  const db = getDb();
  const [rows, [count]] = await Promise.all([
    db.execute<ProfileRow>(sql`
      select u.id, u.name, u.affiliation, u.verified_orcid, u.orcid, u.profile_listed from users u
      where u.profile_listed and ${HAS_PROFILE} order by u.name, u.id
      limit ${PROFILES_PAGE_SIZE} offset ${(page - 1) * PROFILES_PAGE_SIZE}`),
    db.execute<{ n: number }>(sql`select count(*)::int as n from users u where u.profile_listed and ${HAS_PROFILE}`),
  ]);
  return { profiles: rows.map(toProfile), total: Number(count?.n ?? 0) };
}

/**
 * Every dataset with a published version that the person created (a creator entry linked to their
 * verified iD, creator_people) or deposited (owns), by its newest published version, newest first.
 */
export async function listProfileDatasets({ userId }: { userId: number }): Promise<ProfileDatasetDto[]> {
  const rows = await getDb().execute<{
    dataset_id: number;
    number: number;
    title: string;
    version_identifier: string | null;
    published_at: string | Date | null;
    payload: Record<string, unknown>;
    state: string;
    retracted_at: string | Date | null;
    created: boolean;
    deposited: boolean;
  }>(sql`
    with mine as (
      select d.id as dataset_id,
        exists (select 1 from creator_people cp join dataset_versions w on w.id = cp.version_id
          where cp.user_id = ${userId} and w.dataset_id = d.id and w.state = 'published') as created,
        d.owner_id = ${userId} as deposited
      from datasets d
      where d.owner_id = ${userId}
        or d.id in (select w.dataset_id from creator_people cp join dataset_versions w on w.id = cp.version_id where cp.user_id = ${userId})
    )
    select distinct on (v.dataset_id) v.dataset_id, v.number, v.title, v.version_identifier, v.published_at, v.payload, v.state,
      v.retracted_at, m.created, m.deposited
    from mine m join dataset_versions v on v.dataset_id = m.dataset_id
    where v.state = 'published' and (m.created or m.deposited)
    order by v.dataset_id, v.number desc`);
  const date = (v: string | Date | null) => (v === null ? null : new Date(v));
  return rows
    .map((r) => ({
      datasetId: Number(r.dataset_id),
      number: Number(r.number),
      title: r.title,
      versionIdentifier: r.version_identifier,
      publishedAt: date(r.published_at),
      payload: r.payload,
      state: "published" as const,
      retractedAt: date(r.retracted_at),
      created: r.created,
      deposited: r.deposited,
    }))
    .sort((a, b) => (b.publishedAt?.getTime() ?? 0) - (a.publishedAt?.getTime() ?? 0) || b.datasetId - a.datasetId);
}

/** The verified iD of each creator entry of these versions: version id → position → iD (DataCite and JSON-LD name identifiers). */
export async function getVerifiedCreatorIds({ versionIds }: { versionIds: number[] }): Promise<Map<number, Map<number, string>>> {
  const out = new Map<number, Map<number, string>>();
  if (versionIds.length === 0) return out;
  const rows = await getDb().execute<{ version_id: number; position: number; orcid: string }>(sql`
    select cp.version_id, cp.position, u.verified_orcid as orcid from creator_people cp join users u on u.id = cp.user_id
    where cp.version_id in ${sql.raw(`(${versionIds.map((id) => Number(id)).join(",")})`)} and u.verified_orcid is not null`);
  for (const r of rows) {
    const byPosition = out.get(Number(r.version_id)) ?? new Map<number, string>();
    byPosition.set(Number(r.position), r.orcid);
    out.set(Number(r.version_id), byPosition);
  }
  return out;
}

/** The creator entries of one version that are people with a public profile: position → their profile id and verified iD. */
export async function listVersionCreatorPeople({
  versionId,
}: {
  versionId: number;
}): Promise<Map<number, { userId: number; orcid: string }>> {
  const rows = await getDb().execute<{ position: number; user_id: number; orcid: string }>(sql`
    select cp.position, u.id as user_id, u.verified_orcid as orcid from creator_people cp join users u on u.id = cp.user_id
    where cp.version_id = ${versionId} and u.verified_orcid is not null and u.email_verified_at is not null and u.deactivated_at is null`);
  return new Map(rows.map((r) => [Number(r.position), { userId: Number(r.user_id), orcid: r.orcid }]));
}
