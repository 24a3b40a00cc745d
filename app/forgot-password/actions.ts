"use server";

import { headers } from "next/headers";
import { publicAction } from "@/lib/auth/action";
import { clientAddress } from "@/lib/auth/client-address";
import { requestPasswordReset } from "@/lib/users/accounts";
import { forgotPasswordSchema } from "@/lib/users/schemas";

export const forgotPasswordAction = publicAction(forgotPasswordSchema, async ({ email }) => {
  await requestPasswordReset({ email, ip: clientAddress(await headers()) });
  // The same answer whether or not the address has an account.
  return {
    status: "ok",
    message: `If ${email} belongs to an account, a link to choose a new password is on its way. It works once, for one hour.`,
  };
});
