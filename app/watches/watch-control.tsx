import { getCurrentUser } from "@/lib/auth/session";
import { isWatching, type WatchSubject } from "@/lib/watches/queries";

/**
 * What a public page's watch button needs for whoever reads it. Read by the page itself (not by an
 * async child component), so the page renders in one pass wherever it is rendered.
 */
export async function readWatchState(subject: WatchSubject): Promise<{ signedIn: boolean; watching: boolean }> {
  const viewer = await getCurrentUser();
  return { signedIn: viewer !== null, watching: viewer ? await isWatching({ userId: viewer.id, subject }) : false };
}
