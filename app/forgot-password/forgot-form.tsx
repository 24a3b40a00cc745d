"use client";

import { EmailRequestForm } from "@/components/email-request-form";
import { forgotPasswordAction } from "./actions";

export function ForgotForm() {
  return <EmailRequestForm action={forgotPasswordAction} button="Send me a link" />;
}
