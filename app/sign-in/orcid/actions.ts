"use server";

import { headers } from "next/headers";
import { publicAction } from "@/lib/auth/action";
import { clientAddress } from "@/lib/auth/client-address";
import { keepOrcidBrowserKey, newOrcidBrowserKey, orcidTicketFromCookie } from "@/lib/auth/orcid-browser";
import { TICKET_REFUSED } from "@/lib/auth/orcid-ticket";
import { AppError } from "@/lib/errors";
import { confirmOrcidSignUp } from "@/lib/users/orcid-accounts";
import { orcidSignUpSchema } from "@/lib/users/schemas";

export const confirmOrcidSignUpAction = publicAction(orcidSignUpSchema, async ({ name, email }) => {
  const ticket = await orcidTicketFromCookie();
  if (!ticket) throw new AppError("validation_failed", TICKET_REFUSED, [{ pointer: "/ticket", message: TICKET_REFUSED }]);
  const browser = newOrcidBrowserKey();
  await confirmOrcidSignUp({ ticket, name, email, ip: clientAddress(await headers()), browserKeyHash: browser.hash });
  // Only this browser can then confirm the address (whoever owns the address may be someone else).
  // The ticket's cookie stays until it expires (a used ticket is refused by the database): setting a
  // cookie re-renders this page, which must still show the form's answer.
  await keepOrcidBrowserKey(browser.key);
  return {
    status: "ok",
    message: `We have sent a confirmation link to ${email}. Open it in this browser to confirm your address, then sign in with ORCID again (check spam if it does not arrive within a few minutes).`,
  };
});
