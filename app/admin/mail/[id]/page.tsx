import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { DateTime } from "@/components/date-time";
import { requirePagePermission } from "@/lib/auth/page-guard";
import { parseIdOrNull } from "@/lib/ids";
import { getCapturedMail } from "@/lib/mail/queries";

export const metadata: Metadata = { title: "Message" };

/** Splits plain text into text and clickable http(s) links. */
function linkify(text: string) {
  return text.split(/(https?:\/\/[^\s<>"]*[^\s<>".,;:!?)\]])/g).map((part, i) =>
    /^https?:\/\//.test(part) ? (
      <a key={i} href={part} className="break-all">
        {part}
      </a>
    ) : (
      <span key={i}>{part}</span>
    ),
  );
}

export default async function MailMessagePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requirePagePermission("mail.read", `/admin/mail/${id}`);
  const numeric = parseIdOrNull(id);
  const message = numeric !== null ? await getCapturedMail({ id: numeric }) : null;
  if (!message) notFound();
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/admin/mail">← All messages</Link>
      </p>
      <article className="card space-y-4">
        <h1 className="text-2xl font-semibold">{message.subject}</h1>
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-muted">From</dt>
          <dd>{message.fromAddress}</dd>
          <dt className="text-muted">To</dt>
          <dd>{message.toAddresses.join(", ")}</dd>
          <dt className="text-muted">Received</dt>
          <dd>
            <DateTime value={message.receivedAt} />
          </dd>
        </dl>
        <div className="whitespace-pre-wrap border-t border-line pt-4 text-sm leading-relaxed">{linkify(message.text ?? "")}</div>
        {message.html && (
          <details className="border-t border-line pt-4 text-sm">
            <summary className="cursor-pointer">Show the HTML version</summary>
            {/* Sandboxed: the message's HTML can neither run scripts nor reach this page. */}
            <iframe
              title="HTML version of the message"
              sandbox="allow-popups allow-popups-to-escape-sandbox"
              srcDoc={`<base target="_blank">${message.html}`}
              className="mt-3 h-96 w-full rounded-md border border-line bg-white"
            />
          </details>
        )}
      </article>
    </div>
  );
}
