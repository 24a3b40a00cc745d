"use server";

import { headers } from "next/headers";
import { publicAction } from "@/lib/auth/action";
import { clientAddress } from "@/lib/auth/client-address";
import { confirmOrcidSignUp } from "@/lib/users/orcid-accounts";
import { orcidSignUpSchema } from "@/lib/users/schemas";

export const confirmOrcidSignUpAction = publicAction(orcidSignUpSchema, async ({ ticket, name, email }) => {
  await confirmOrcidSignUp({ ticket, name, email, ip: clientAddress(await headers()) });
  return {
    status: "ok",
    message: `We have sent a confirmation link to ${email}. Open it to confirm your address, then sign in with ORCID again (check spam if it does not arrive within a few minutes).`,
  };
});
