import Link from "next/link";
import { can } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";
import { SignOutButton } from "./sign-out-button";

/** Product name, search, and the links the signed-in role may use. */
export async function SiteHeader() {
  const user = await getCurrentUser();
  const links: { href: string; label: string }[] = [
    { href: "/reactions", label: "Reactions" },
    { href: "/analyse", label: "Fit data" },
  ];
  if (user) {
    if (can(user.role, "dataset.deposit")) links.push({ href: "/deposits", label: "My deposits" });
    if (can(user.role, "dataset.review")) links.push({ href: "/review", label: "Review" });
    if (can(user.role, "user.manage")) links.push({ href: "/admin/people", label: "People" });
    if (can(user.role, "mail.read")) links.push({ href: "/admin/mail", label: "Mail" });
    if (can(user.role, "job.read")) links.push({ href: "/admin/jobs", label: "Jobs" });
    links.push({ href: "/settings", label: "Settings" });
  }
  return (
    <header className="border-b border-line bg-panel">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-3 px-4 py-3 sm:px-6">
        <Link href="/" className="font-serif text-xl font-semibold text-ink no-underline hover:no-underline">
          Arrhenia
        </Link>
        <form action="/search" method="get" role="search" className="flex min-w-48 flex-1 items-center">
          <label htmlFor="site-search" className="sr-only">
            Search datasets
          </label>
          <input
            id="site-search"
            name="q"
            type="search"
            placeholder="Search reactions, species, authors…"
            className="field-input max-w-md"
          />
        </form>
        <nav aria-label="Main" className="flex items-center gap-4 text-sm">
          {links.map((l) => (
            <Link key={l.href} href={l.href}>
              {l.label}
            </Link>
          ))}
          {user ? (
            <>
              <span className="text-muted" title={user.email}>
                {user.name} <span className="rounded-sm bg-paper px-1.5 py-0.5 text-xs">{user.role}</span>
              </span>
              <SignOutButton />
            </>
          ) : (
            <>
              <Link href="/sign-in">Sign in</Link>
              <Link href="/sign-up" className="btn-primary no-underline hover:no-underline">
                Create account
              </Link>
            </>
          )}
        </nav>
      </div>
    </header>
  );
}
