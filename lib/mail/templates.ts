import { appUrl } from "@/lib/config";

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html: string;
  /** Extra header lines (List-Unsubscribe of a notification). */
  headers?: Record<string, string>;
}

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

/** Plain layout shared by every message: a greeting, paragraphs, one action link. */
export function compose(
  to: string,
  subject: string,
  name: string,
  paragraphs: string[],
  action?: { label: string; url: string },
): MailMessage {
  // A name is one line: whatever breaks it cannot add lines of its own to the message.
  name = name.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]+/g, " ").trim();
  const text = [
    `Hello ${name},`,
    "",
    ...paragraphs.flatMap((p) => [p, ""]),
    ...(action ? [`${action.label}: ${action.url}`, ""] : []),
    "— Arrhenia",
  ].join("\n");
  const html = `<!doctype html><html><body style="font-family:system-ui,sans-serif;line-height:1.5;color:#1b2430">
<p>Hello ${escapeHtml(name)},</p>
${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("\n")}
${action ? `<p><a href="${escapeHtml(action.url)}">${escapeHtml(action.label)}</a></p><p style="font-size:12px;color:#4a5563">${escapeHtml(action.url)}</p>` : ""}
<p>— Arrhenia</p></body></html>`;
  return { to, subject, text, html };
}

export function verificationMail(to: string, name: string, secret: string): MailMessage {
  return compose(
    to,
    "Confirm your e-mail address for Arrhenia",
    name,
    [
      "Someone (we hope you) created an Arrhenia account with this address. Confirm it to start depositing datasets.",
      "The link works once and expires in 48 hours.",
    ],
    { label: "Confirm my address", url: `${appUrl()}/verify?token=${encodeURIComponent(secret)}` },
  );
}

/**
 * The confirmation link of a first ORCID sign-up. It names the iD, since whoever typed this address
 * at the sign-up need not own it: the link confirms only in the browser that signed in with ORCID,
 * and anywhere else offers to take the iD off the address.
 */
export function orcidVerificationMail(to: string, name: string, orcid: string, secret: string): MailMessage {
  return compose(
    to,
    "Confirm your e-mail address for Arrhenia (ORCID sign-in)",
    name,
    [
      `This address was given when someone signed in to Arrhenia with the ORCID iD ${orcid} (https://orcid.org/${orcid}) and asked for an account.`,
      "If that was you, open the link below in the same browser you signed in with, and confirm. The link works once and expires in 48 hours.",
      'If it was not you, do not confirm: open the link and choose "This was not me", and the iD will no longer be tied to your address.',
    ],
    { label: "Confirm or refuse", url: `${appUrl()}/verify?token=${encodeURIComponent(secret)}` },
  );
}

export function passwordResetMail(to: string, name: string, secret: string): MailMessage {
  return compose(
    to,
    "Choose a new Arrhenia password",
    name,
    [
      "A new password was requested for your Arrhenia account. If it was not you, ignore this message: your password stays as it is.",
      "The link works once and expires in one hour.",
    ],
    { label: "Choose a new password", url: `${appUrl()}/reset-password?token=${encodeURIComponent(secret)}` },
  );
}

/** For an account made through ORCID, which has no password yet (it needs one before ORCID can be unlinked). */
export function choosePasswordMail(to: string, name: string, secret: string): MailMessage {
  return compose(
    to,
    "Choose a password for Arrhenia",
    name,
    [
      "You asked for a password for your Arrhenia account, which you made by signing in with ORCID. With a password you can also sign in with your e-mail address, and unlink ORCID.",
      "The link works once and expires in one hour.",
    ],
    { label: "Choose a password", url: `${appUrl()}/reset-password?token=${encodeURIComponent(secret)}` },
  );
}

