"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button type="button" className="btn-secondary py-1" onClick={() => signOut({ callbackUrl: "/" })}>
      Sign out
    </button>
  );
}
