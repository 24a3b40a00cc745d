import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";
import type postgres from "postgres";

function addresses(a: AddressObject | AddressObject[] | undefined): string[] {
  if (!a) return [];
  const list = Array.isArray(a) ? a : [a];
  return list.flatMap((x) => x.value.map((v) => v.address ?? "")).filter(Boolean);
}

/**
 * Local SMTP capture for development and tests: accepts every message on 127.0.0.1 and stores it
 * in `captured_mail`, where admins read it at /admin/mail. Never used when SMTP_URL is set.
 */
export async function startCaptureServer({ sql, port, host = "127.0.0.1" }: { sql: postgres.Sql; port: number; host?: string }) {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (mail) => {
          const to = addresses(mail.to);
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          const envelopeFrom = session.envelope.mailFrom;
          const from = mail.from?.text ?? (envelopeFrom ? envelopeFrom.address : "");
          const headers: Record<string, string> = {};
          for (const [k, v] of mail.headers) headers[k] = typeof v === "string" ? v : JSON.stringify(v);
          // The recipient list goes in as JSON and becomes text[] in the server: the driver's array
          // typing depends on a type cache that a fresh or restarted connection may not have yet.
          await sql`insert into captured_mail (message_id, from_address, to_addresses, subject, text, html, headers)
            values (${mail.messageId ?? null}, ${from},
                    array(select jsonb_array_elements_text(${sql.json(to.length ? to : envelopeTo)})), ${mail.subject ?? "(no subject)"},
                    ${mail.text ?? null}, ${typeof mail.html === "string" ? mail.html : null}, ${sql.json(headers)})`;
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => resolve());
  });
  return { close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}
