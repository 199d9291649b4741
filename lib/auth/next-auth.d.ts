import type { Role } from "@/db/schema";

declare module "next-auth" {
  interface User {
    role: Role;
  }
  interface Session {
    user: {
      id: number;
      role: Role;
      /** The session's own id (lib/auth/session.ts). */
      sid?: string;
      /** The user's session version when this session was issued. */
      sv?: number;
      name?: string | null;
      email?: string | null;
    };
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid: number;
    role: Role;
    sid?: string;
    sv?: number;
  }
}
