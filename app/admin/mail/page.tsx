import type { Metadata } from "next";
import Link from "next/link";
import { DateTime } from "@/components/date-time";
import { requirePagePermission } from "@/lib/auth/page-guard";
import { usesMailCapture } from "@/lib/config";
import { listCapturedMail } from "@/lib/mail/queries";
import { ScrollRegion } from "@/components/scroll-region";

export const metadata: Metadata = { title: "Outgoing mail" };
export const dynamic = "force-dynamic";

export default async function MailInboxPage() {
  await requirePagePermission("mail.read", "/admin/mail");
  const messages = await listCapturedMail({ limit: 200 });
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-semibold">Outgoing mail</h1>
      <p className="text-sm text-muted">
        {usesMailCapture()
          ? "No SMTP relay is configured, so every message the app sends is kept here instead of being delivered."
          : "An SMTP relay is configured; messages kept earlier by the local capture are listed here."}
      </p>
      {messages.length === 0 ? (
        <p className="card text-sm">No messages yet.</p>
      ) : (
        <ScrollRegion label="Captured mail" className="card p-0">
          <table className="table">
            <thead>
              <tr>
                <th scope="col">Received</th>
                <th scope="col">To</th>
                <th scope="col">Subject</th>
              </tr>
            </thead>
            <tbody>
              {messages.map((m) => (
                <tr key={m.id}>
                  <td className="whitespace-nowrap">
                    <DateTime value={m.receivedAt} />
                  </td>
                  <td>{m.toAddresses.join(", ")}</td>
                  <td>
                    <Link href={`/admin/mail/${m.id}`}>{m.subject}</Link>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      )}
    </div>
  );
}
