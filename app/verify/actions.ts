"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { publicAction } from "@/lib/auth/action";
import { orcidBrowserKeyHash } from "@/lib/auth/orcid-browser";
import { refuseOrcidSignUp, verifyEmail } from "@/lib/users/accounts";

const linkSchema = z.object({ token: z.string().min(10, "This link is incomplete").max(512, "This link is not one of ours") });

export const verifyAction = publicAction(linkSchema, async ({ token }) => {
  const outcome = await verifyEmail({ secret: token, browserKeyHash: orcidBrowserKeyHash });
  if (outcome.kind === "other_browser") {
    return {
      status: "error",
      message: `This address cannot be confirmed in this browser: it was given when someone signed in with the ORCID iD ${outcome.orcid} in another one. If that was you, open the link in the browser you signed in with (or sign in with ORCID again in this one). If it was not you, choose "This was not me".`,
      data: { orcid: outcome.orcid },
    };
  }
  redirect(outcome.orcidOnly ? "/sign-in?verified=orcid" : "/sign-in?verified=1");
});

export const refuseOrcidAction = publicAction(linkSchema, async ({ token }) => {
  const { orcid } = await refuseOrcidSignUp({ secret: token });
  return {
    status: "ok",
    message: `Done: that sign-up is cancelled. The ORCID iD ${orcid} is not tied to your address, no link sent for it works any more, and the address is free — you can make an account with it whenever you like.`,
  };
});
