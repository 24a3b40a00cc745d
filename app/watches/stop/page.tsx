import type { Metadata } from "next";
import { findWatchLabel } from "@/lib/watches/queries";
import { readStopToken } from "@/lib/watches/token";
import { StopWatchForm } from "../watch-forms";

export const metadata: Metadata = { title: "Stop watching", robots: { index: false } };
export const dynamic = "force-dynamic";

/**
 * Where a mail's stop link leads. Opening it changes nothing (mail scanners open links); the button
 * does. No sign-in: the signed token names the one watch it may end.
 */
export default async function StopWatchPage({ searchParams }: { searchParams: Promise<{ token?: string | string[] }> }) {
  const raw = (await searchParams).token;
  const token = typeof raw === "string" ? raw : "";
  const named = token ? readStopToken(token) : null;
  const label = named ? await findWatchLabel(named) : null;
  return (
    <div className="mx-auto max-w-xl space-y-4">
      <h1 className="text-3xl font-semibold">Stop watching</h1>
      <div className="card space-y-3">
        {!named ? (
          <p role="alert">This stop link is not valid: it may have been cut short or altered. Copy the whole link from the mail.</p>
        ) : !label ? (
          <p>You no longer watch this: there is nothing to stop.</p>
        ) : (
          <StopWatchForm token={token} label={label} />
        )}
      </div>
    </div>
  );
}
