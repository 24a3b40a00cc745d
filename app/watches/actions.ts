"use server";

import { revalidatePath } from "next/cache";
import { protectedAction, publicAction } from "@/lib/auth/action";
import { AppError } from "@/lib/errors";
import { addWatch, removeWatch, removeWatchById, setDailyDigest } from "@/lib/watches/queries";
import { dailyDigestSchema, removeWatchSchema, stopWatchSchema, toggleWatchSchema } from "@/lib/watches/schemas";
import { readStopToken } from "@/lib/watches/token";

/** Watch or stop watching a reaction, species or dataset from its page. */
export const toggleWatchAction = protectedAction(toggleWatchSchema, { permission: "watch.manage" }, async (input, user) => {
  const { watch, ...subject } = input;
  if (watch === "1") await addWatch({ userId: user.id, subject });
  else await removeWatch({ userId: user.id, subject });
  revalidatePath("/watches");
  return {
    status: "ok",
    message: watch === "1" ? "You will hear of new and retracted versions by mail." : "You no longer watch this.",
    data: { watching: watch },
  };
});

/** Ends one watch from the list of what one watches. */
export const removeWatchAction = protectedAction(removeWatchSchema, { permission: "watch.manage" }, async ({ watchId }, user) => {
  const stopped = await removeWatchById({ userId: user.id, watchId });
  revalidatePath("/watches");
  return stopped ? { status: "ok", message: "Stopped." } : { status: "error", message: "Nothing to stop: this is not on your list." };
});

export const dailyDigestAction = protectedAction(dailyDigestSchema, { permission: "watch.manage" }, async ({ dailyDigest }, user) => {
  await setDailyDigest({ userId: user.id, dailyDigest: dailyDigest === "1" });
  revalidatePath("/watches");
  return { status: "ok", message: dailyDigest === "1" ? "You will get one mail a day." : "You will get a mail for each change." };
});

/** The stop link of a mail: no sign-in needed, the signed token names the one watch it ends. */
export const stopWatchAction = publicAction(stopWatchSchema, async ({ token }) => {
  const named = readStopToken(token);
  if (!named)
    throw new AppError("validation_failed", "This stop link is not valid (it may have been cut short or altered).", [
      { pointer: "/token", message: "not a valid stop link" },
    ]);
  await removeWatchById({ userId: named.userId, watchId: named.watchId });
  return { status: "ok", message: "Done: you no longer watch this, and you will get no more mail about it." };
});
