import nodemailer, { type Transporter } from "nodemailer";
import { mailFrom, smtpUrl } from "@/lib/config";
import type { MailMessage } from "./templates";

let transporter: Transporter | undefined;

function getTransporter(): Transporter {
  transporter ??= nodemailer.createTransport(smtpUrl(), { from: mailFrom() });
  return transporter;
}

/** Hands one message to the SMTP relay (or the local capture server); throws when it refuses. */
export async function deliverMail(message: MailMessage): Promise<string> {
  const info = await getTransporter().sendMail({
    from: mailFrom(),
    to: message.to,
    subject: message.subject,
    text: message.text,
    html: message.html,
    ...(message.headers ? { headers: message.headers } : {}),
  });
  return info.messageId;
}

/**
 * A refusal the relay will repeat on every attempt: an SMTP 5xx reply (RFC 5321 §4.2.1, e.g. 550
 * mailbox unavailable). 4xx replies and network failures are temporary and worth retrying.
 */
export function isPermanentDeliveryFailure(err: unknown): boolean {
  const code = (err as { responseCode?: unknown } | null)?.responseCode;
  return typeof code === "number" && code >= 500 && code < 600;
}
