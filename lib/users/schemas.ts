import { z } from "zod";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password";
import { normaliseOrcid } from "@/lib/auth/orcid";
import { idFor } from "@/lib/ids";

// Shared by forms, server actions and (later) the REST API. FormData values are strings.

export const emailField = z
  .string()
  .trim()
  .toLowerCase()
  .max(320, "An e-mail address has at most 320 characters")
  .email("Enter an e-mail address like name@example.org");

/** A person's name: one line of at most 200 characters (it is printed in mail and on pages). */
export const personNameField = z
  .string()
  .trim()
  .min(1, "Enter your name")
  .max(200, "Use at most 200 characters")
  .refine((v) => !/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/.test(v), "A name is one line: remove line breaks, tabs and control characters")
  // Direction overrides and isolates turn how a name reads around ("Eve\u202Egnp.exe").
  .refine((v) => !/[\u202a-\u202e\u2066-\u2069]/.test(v), "Remove the invisible direction-changing characters from the name")
  .refine((v) => /[\p{L}\p{N}]/u.test(v), "A name needs at least one letter");

export const passwordField = z
  .string()
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters`)
  .max(200, "Use at most 200 characters");

export const orcidField = z
  .string()
  .max(100, "An ORCID iD has 19 characters")
  .trim()
  .transform((v, ctx) => {
    if (v === "") return null;
    const id = normaliseOrcid(v);
    if (!id) {
      ctx.addIssue({ code: "custom", message: "Not a valid ORCID iD: expected 0000-0000-0000-000X with a correct check digit" });
      return z.NEVER;
    }
    return id;
  });

export const signUpSchema = z
  .object({
    name: personNameField,
    email: emailField,
    password: passwordField,
    confirm: z.string().max(200),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

export const profileSchema = z.object({
  name: personNameField,
  affiliation: z
    .string()
    .trim()
    .max(300)
    .transform((v) => v || null),
  orcid: orcidField,
});

export const changePasswordSchema = z
  .object({ current: z.string().min(1, "Enter your current password").max(200), password: passwordField, confirm: z.string().max(200) })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

export const unlinkOrcidSchema = z.object({ current: z.string().min(1, "Enter your password").max(200, "Use at most 200 characters") });

export const forgotPasswordSchema = z.object({ email: emailField });

export const resetPasswordSchema = z
  .object({ token: z.string().min(10).max(512), password: passwordField, confirm: z.string().max(200) })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

/** A personal token's scopes, as /docs/api publishes them (drizzle/0027 renamed the stored ones). */
export const apiTokenScopes = ["deposit:read", "deposit:write", "admin"] as const;
export type ApiTokenScope = (typeof apiTokenScopes)[number];

export const createTokenSchema = z.object({
  name: z.string().trim().min(1, "Name the token, e.g. the script that uses it").max(100),
  scopes: z
    .union([z.string(), z.array(z.string())])
    .optional()
    .transform((v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]))
    .pipe(z.array(z.enum(apiTokenScopes)).min(1, "Choose at least one scope")),
});

export const roleChangeSchema = z.object({
  userId: idFor("person"),
  role: z.enum(["researcher", "curator", "admin"]),
});

export const activeChangeSchema = z.object({
  userId: idFor("person"),
  active: z.enum(["true", "false"]).transform((v) => v === "true"),
});

/** The body of PATCH /api/v1/users/:id (the route and the API document share it). */
export const userPatchSchema = z
  .object({ role: z.enum(["researcher", "curator", "admin"]).optional(), active: z.boolean().optional() })
  .strict()
  .refine((v) => v.role !== undefined || v.active !== undefined, { message: "Give `role`, `active`, or both" });

/** The confirmation page of a first ORCID sign-in: the name and address the new account gets, and the signed ticket. */
export const orcidSignUpSchema = z.object({
  name: personNameField,
  email: emailField,
});

export const profileListingSchema = z.object({
  listed: z
    .enum(["on"])
    .optional()
    .transform((v) => v === "on"),
});
