import type { Metadata } from "next";
import Link from "next/link";
import { publicPageMetadata } from "@/lib/page-metadata";
import { countPublicDataCached } from "@/lib/reactions/cached";
import { can } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";
import { countUsersByRole } from "@/lib/users/queries";

export async function generateMetadata(): Promise<Metadata> {
  const title = "Arrhenia — curated rate constants";
  return {
    ...publicPageMetadata({
      title,
      description: "An open, curated repository of chemical rate-constant datasets, each re-fitted the same way and citable by version.",
      path: "/",
    }),
    title: { absolute: title },
  };
}
export const dynamic = "force-dynamic";

export default async function HomePage() {
  const [counts, data, user] = await Promise.all([countUsersByRole(), countPublicDataCached(), getCurrentUser()]);
  const stats = [
    { label: "published datasets", value: data.datasets, href: "/reactions" },
    { label: "reactions covered", value: data.reactions, href: "/reactions" },
    { label: "rate constants", value: data.points },
    { label: "researchers", value: counts.researcher },
    { label: "curators", value: counts.curator },
  ];
  return (
    <div className="space-y-10">
      <section className="space-y-4">
        <h1 className="max-w-3xl text-4xl font-semibold leading-tight">Rate constants you can trace, compare and cite.</h1>
        <p className="max-w-3xl text-lg text-muted">
          Arrhenia is an open, curated repository of chemical rate-constant data. Researchers deposit k(T) datasets with their conditions
          and provenance; curators review them; every published version gets its own identifier. Each dataset is re-fitted the same way —
          Arrhenius, modified Arrhenius and Eyring — with outliers and curvature flagged before anyone copies a number into a mechanism.
        </p>
        {user && (
          <div className="flex flex-wrap gap-3">
            {can(user.role, "dataset.deposit") && (
              <Link href="/deposits/new" className="btn-primary no-underline hover:no-underline">
                New deposit
              </Link>
            )}
            <Link href="/deposits" className="btn-secondary no-underline hover:no-underline">
              My deposits
            </Link>
            {can(user.role, "dataset.review") && (
              <Link href="/review" className="btn-secondary no-underline hover:no-underline">
                Review queue
              </Link>
            )}
          </div>
        )}
        {!user && (
          <div className="flex gap-3">
            <Link href="/sign-up" className="btn-primary no-underline hover:no-underline">
              Create an account
            </Link>
            <Link href="/sign-in" className="btn-secondary no-underline hover:no-underline">
              Sign in
            </Link>
          </div>
        )}
      </section>
      <section aria-labelledby="numbers-heading">
        <h2 id="numbers-heading" className="sr-only">
          Arrhenia in numbers
        </h2>
        <dl className="grid gap-4 sm:grid-cols-3 lg:grid-cols-5">
          {stats.map((s) => (
            <div key={s.label} className="card">
              <dt className="text-sm text-muted">{s.label}</dt>
              <dd className="font-serif text-3xl font-semibold" data-testid={`count-${s.label.replace(/ /g, "-")}`}>
                {s.href ? <Link href={s.href}>{s.value}</Link> : s.value}
              </dd>
            </div>
          ))}
        </dl>
      </section>
      <section className="grid gap-6 md:grid-cols-3" aria-label="Who Arrhenia is for">
        <div className="card space-y-2">
          <h2 className="text-xl font-semibold">Depositing a dataset</h2>
          <p className="text-sm text-muted">
            Turn a table of measured or computed rate constants into a validated record: units converted, species identified, fits and
            checks run as you type.
          </p>
        </div>
        <div className="card space-y-2">
          <h2 className="text-xl font-semibold">Reviewing</h2>
          <p className="text-sm text-muted">
            Curators see every automatic check before they decide, and every decision carries a reason on the audit trail.
          </p>
        </div>
        <div className="card space-y-2">
          <h2 className="text-xl font-semibold">Modelling</h2>
          <p className="text-sm text-muted">
            Find every dataset for a reaction over your temperature window, compare them on one plot, and take parameters with units and a
            citation of the exact version.
          </p>
          <p className="text-sm text-muted">
            Signed in, <Link href="/mechanisms">check a whole mechanism</Link> (Cantera YAML or the classic plain-text layout) against the
            published data, and keep the versions you use as a citable <Link href="/collections">collection</Link>.
          </p>
        </div>
      </section>
    </div>
  );
}
