import bcrypt from "bcryptjs";

// Cost 10 keeps a sign-in near 70 ms on a small server while staying the library's default strength.
const COST = 10;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

export function verifyPassword(plain: string, hash: string): Promise<boolean> {
  return bcrypt.compare(plain, hash);
}
