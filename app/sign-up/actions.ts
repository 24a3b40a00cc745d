"use server";

import { headers } from "next/headers";
import { publicAction } from "@/lib/auth/action";
import { clientAddress } from "@/lib/auth/client-address";
import { signUp } from "@/lib/users/accounts";
import { signUpSchema } from "@/lib/users/schemas";

export const signUpAction = publicAction(signUpSchema, async ({ name, email, password }) => {
  await signUp({ name, email, password, ip: clientAddress(await headers()) });
  return {
    status: "ok",
    message: `We have sent a confirmation link to ${email}. Open it to finish creating your account (check spam if it does not arrive within a few minutes).`,
  };
});
