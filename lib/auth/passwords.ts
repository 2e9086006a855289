import 'server-only';
import bcrypt from 'bcryptjs';
import { COMMON_PASSWORDS } from './common-passwords';

/** bcrypt work factor; 10 is the floor we accept (OWASP Password Storage Cheat Sheet). */
export const BCRYPT_COST = 10;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, BCRYPT_COST);
}

export function verifyPassword(plain: string, hash: string | null | undefined): Promise<boolean> {
  // Compare against a dummy hash when there is none, so a missing account costs the same time.
  return bcrypt.compare(plain, hash ?? '$2b$10$CwTycUXWue0Thq9StjUM0uJ8.M8zQ1x1Qz0a1t6bGk8iP1eO0b9wS');
}

/** True when the password is on the shipped list of commonly used passwords. */
export function isCommonPassword(plain: string): boolean {
  return COMMON_PASSWORDS.has(plain.toLowerCase());
}
