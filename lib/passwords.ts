import bcrypt from "bcryptjs";

// Cost 10 keeps a sign-in near 60 ms on this class of machine while staying well above
// the point where offline guessing is cheap.
const COST = 10;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

// Compared against when there is no account (or no password yet), so an unknown e-mail takes
// as long as a wrong password and the answer time does not tell which accounts exist.
let dummyHash: string | undefined;

// bcrypt reads only the first 72 bytes; longer input never matches (no silent truncation).
const MAX_BYTES = 72;

export async function verifyPassword(plain: string, hash: string | null | undefined): Promise<boolean> {
  if (hash && Buffer.byteLength(plain, "utf8") <= MAX_BYTES) return bcrypt.compare(plain, hash);
  dummyHash ??= await bcrypt.hash("no account has this password", COST);
  await bcrypt.compare(plain, dummyHash);
  return false;
}
