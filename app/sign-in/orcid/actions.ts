"use server";

import { headers } from "next/headers";
import { publicAction } from "@/lib/auth/action";
import { clientAddress } from "@/lib/auth/client-address";
import { keepOrcidBrowserKey, newOrcidBrowserKey } from "@/lib/auth/orcid-browser";
import { confirmOrcidSignUp } from "@/lib/users/orcid-accounts";
import { orcidSignUpSchema } from "@/lib/users/schemas";

export const confirmOrcidSignUpAction = publicAction(orcidSignUpSchema, async ({ ticket, name, email }) => {
  const browser = newOrcidBrowserKey();
  await confirmOrcidSignUp({ ticket, name, email, ip: clientAddress(await headers()), browserKeyHash: browser.hash });
  // Only this browser can then confirm the address (whoever owns the address may be someone else).
  await keepOrcidBrowserKey(browser.key);
  return {
    status: "ok",
    message: `We have sent a confirmation link to ${email}. Open it in this browser to confirm your address, then sign in with ORCID again (check spam if it does not arrive within a few minutes).`,
  };
});
