"use server";

import { headers } from "next/headers";
import { publicAction } from "@/lib/auth/action";
import { clientAddress } from "@/lib/auth/client-address";
import { requestConfirmationLink } from "@/lib/users/accounts";
import { forgotPasswordSchema } from "@/lib/users/schemas";

export const resendConfirmationAction = publicAction(forgotPasswordSchema, async ({ email }) => {
  await requestConfirmationLink({ email, ip: clientAddress(await headers()) });
  // The same answer whether or not the address has an account waiting for confirmation.
  return {
    status: "ok",
    message: `If ${email} belongs to an account waiting for confirmation, a new confirmation link is on its way. Earlier links still work until they expire.`,
  };
});
