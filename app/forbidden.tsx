import Link from "next/link";
import { DocumentTitle } from "@/components/document-title";
import { restrictedAreas, rolesAllowedText } from "@/lib/auth/page-guard";
import { can } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";

// Next applies the refused route's metadata to this page, so the tab is named here.
const TITLE = "You do not have access · Arrhenia";

/** Answered with 403 when a signed-in person opens a page their role may not use. */
export default async function Forbidden() {
  const user = await getCurrentUser();
  const closed = restrictedAreas.filter((a) => !can(user?.role, a.permission));
  return (
    <div className="mx-auto max-w-xl space-y-4 py-10">
      <DocumentTitle title={TITLE} />
      <h1 className="text-3xl font-semibold">You do not have access</h1>
      <p className="text-muted">
        {user ? `You are signed in as a ${user.role}, and this page needs another role.` : "This page needs a role."} An admin can change a
        person&apos;s role.
      </p>
      {closed.length > 0 && (
        <ul className="list-disc space-y-1 pl-5 text-sm">
          {closed.map((a) => (
            <li key={a.path}>
              {a.area} (<code>{a.path}</code>): needs the {rolesAllowedText(a.permission)} role
            </li>
          ))}
        </ul>
      )}
      <p>
        <Link href="/">Back to the start page</Link>
      </p>
    </div>
  );
}
