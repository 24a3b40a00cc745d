import Link from "next/link";
import { can } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";
import { MainNav, type NavLink } from "./main-nav";
import { SiteSearch } from "./search/site-search";

/** Product name, search, and the links the signed-in role may use. */
export async function SiteHeader() {
  const user = await getCurrentUser();
  const links: NavLink[] = [
    { href: "/reactions", label: "Reactions" },
    { href: "/classes", label: "Classes" },
    { href: "/collections", label: "Collections" },
    { href: "/analyse", label: "Fit data" },
  ];
  if (user) {
    if (can(user.role, "dataset.deposit")) links.push({ href: "/deposits", label: "My deposits" });
    if (can(user.role, "mechanism.check")) links.push({ href: "/mechanisms", label: "Mechanisms" });
    if (can(user.role, "dataset.review")) links.push({ href: "/review", label: "Review" });
    if (can(user.role, "user.manage")) links.push({ href: "/admin/people", label: "People" });
    if (can(user.role, "mail.read")) links.push({ href: "/admin/mail", label: "Mail" });
    if (can(user.role, "job.read")) links.push({ href: "/admin/jobs", label: "Jobs" });
    links.push({ href: "/settings", label: "Settings" });
  }
  return (
    <header className="border-b border-line bg-panel">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-3 px-4 py-3 sm:px-6">
        <Link href="/" className="mr-auto font-serif text-xl sm:mr-0 font-semibold text-ink no-underline hover:no-underline">
          Arrhenia
        </Link>
        <SiteSearch />
        <MainNav links={links} user={user ? { name: user.name, email: user.email, role: user.role } : null} />
      </div>
    </header>
  );
}
