"use server";

import { revalidatePath } from "next/cache";
import { protectedAction } from "@/lib/auth/action";
import { setAccountActive } from "@/lib/users/accounts";
import { changeUserRole } from "@/lib/users/queries";
import { activeChangeSchema, roleChangeSchema } from "@/lib/users/schemas";

export const changeRoleAction = protectedAction(roleChangeSchema, { permission: "user.manage" }, async ({ userId, role }, admin) => {
  await changeUserRole({ actorId: admin.id, userId, role });
  revalidatePath("/admin/people");
  // The form resets after the action: `values` keeps the new role selected.
  return { status: "ok", message: `Role changed to ${role}.`, values: { role } };
});

export const setActiveAction = protectedAction(activeChangeSchema, { permission: "user.manage" }, async ({ userId, active }, admin) => {
  await setAccountActive({ actorId: admin.id, userId, active });
  revalidatePath("/admin/people");
  return { status: "ok", message: active ? "Account reactivated." : "Account deactivated." };
});
