"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { protectedAction } from "@/lib/auth/action";
import { queues } from "@/lib/jobs/boss";
import { retryJob } from "@/lib/jobs/queries";

/** Puts a failed job back in its queue (admins). */
export const retryJobAction = protectedAction(
  z.object({ queue: z.enum(queues), id: z.string().uuid() }),
  { permission: "job.manage" },
  async ({ queue, id }, admin) => {
    await retryJob({ actorId: admin.id, queue, id });
    revalidatePath("/admin/jobs");
    return { status: "ok", message: "Job queued again." };
  },
);