export function signInLinkMail(to: string, name: string, secret: string): MailMessage {
  return compose(
    to,
    "Your Arrhenia sign-in link",
    name,
    [
      "Sign-in to your Arrhenia account is paused after many failed attempts, and someone (we hope you) has just typed the right password. Use this link to sign in.",
      "The link works once and expires in 30 minutes. If it was not you, change your password: someone knows it.",
    ],
    { label: "Sign in", url: `${appUrl()}/sign-in/link?token=${encodeURIComponent(secret)}` },
  );
}

export function existingAccountMail(to: string, name: string): MailMessage {
  return compose(
    to,
    "You already have an Arrhenia account",
    name,
    [
      "Someone tried to create a new Arrhenia account with this address, which already has one. If it was you, sign in, or choose a new password if you have forgotten it.",
    ],
    { label: "Forgot my password", url: `${appUrl()}/forgot-password` },
  );
}

export function submissionMail(to: string, name: string, title: string, versionId: number): MailMessage {
  return compose(to, `Waiting for review: ${title}`, name, [`A dataset was submitted and waits for a curator: “${title}”.`], {
    label: "Open the review",
    url: `${appUrl()}/review/${versionId}`,
  });
}

/** To a curator who returned a version, when its authors submit it again: their reason and the authors' reply. */
export function resubmissionMail(to: string, name: string, title: string, versionId: number, reason: string, reply: string): MailMessage {
  return compose(
    to,
    `Back for review after your return: ${title}`,
    name,
    [`The authors of “${title}” revised it and submitted it again.`, `Your reason for returning it: ${reason}`, `Their reply: ${reply}`],
    { label: "Open the review, with the changes since the last submission", url: `${appUrl()}/review/${versionId}` },
  );
}

const decisionWords = {
  accept: "was accepted and is now published",
  return: "was returned to you for revision before it can be published",
  decline: "was declined",
  retract: "was retracted",
} as const;

const decisionSubjects = { accept: "accepted", return: "returned for revision", decline: "declined", retract: "retracted" } as const;

/** To each co-editor after a decision; an accepted version links its public page and identifier. */
export function decisionMail(
  to: string,
  name: string,
  title: string,
  versionId: number,
  decision: keyof typeof decisionWords,
  reason: string,
  published?: { identifier: string; path: string },
): MailMessage {
  const lines = [`Your dataset “${title}” ${decisionWords[decision]}.`, `The curator's reason: ${reason}`];
  if (published) lines.push(`Its version identifier is doi:${published.identifier}; cite this version with it.`);
  return compose(to, `Decision on “${title}”: ${decisionSubjects[decision]}`, name, lines, {
    label: published ? "Open the published version" : "Open the dataset",
    url: published ? `${appUrl()}${published.path}` : `${appUrl()}/deposits/${versionId}`,
  });
}

export function invitationMail(
  to: string,
  name: string,
  inviter: string,
  title: string,
  role: "editor" | "viewer",
  secret: string,
): MailMessage {
  return compose(
    to,
    `${inviter} invites you to ${role === "editor" ? "co-edit" : "read"} a dataset on Arrhenia`,
    name,
    [
      `${inviter} invites you to ${role === "editor" ? "work on" : "read"} the dataset “${title}” as ${role === "editor" ? "an editor" : "a viewer"}.`,
      "Sign in (or create an account with this address) and open the link. It works once, for 7 days.",
    ],
    { label: "Accept the invitation", url: `${appUrl()}/invitations/accept?token=${encodeURIComponent(secret)}` },
  );
}

/** To the dataset's owner (and the sender) when an invitation is accepted. */
export function invitationAcceptedMail(
  to: string,
  name: string,
  who: string,
  whoEmail: string,
  title: string,
  role: "owner" | "editor" | "viewer",
  versionId: number | null,
): MailMessage {
  return compose(
    to,
    `${who} joined “${title}”`,
    name,
    [`${who} (${whoEmail}) accepted your invitation and is now ${role === "editor" ? "an editor" : "a viewer"} of “${title}”.`],
    versionId ? { label: "Open the dataset", url: `${appUrl()}/deposits/${versionId}` } : undefined,
  );
}
