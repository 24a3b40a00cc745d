"use server";

import { redirect } from "next/navigation";
import { publicAction } from "@/lib/auth/action";
import { resetPassword } from "@/lib/users/accounts";
import { resetPasswordSchema } from "@/lib/users/schemas";

export const resetPasswordAction = publicAction(resetPasswordSchema, async ({ token, password }) => {
  await resetPassword({ secret: token, password });
  redirect("/sign-in?reset=1");
});
