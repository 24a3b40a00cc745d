import "server-only";
import { Meilisearch, type EnqueuedTask, type Task } from "meilisearch";
import { meilisearchConfig } from "@/lib/config";
import { listSpeciesNameGroups } from "@/lib/search/queries";
import { indexSettings, synonymsFromNames } from "./index-settings";

/** The configured service and index; throws when MEILISEARCH_URL is unset. */
export function meiliIndex(config = meilisearchConfig()) {
  if (!config) throw new Error("MEILISEARCH_URL is not set");
  const client = new Meilisearch({ host: config.host, apiKey: config.apiKey, timeout: 10_000 });
  return { client, index: client.index(config.index), uid: config.index };
}

/**
 * Waits for a task and throws unless it succeeded: a write counts as done only when the service
 * says so (an enqueued task may still fail, and then nothing was written).
 */
export async function waitForSuccess(client: Meilisearch, enqueued: EnqueuedTask | Promise<EnqueuedTask>, timeout = 60_000): Promise<Task> {
  const task = await client.tasks.waitForTask((await enqueued).taskUid, { timeout, interval: 50 });
  if (task.status !== "succeeded")
    throw new Error(`Meilisearch task ${task.uid} (${task.type}) ${task.status}: ${task.error?.message ?? "no reason given"}`);
  return task;
}

/** Creates the index if needed and applies the settings (idempotent); returns the settings applied. */
export async function applyIndexSettings(config = meilisearchConfig()) {
  const { client, index, uid } = meiliIndex(config);
  try {
    await client.getRawIndex(uid);
  } catch (err) {
    if ((err as { cause?: { code?: string } }).cause?.code !== "index_not_found") throw err;
    await waitForSuccess(client, client.createIndex(uid, { primaryKey: "id" }));
  }
  const settings = indexSettings(synonymsFromNames(await listSpeciesNameGroups()));
  await waitForSuccess(client, index.updateSettings(settings));
  return settings;
}
