"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { protectedAction } from "@/lib/auth/action";
import { changePassword } from "@/lib/users/accounts";
import { createApiToken, revokeApiToken, updateProfile } from "@/lib/users/queries";
import { changePasswordSchema, createTokenSchema, profileSchema } from "@/lib/users/schemas";

export const updateProfileAction = protectedAction(profileSchema, { permission: "account.update" }, async (input, user) => {
  await updateProfile({ userId: user.id, ...input });
  revalidatePath("/", "layout");
  return { status: "ok", message: "Profile saved." };
});

export const changePasswordAction = protectedAction(changePasswordSchema, { permission: "account.update" }, async ({ current, password }, user) => {
  await changePassword({ userId: user.id, current, password });
  // A new password ends every session of the person, this one included.
  redirect("/sign-in?reset=1");
});

export const createTokenAction = protectedAction(createTokenSchema, { permission: "token.manage" }, async ({ name, scopes }, user) => {
  const { secret } = await createApiToken({ userId: user.id, name, scopes });
  revalidatePath("/settings");
  return { status: "ok", message: "Token created. Copy it now: it will not be shown again.", data: { secret } };
});

export const revokeTokenAction = protectedAction(z.object({ tokenId: z.coerce.number().int().positive() }), { permission: "token.manage" }, async ({ tokenId }, user) => {
  // Ownership: revokeApiToken only matches the person's own tokens.
  await revokeApiToken({ userId: user.id, tokenId });
  revalidatePath("/settings");
  return { status: "ok", message: "Token revoked." };
});
