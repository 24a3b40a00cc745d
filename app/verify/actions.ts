"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { publicAction } from "@/lib/auth/action";
import { verifyEmail } from "@/lib/users/accounts";

export const verifyAction = publicAction(
  z.object({ token: z.string().min(10, "This link is incomplete").max(512, "This link is not one of ours") }),
  async ({ token }) => {
    await verifyEmail({ secret: token });
    redirect("/sign-in?verified=1");
  },
);
