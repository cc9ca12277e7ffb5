import bcrypt from "bcryptjs";

// Cost 10 keeps a sign-in near 60 ms on this class of machine while staying well above
// the point where offline guessing is cheap.
const COST = 10;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

export function verifyPassword(plain: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) return Promise.resolve(false);
  return bcrypt.compare(plain, hash);
}
