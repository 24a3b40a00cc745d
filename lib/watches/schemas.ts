import { z } from "zod";
import { idFor } from "@/lib/ids";
import type { WatchSubject } from "./queries";

/** A watch form's subject: a reaction, dataset or collection by id, a species by InChIKey. */
export const watchSubjectSchema = z
  .discriminatedUnion("kind", [
    z.object({ kind: z.literal("reaction"), id: idFor("reaction") }),
    z.object({ kind: z.literal("dataset"), id: idFor("dataset") }),
    z.object({ kind: z.literal("collection"), id: idFor("collection") }),
    z.object({ kind: z.literal("species"), inchiKey: z.string().regex(/^[A-Z]{14}-[A-Z]{10}-[A-Z]$/, "not an InChIKey") }),
  ])
  .transform((s): WatchSubject => s);

export const toggleWatchSchema = z.intersection(watchSubjectSchema, z.object({ watch: z.enum(["1", "0"]) }));

export const stopWatchSchema = z.object({ token: z.string().min(1, "the link has no token").max(200) });

export const dailyDigestSchema = z.object({ dailyDigest: z.enum(["1", "0"]) });

export const removeWatchSchema = z.object({ watchId: idFor("watch") });
