import type { Metadata } from "next";
import Link from "next/link";
import { DepositEditor } from "@/components/deposit-editor/deposit-editor";
import { requirePagePermission } from "@/lib/auth/page-guard";

export const metadata: Metadata = { title: "New deposit" };

export default async function NewDepositPage() {
  const user = await requirePagePermission("dataset.deposit", "/deposits/new");
  return (
    <div className="space-y-6">
      <header className="space-y-2">
        <p className="text-sm">
          <Link href="/deposits">My deposits</Link> / new
        </p>
        <h1 className="text-3xl font-semibold">New deposit</h1>
        <p className="max-w-3xl text-muted">
          Describe the reaction, bring in your table of temperatures and rate constants, and say where the numbers come from. The fit below
          follows your data as you type. Saving keeps a private draft that you can come back to; a curator sees it only once you submit it.
          The <Link href="/docs/deposit-format">deposit format</Link> page explains every field.
        </p>
      </header>
      <DepositEditor mode="new" person={{ name: user.name, orcid: user.verifiedOrcid ?? user.orcid, affiliation: user.affiliation }} />
    </div>
  );
}
