import { getCurrentUser } from "@/lib/auth/session";
import { isWatching, type WatchSubject } from "@/lib/watches/queries";
import { WatchToggle } from "./watch-forms";

/** The watch button of a public page, for whoever is reading it (a sign-in link when nobody is signed in). */
export async function WatchControl({ subject, what, backPath }: { subject: WatchSubject; what: string; backPath: string }) {
  const viewer = await getCurrentUser();
  const watching = viewer ? await isWatching({ userId: viewer.id, subject }) : false;
  return <WatchToggle subject={subject} what={what} watching={watching} signedIn={viewer !== null} backPath={backPath} />;
}
