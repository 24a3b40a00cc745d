"use client";

import { EmailRequestForm } from "@/components/email-request-form";
import { resendConfirmationAction } from "./actions";

export function ResendForm({ email }: { email?: string }) {
  return <EmailRequestForm action={resendConfirmationAction} button="Send me a new confirmation link" email={email} />;
}
