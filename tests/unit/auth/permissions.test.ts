import { describe, expect, it } from "vitest";
import { assertAllowed } from "@/lib/auth/guard";
import { can, isPrivileged, permissions, type Permission } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";

// The expected table, written out by hand so a change to permissions.ts must be deliberate.
const expected: Record<Permission, { researcher: boolean; curator: boolean; admin: boolean }> = {
  "account.update": { researcher: true, curator: true, admin: true },
  "token.manage": { researcher: true, curator: true, admin: true },
  "watch.manage": { researcher: true, curator: true, admin: true },
  "dataset.deposit": { researcher: true, curator: true, admin: true },
  "dataset.review": { researcher: false, curator: true, admin: true },
  "mechanism.check": { researcher: true, curator: true, admin: true },
  "collection.manage": { researcher: true, curator: true, admin: true },
  "user.list": { researcher: false, curator: false, admin: true },
  "user.manage": { researcher: false, curator: false, admin: true },
  "mail.read": { researcher: false, curator: false, admin: true },
  "job.read": { researcher: false, curator: false, admin: true },
  "job.manage": { researcher: false, curator: false, admin: true },
};

describe("permission table", () => {
  it("lists exactly the expected actions", () => {
    expect(Object.keys(permissions).sort()).toEqual(Object.keys(expected).sort());
  });

  for (const [permission, byRole] of Object.entries(expected) as [Permission, (typeof expected)[Permission]][]) {
    for (const role of ["researcher", "curator", "admin"] as const) {
      it(`${role} ${byRole[role] ? "may" : "may not"} ${permission}`, () => {
        expect(can(role, permission)).toBe(byRole[role]);
      });
    }
  }

  it("denies everything to nobody", () => {
    for (const p of Object.keys(permissions) as Permission[]) expect(can(null, p)).toBe(false);
  });

  it("marks curator/admin-only actions as privileged (role re-read before mutations)", () => {
    expect(isPrivileged("dataset.review")).toBe(true);
    expect(isPrivileged("user.manage")).toBe(true);
    expect(isPrivileged("dataset.deposit")).toBe(false);
  });
});

describe("assertAllowed", () => {
  const researcher = { id: 1, role: "researcher" as const };
  const curator = { id: 2, role: "curator" as const };
  const admin = { id: 3, role: "admin" as const };

  function statusOf(fn: () => unknown): number | "allowed" {
    try {
      fn();
      return "allowed";
    } catch (err) {
      if (err instanceof AppError) return err.status;
      throw err;
    }
  }

  const cases: [string, () => unknown, number | "allowed"][] = [
    ["anonymous → 401", () => assertAllowed(null, { permission: "dataset.deposit" }), 401],
    ["anonymous, no permission needed → still 401", () => assertAllowed(null, {}), 401],
    ["researcher deposit → allowed", () => assertAllowed(researcher, { permission: "dataset.deposit" }), "allowed"],
    ["researcher review → 403", () => assertAllowed(researcher, { permission: "dataset.review" }), 403],
    ["researcher manage users → 403", () => assertAllowed(researcher, { permission: "user.manage" }), 403],
    ["curator manage users → 403", () => assertAllowed(curator, { permission: "user.manage" }), 403],
    ["admin manage users → allowed", () => assertAllowed(admin, { permission: "user.manage" }), "allowed"],
    ["owner of the record → allowed", () => assertAllowed(researcher, { permission: "dataset.deposit", ownerId: 1 }), "allowed"],
    ["someone else's record → 403", () => assertAllowed(researcher, { permission: "dataset.deposit", ownerId: 99 }), 403],
    [
      "curator override on someone else's record → allowed",
      () => assertAllowed(curator, { ownerId: 99, overridePermission: "dataset.review" }),
      "allowed",
    ],
    ["researcher has no override → 403", () => assertAllowed(researcher, { ownerId: 99, overridePermission: "dataset.review" }), 403],
  ];
  for (const [name, fn, status] of cases) it(name, () => expect(statusOf(fn)).toBe(status));
});
