"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { protectedAction } from "@/lib/auth/action";
import { acceptInvitation } from "@/lib/datasets/invitations";

export const acceptInvitationAction = protectedAction(
  z.object({ token: z.string().min(10).max(512) }),
  { permission: "dataset.deposit" },
  async ({ token }, user) => {
    const { versionId } = await acceptInvitation({ actor: user, secret: token });
    redirect(versionId ? `/deposits/${versionId}` : "/deposits");
  },
);
