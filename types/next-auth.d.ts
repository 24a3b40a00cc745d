import type { Role } from "@/db/users";

declare module "next-auth" {
  interface User {
    role: Role;
  }
  interface Session {
    user: { id: number; role: Role; name?: string | null; email?: string | null; image?: string | null };
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    role: Role;
  }
}
