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
  const info = await getTransporter().sendMail({ from: mailFrom(), to: message.to, subject: message.subject, text: message.text, html: message.html });
  return info.messageId;
}
