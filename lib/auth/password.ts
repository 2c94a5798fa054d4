import bcrypt from "bcryptjs";

const COST = 11;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

export function verifyPassword(plain: string, hash: string): Promise<boolean> {
  return bcrypt.compare(plain, hash);
}

// Compared against when the e-mail is unknown, so both paths cost one bcrypt
// round and response time does not reveal whether an account exists.
let decoyHash: Promise<string> | undefined;
export function decoyPasswordHash(): Promise<string> {
  decoyHash ??= bcrypt.hash("tidemark-decoy-password", COST);
  return decoyHash;
}
