// Environment configuration in one place. Every variable is listed in the README.

function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set; start the app with \`npm start\` or set it (see README, Configuration)`);
  return value;
}

export function databaseUrl(): string {
  return required("DATABASE_URL");
}

/** The public base URL used in links inside e-mails. */
export function appUrl(): string {
  return (process.env.APP_URL ?? process.env.NEXTAUTH_URL ?? `http://127.0.0.1:${process.env.PORT ?? 3000}`).replace(/\/$/, "");
}

/** SMTP relay; when unset, mail goes to the local capture server. */
export function smtpUrl(): string {
  return process.env.SMTP_URL || `smtp://127.0.0.1:${captureSmtpPort()}`;
}

export function captureSmtpPort(): number {
  return Number(process.env.MAIL_CAPTURE_PORT ?? 2525);
}

export function usesMailCapture(): boolean {
  return !process.env.SMTP_URL;
}

export function mailFrom(): string {
  return process.env.MAIL_FROM ?? "Arrhenia <no-reply@arrhenia.invalid>";
}
