import bcrypt from "bcryptjs";

// bcrypt with a work factor of 12 (about a quarter second per hash here): slow enough to make
// guessing costly, fast enough for sign-in.
const COST = 12;
export const MIN_PASSWORD_LENGTH = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}
