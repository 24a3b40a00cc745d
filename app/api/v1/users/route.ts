// GET /api/v1/users — everyone with an account (admins only)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { listUsers } from "@/lib/users/queries";

export const GET = withApi(
  async () => {
    const people = await listUsers();
    return NextResponse.json({ data: people });
  },
  { permission: "user.list", scope: "admin" },
);
