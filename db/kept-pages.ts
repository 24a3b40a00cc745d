import { sql, type SQL } from "drizzle-orm";
import { getDb } from "./client";
import { isNewestPublic } from "./public-versions";

/**
 * The queries of the kept pages (kept_pages and page_tag_moves, db/kept-pages-schema.ts): what
 * lib/kept-pages.ts reads and writes and what lib/render-ahead.ts lists. The rules of what a kept
 * page is and when it may be served are that module's.
 */

/** The condition on a kept_pages row `p` that it may be served: of this build, within its lifetime, none of its tags moved since its render. */
export const servable = ({ build, hours }: { build: string; hours: number }) => sql`(p.build = ${build}
  and p.kept_at > now() - make_interval(hours => ${hours})
  and not exists (select 1 from page_tag_moves m where m.tag = any(p.tags) and m.moved > p.rendered_at))`;

/** A kept page's stored answer. */
export interface KeptPageRow {
  status: number;
  headers: Record<string, string | string[] | number | undefined>;
  body: Buffer;
  tags: string[];
  /** The public pages' mark its render began under. */
  renderedAt: string;
}

/** The servable row kept under `key`, or null. */
export async function readKeptPageRow({ key, build, hours }: { key: string; build: string; hours: number }): Promise<KeptPageRow | null> {
  const [row] = await getDb().execute<{
    status: number;
    headers: KeptPageRow["headers"];
    body: Buffer;
    tags: string[];
    rendered_at: string;
  }>(sql`
    select p.status, p.headers, p.body, p.tags, p.rendered_at::text as rendered_at
    from kept_pages p where p.key = ${key} and ${servable({ build, hours })}`);
  return row
    ? { status: Number(row.status), headers: row.headers, body: Buffer.from(row.body), tags: row.tags, renderedAt: row.rendered_at }
    : null;
}

/** Keeps a page rendered under the mark `renderedAt`; a later render is never replaced by an earlier one. */
export async function writeKeptPageRow(row: {
  key: string;
  build: string;
  tags: string[];
  renderedAt: string;
  status: number;
  headers: KeptPageRow["headers"];
  body: Buffer;
}): Promise<void> {
  await getDb().execute(sql`
    insert into kept_pages (key, build, tags, rendered_at, status, headers, body)
    values (${row.key}, ${row.build}, array[${sql.join(
      row.tags.map((t) => sql`${t}`),
      sql`, `,
    )}]::text[], ${row.renderedAt}, ${row.status}, ${JSON.stringify(row.headers)}::jsonb, ${row.body})
    on conflict (key) do update set build = excluded.build, tags = excluded.tags, rendered_at = excluded.rendered_at,
      status = excluded.status, headers = excluded.headers, body = excluded.body, kept_at = now()
    where kept_pages.build <> excluded.build or kept_pages.rendered_at <= excluded.rendered_at`);
}

/** Deletes the kept pages of other builds and those past their lifetime; returns how many. */
export async function deleteStaleKeptPages({ build, hours }: { build: string; hours: number }): Promise<number> {
  const rows = await getDb().execute<{ n: number }>(sql`
    with gone as (delete from kept_pages where build <> ${build} or kept_at <= now() - make_interval(hours => ${hours}) returning 1)
    select count(*)::int as n from gone`);
  return Number(rows[0]?.n ?? 0);
}

/** The reaction a public dataset version is on: `{ reactionId }` (null when none), or null when the version is not public. */
export async function publicVersionReaction({ datasetId, number }: { datasetId: number; number: number }) {
  const [row] = await getDb().execute<{ reaction_id: number | null }>(sql`
    select reaction_id from dataset_versions
    where dataset_id = ${datasetId} and number = ${number} and state in ('published', 'retracted')`);
  return row ? { reactionId: row.reaction_id === null ? null : Number(row.reaction_id) } : null;
}

/** The reaction with this key and its participants' species ids, or null when there is none. */
export async function reactionParticipants({ key }: { key: string }) {
  const rows = await getDb().execute<{ id: number; species_id: number }>(sql`
    select r.id, p.species_id from reactions r join reaction_participants p on p.reaction_id = r.id where r.key = ${key}`);
  return rows.length === 0 ? null : { reactionId: Number(rows[0].id), speciesIds: [...new Set(rows.map((r) => Number(r.species_id)))] };
}

/** Every species that shares a reaction with the species of this InChIKey (itself included); empty when it takes part in none. */
export async function speciesMetInReactions({ inchiKey }: { inchiKey: string }): Promise<number[]> {
  const rows = await getDb().execute<{ species_id: number }>(sql`
    select distinct p.species_id from species s
    join reaction_participants mine on mine.species_id = s.id
    join reaction_participants p on p.reaction_id = mine.reaction_id
    where s.inchi_key = ${inchiKey}`);
  return rows.map((r) => Number(r.species_id));
}

/** The kinds of page rendered ahead, in the order a pass takes them. */
export const UNKEPT_PAGE_KINDS = ["reaction", "species", "dataset version"] as const;

/** Each kind's public pages with no servable gzip copy (`valid`), after `after` in the kind's order, with the path each is kept under. */
const UNKEPT: Record<(typeof UNKEPT_PAGE_KINDS)[number], (after: number | null, limit: number, valid: SQL) => SQL> = {
  // The sitemap's reactions: those the newest public version of some dataset is on.
  reaction: (after, limit, valid) => sql`
    select r.id, '/reactions/' || replace(r.key, '>>', '~') as path from reactions r
    where ${after === null ? sql`true` : sql`r.id > ${after}`}
      and exists (select 1 from dataset_versions v where v.reaction_id = r.id and ${isNewestPublic(sql`v`)})
      and not exists (select 1 from kept_pages p where p.key = '/reactions/' || replace(r.key, '>>', '~') || E'\\ngzip' and ${valid})
    order by r.id limit ${limit}`,
  // The sitemap's species: those in a reaction the newest public version of some dataset is on.
  species: (after, limit, valid) => sql`
    select s.id, '/species/' || s.inchi_key as path from species s
    where ${after === null ? sql`true` : sql`s.id > ${after}`}
      and exists (select 1 from reaction_participants rp join dataset_versions v on v.reaction_id = rp.reaction_id
        where rp.species_id = s.id and ${isNewestPublic(sql`v`)})
      and not exists (select 1 from kept_pages p where p.key = '/species/' || s.inchi_key || E'\\ngzip' and ${valid})
    order by s.id limit ${limit}`,
  // Every public version, newest first: a dataset just published is the likeliest to be read.
  "dataset version": (after, limit, valid) => sql`
    select v.id, '/datasets/' || v.dataset_id || '/v' || v.number as path from dataset_versions v
    where v.state in ('published', 'retracted') and ${after === null ? sql`true` : sql`v.id < ${after}`}
      and not exists (select 1 from kept_pages p where p.key = '/datasets/' || v.dataset_id || '/v' || v.number || E'\\ngzip' and ${valid})
    order by v.id desc limit ${limit}`,
};

/** The next pages of a kind that have no servable gzip copy kept by `build`, after `after` (an id) in the kind's order. */
export async function listUnkeptPages({
  build,
  kind,
  after,
  limit,
  hours,
}: {
  build: string;
  kind: (typeof UNKEPT_PAGE_KINDS)[number];
  after: number | null;
  limit: number;
  hours: number;
}): Promise<{ id: number; path: string }[]> {
  const rows = await getDb().execute<{ id: number; path: string }>(UNKEPT[kind](after, limit, servable({ build, hours })));
  return rows.map((r) => ({ id: Number(r.id), path: r.path }));
}
