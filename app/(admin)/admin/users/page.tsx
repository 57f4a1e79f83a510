import type { Metadata } from "next";
import { forbidden } from "next/navigation";
import { PageTitle } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { can, isRole, roleLabels, roles } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { listUsers } from "@/lib/db/queries/users";
import { NewUserForm } from "./_components/new-user-form";
import { RoleForm } from "./_components/role-form";

export const metadata: Metadata = { title: "People" };

const roleOptions = roles.map((role) => ({ role, label: roleLabels[role] }));

export default async function PeoplePage() {
  const me = await currentUser();
  if (!me || !can(me.role, "user.manage")) forbidden();
  const users = await listUsers();

  return (
    <>
      <PageTitle kicker="Administration" title="People" />
      <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
        <div>
          <SimpleTable caption="People with an account" headers={headersOf("Name", "E-mail", "Role", "Account since")} boxed>
            {users.map((u) => (
              <tr key={u.id}>
                <th scope="row" className={`${cellClass()} text-left font-medium`}>
                  {u.name}
                  {u.id === me.id ? <span className="ml-1 font-normal text-ink-soft">(you)</span> : null}
                </th>
                <td className={cellClass()}>{u.email}</td>
                <td className={cellClass()}>
                  {u.id === me.id ? (
                    isRole(u.role) ? roleLabels[u.role] : u.role
                  ) : (
                    <RoleForm userId={u.id} name={u.name} role={u.role} options={roleOptions} />
                  )}
                </td>
                <td className={`${cellClass()} whitespace-nowrap tabular-nums`}>{u.createdAt.toLocaleDateString("en-CA")}</td>
              </tr>
            ))}
          </SimpleTable>
          <p className="mt-3 text-xs text-ink-soft">
            Your own role cannot be changed here, so the lab always keeps an administrator; another administrator can change it.
          </p>
        </div>
        <NewUserForm options={roleOptions} />
      </div>
    </>
  );
}
