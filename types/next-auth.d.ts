import type { Role } from "@/db/users";

declare module "next-auth" {
  interface User {
    role: Role;
    sessionGeneration: number;
  }
  interface Session {
    user: { id: number; role: Role; sessionGeneration: number; name?: string | null; email?: string | null; image?: string | null };
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    role: Role;
    /** The person's session generation at sign-in; a bump in the database ends this session. */
    gen?: number;
  }
}
