"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { protectedAction } from "@/lib/auth/action";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { idFor } from "@/lib/ids";
import { changePassword, unlinkOrcidWithPassword } from "@/lib/users/accounts";
import { requestPasswordChoice } from "@/lib/users/orcid-accounts";
import { createApiToken, revokeApiToken, setProfileListed, updateProfile } from "@/lib/users/queries";
import { changePasswordSchema, createTokenSchema, profileListingSchema, profileSchema, unlinkOrcidSchema } from "@/lib/users/schemas";

export const updateProfileAction = protectedAction(profileSchema, { permission: "account.update" }, async (input, user) => {
  await updateProfile({ userId: user.id, ...input });
  revalidatePath("/", "layout");
  return { status: "ok", message: "Profile saved." };
});

export const changePasswordAction = protectedAction(
  changePasswordSchema,
  { permission: "account.update" },
  async ({ current, password }, user) => {
    await changePassword({ userId: user.id, current, password });
    // A new password ends every session of the person, this one included: the header must say so too.
    revalidatePath("/", "layout");
    redirect("/sign-in?reset=1");
  },
);

export const createTokenAction = protectedAction(createTokenSchema, { permission: "token.manage" }, async ({ name, scopes }, user) => {
  // A token never carries more than its holder may do: the admin scope is for admins only.
  if (scopes.includes("admin") && !can(user.role, "user.manage")) {
    throw new AppError("forbidden", "Only admins may create tokens with the admin scope", [
      { pointer: "/scopes", message: "the admin scope is for admins" },
    ]);
  }
  const { secret } = await createApiToken({ userId: user.id, name, scopes });
  revalidatePath("/settings");
  return { status: "ok", message: "Token created. Copy it now: it will not be shown again.", data: { secret } };
});

export const revokeTokenAction = protectedAction(
  z.object({ tokenId: idFor("token") }),
  { permission: "token.manage" },
  async ({ tokenId }, user) => {
    // Ownership: revokeApiToken only matches the person's own tokens.
    await revokeApiToken({ userId: user.id, tokenId });
    revalidatePath("/settings");
    return { status: "ok", message: "Token revoked." };
  },
);

export const unlinkOrcidAction = protectedAction(unlinkOrcidSchema, { permission: "account.update" }, async ({ current }, user) => {
  await unlinkOrcidWithPassword({ userId: user.id, current });
  revalidatePath("/settings");
  return { status: "ok", message: "ORCID unlinked. Your datasets no longer show your iD as verified." };
});

export const requestPasswordChoiceAction = protectedAction(z.object({}), { permission: "account.update" }, async (_input, user) => {
  await requestPasswordChoice({ userId: user.id });
  return { status: "ok", message: `We have e-mailed ${user.email} a link to choose a password.` };
});

export const setProfileListedAction = protectedAction(profileListingSchema, { permission: "account.update" }, async ({ listed }, user) => {
  await setProfileListed({ userId: user.id, listed });
  revalidatePath("/settings");
  revalidatePath("/people");
  return { status: "ok", message: listed ? "Your profile is listed on the people page." : "Your profile is no longer listed." };
});
