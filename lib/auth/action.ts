import "server-only";
import type { z } from "zod";
import { AppError, storageRefusal } from "@/lib/errors";
import { describeUnstorableText } from "@/lib/storable-text";
import type { UserDto } from "@/lib/users/queries";
import { notFoundFromIssues } from "@/lib/ids";
import { zodToFieldErrors } from "./api";
import { assertAllowed } from "./guard";
import type { Permission } from "./permissions";
import { getCurrentUser } from "./session";

import type { ActionState } from "./action-state";

export type { ActionState };

type Body<S extends z.ZodType> = (input: z.infer<S>, user: UserDto) => Promise<ActionState | void>;
type PublicBody<S extends z.ZodType> = (input: z.infer<S>) => Promise<ActionState | void>;

function formToObject(formData: FormData): Record<string, FormDataEntryValue | FormDataEntryValue[]> {
  const out: Record<string, FormDataEntryValue | FormDataEntryValue[]> = {};
  for (const key of new Set(formData.keys())) {
    if (key.startsWith("$ACTION")) continue;
    const all = formData.getAll(key);
    out[key] = all.length > 1 ? all : all[0];
  }
  return out;
}

/**
 * What the person typed, sent back with an error: React resets a form after its action, and
 * fields show these values instead of going blank. Secrets are never echoed.
 */
function echoValues(formData: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, value] of formData.entries()) {
    if (key.startsWith("$ACTION") || typeof value !== "string" || /password|confirm|current|token|secret/i.test(key)) continue;
    out[key] = value;
  }
  return out;
}

function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) out[issue.path.join(".") || "form"] ??= issue.message;
  return out;
}

/** Fields holding text PostgreSQL cannot store (U+0000, lone surrogates): refused, never stripped. */
function unstorableFields(formData: FormData): Record<string, string> | null {
  let out: Record<string, string> | null = null;
  for (const [key, value] of formData.entries()) {
    const why = describeUnstorableText(key) ?? describeUnstorableText(typeof value === "string" ? value : value.name);
    if (why) (out ??= {})[key] = `This text ${why}.`;
  }
  return out;
}

function toState(err: unknown, formData?: FormData): ActionState {
  err = storageRefusal(err) ?? err;
  if (err instanceof AppError) {
    return {
      status: "error",
      message: err.message,
      fieldErrors: Object.fromEntries(err.errors.map((e) => [e.pointer.replace(/^\//, ""), e.message])),
      values: formData ? echoValues(formData) : undefined,
    };
  }
  // Next's redirect()/notFound() work by throwing: let them through.
  if (err && typeof err === "object" && "digest" in err) throw err;
  console.error("[action] failed", err);
  return { status: "error", message: "Something went wrong on our side; it has been logged." };
}

/** Server action for signed-in people: session → zod → permission → body → error mapping. */
export function protectedAction<S extends z.ZodType>(schema: S, options: { permission: Permission }, body: Body<S>) {
  return async (_prev: ActionState, formData: FormData): Promise<ActionState> => {
    // Anyone can post any arguments to an action's id: a form action takes form data only.
    if (!(formData instanceof FormData)) return { status: "error", message: "This form was sent in a shape it does not accept." };
    try {
      const user = await getCurrentUser();
      if (!user) throw new AppError("unauthenticated", "Your session has ended; sign in again");
      const unstorable = unstorableFields(formData);
      if (unstorable)
        return { status: "error", message: "Please correct the marked fields.", fieldErrors: unstorable, values: echoValues(formData) };
      const parsed = schema.safeParse(formToObject(formData));
      if (!parsed.success) {
        const missing = notFoundFromIssues(parsed.error);
        if (missing) throw missing;
        return {
          status: "error",
          message: "Please correct the marked fields.",
          fieldErrors: fieldErrors(parsed.error),
          values: echoValues(formData),
        };
      }
      assertAllowed(user, { permission: options.permission });
      return (await body(parsed.data, user)) ?? { status: "ok" };
    } catch (err) {
      return toState(err, formData);
    }
  };
}

/** Server action open to anyone (sign-up, password reset): zod → body → error mapping. */
export function publicAction<S extends z.ZodType>(schema: S, body: PublicBody<S>) {
  return async (_prev: ActionState, formData: FormData): Promise<ActionState> => {
    // Anyone can post any arguments to an action's id: a form action takes form data only.
    if (!(formData instanceof FormData)) return { status: "error", message: "This form was sent in a shape it does not accept." };
    try {
      const unstorable = unstorableFields(formData);
      if (unstorable)
        return { status: "error", message: "Please correct the marked fields.", fieldErrors: unstorable, values: echoValues(formData) };
      const parsed = schema.safeParse(formToObject(formData));
      if (!parsed.success)
        return {
          status: "error",
          message: "Please correct the marked fields.",
          fieldErrors: fieldErrors(parsed.error),
          values: echoValues(formData),
        };
      return (await body(parsed.data)) ?? { status: "ok" };
    } catch (err) {
      return toState(err, formData);
    }
  };
}

/**
 * Server action called with arguments rather than a form (the deposit editor): session → zod on
 * the arguments → permission → body. Throws AppError (bad arguments are a 422 with pointers);
 * the caller turns it into its result type.
 */
export function protectedCall<S extends z.ZodType, R>(
  schema: S,
  options: { permission: Permission },
  body: (input: z.infer<S>, user: UserDto) => Promise<R>,
) {
  return async (args: z.input<S>): Promise<R> => {
    const user = await getCurrentUser();
    if (!user) throw new AppError("unauthenticated", "Your session has ended; sign in again");
    const parsed = schema.safeParse(args);
    if (!parsed.success) {
      const missing = notFoundFromIssues(parsed.error);
      if (missing) throw missing;
      const errors = zodToFieldErrors(parsed.error);
      const first = errors[0];
      throw new AppError(
        "validation_failed",
        first ? `${first.message} (${first.pointer.slice(1) || "arguments"})` : "Invalid arguments",
        errors,
      );
    }
    assertAllowed(user, { permission: options.permission });
    return body(parsed.data, user);
  };
}
