import bcrypt from "bcryptjs";

/** bcrypt cost factor: 2^10 rounds, about 60 ms on this class of machine. */
export const BCRYPT_COST = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

let dummy: Promise<string> | undefined;
/**
 * Spends the same bcrypt time as a real check when no account exists, so the response time does not tell
 * whether an address has an account. (A constant of this process, not state shared between requests.)
 */
export async function verifyAgainstNothing(password: string): Promise<false> {
  dummy ??= bcrypt.hash("no account has this password", BCRYPT_COST);
  await bcrypt.compare(password, await dummy);
  return false;
}
