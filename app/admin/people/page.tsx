import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/page-guard";
import { listUsers } from "@/lib/users/queries";
import { ActiveForm, RoleForm } from "./people-controls";
import { ScrollRegion } from "@/components/scroll-region";

export const metadata: Metadata = { title: "People" };

export default async function PeoplePage() {
  const admin = await requirePagePermission("user.list", "/admin/people");
  const people = await listUsers();
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-semibold">People</h1>
      <p className="text-sm text-muted">Every role change and deactivation is written to the audit trail.</p>
      <ScrollRegion label="People and roles" className="card p-0">
        <table className="table">
          <thead>
            <tr>
              <th scope="col">Name</th>
              <th scope="col">E-mail</th>
              <th scope="col">Confirmed</th>
              <th scope="col">Joined</th>
              <th scope="col">Role</th>
              <th scope="col">Account</th>
            </tr>
          </thead>
          <tbody>
            {people.map((p) => (
              <tr key={p.id} className={p.deactivatedAt ? "text-muted" : undefined}>
                <td>
                  {p.name}
                  {p.affiliation && <div className="text-xs text-muted">{p.affiliation}</div>}
                </td>
                <td>{p.email}</td>
                <td>{p.emailVerifiedAt ? "yes" : "not yet"}</td>
                <td className="whitespace-nowrap">{p.createdAt.toISOString().slice(0, 10)}</td>
                <td>
                  <RoleForm userId={p.id} role={p.role} name={p.name} />
                </td>
                <td>
                  {p.deactivatedAt && <div className="text-xs">deactivated</div>}
                  {p.id === admin.id ? (
                    <span className="text-xs text-muted">you</span>
                  ) : (
                    <ActiveForm userId={p.id} active={!p.deactivatedAt} name={p.name} />
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
    </div>
  );
}
