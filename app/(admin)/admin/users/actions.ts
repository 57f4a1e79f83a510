"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { createUserAccount, setUserRole } from "@/lib/db/queries/users";
import { newUserInput, roleChangeInput } from "@/lib/validations/users";

export const createUserAction = defineAction("user.manage", newUserInput, async (input, user) => {
  const created = await createUserAccount(input, { id: user.id, name: user.name });
  revalidatePath("/admin/users");
  return created;
});

export const setUserRoleAction = defineAction("user.manage", roleChangeInput, async (input, user) => {
  await setUserRole(input.userId, input.role, { id: user.id, name: user.name });
  revalidatePath("/admin/users");
  return { userId: input.userId, role: input.role };
});
