import type { Metadata } from "next";
import { ForgotForm } from "./forgot-form";

export const metadata: Metadata = { title: "Forgot your password" };

export default function ForgotPasswordPage() {
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Forgot your password?</h1>
      <p className="text-sm text-muted">Give the address you registered with; we will e-mail a link to choose a new password.</p>
      <div className="card">
        <ForgotForm />
      </div>
    </div>
  );
}
