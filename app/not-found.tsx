import type { Metadata } from "next";
import Link from "next/link";

export const metadata: Metadata = { title: "Not found" };

export default function NotFound() {
  return (
    <div className="mx-auto max-w-xl space-y-4 py-10">
      <h1 className="text-3xl font-semibold">Page not found</h1>
      <p className="text-muted">
        Nothing lives at this address, or you do not have access to it. Published versions keep their addresses for good, so a link you were
        given may have a typo.
      </p>
      <p>
        <Link href="/">Back to the start page</Link>
      </p>
    </div>
  );
}
