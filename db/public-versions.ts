import { sql, type SQL } from "drizzle-orm";

/**
 * The condition that the dataset version `v` (a dataset_versions alias) is its dataset's newest public
 * one: published or retracted, and no later version of the same dataset is. What a reaction page
 * lists, what the sitemap names and what the kept pages are rendered ahead for all read a dataset
 * through this version only, so a draft, a submission or a declined version never counts.
 */
export const isNewestPublic = (v: SQL) => sql`(${v}.state in ('published', 'retracted')
  and not exists (select 1 from dataset_versions newer where newer.dataset_id = ${v}.dataset_id
    and newer.state in ('published', 'retracted') and newer.number > ${v}.number))`;
