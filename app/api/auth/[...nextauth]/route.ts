// GET/POST /api/auth/* — next-auth's sign-in, session and sign-out endpoints
import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth/options";

const handler = NextAuth(authOptions);
export { handler as GET, handler as POST };
