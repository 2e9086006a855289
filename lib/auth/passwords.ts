import 'server-only';
import { hash as argon2Hash, verify as argon2Verify } from '@node-rs/argon2';
import bcrypt from 'bcryptjs';
import { COMMON_PASSWORDS } from './common-passwords';

/**
 * Passwords are hashed with argon2id (OWASP Password Storage Cheat Sheet: m = 19 MiB, t = 2,
 * p = 1). argon2 reads the whole password, so nothing past byte 72 is silently dropped as it is
 * with bcrypt. Hashes made before argon2id (bcrypt, `$2a$`/`$2b$`) still verify and are replaced
 * by an argon2id hash at the next successful sign-in (`needsRehash`).
 */
/** `algorithm: 2` is `Algorithm.Argon2id` (a const enum, which isolated modules cannot read). */
const ARGON2_OPTIONS = { algorithm: 2, memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

/** bcrypt reads only the first 72 bytes: a longer password never verifies against a bcrypt hash. */
const BCRYPT_MAX_BYTES = 72;

/** Compared against when there is no hash, so a missing account costs the same time. */
const DUMMY_HASH = '$argon2id$v=19$m=19456,t=2,p=1$gvjgX9DQStJvHbywa4mkTw$pXApSw4GBTc50r5YsjOPA/Lc0dO77NXjwd+sjZdJzqA';

export function hashPassword(plain: string): Promise<string> {
  return argon2Hash(plain, ARGON2_OPTIONS);
}

const isBcrypt = (hash: string) => /^\$2[aby]\$/.test(hash);

export async function verifyPassword(plain: string, hash: string | null | undefined): Promise<boolean> {
  const stored = hash ?? DUMMY_HASH;
  if (isBcrypt(stored)) {
    // A password bcrypt would truncate cannot be the one the hash was made from in full.
    if (Buffer.byteLength(plain, 'utf8') > BCRYPT_MAX_BYTES) return false;
    return bcrypt.compare(plain, stored);
  }
  try {
    return (await argon2Verify(stored, plain)) && hash != null;
  } catch {
    return false;
  }
}

/** True when the stored hash is not argon2id with today's parameters (re-hash after a good sign-in). */
export function needsRehash(hash: string): boolean {
  return !hash.startsWith(
    `$argon2id$v=19$m=${ARGON2_OPTIONS.memoryCost},t=${ARGON2_OPTIONS.timeCost},p=${ARGON2_OPTIONS.parallelism}$`,
  );
}

/** True when the password is on the shipped list of commonly used passwords. */
export function isCommonPassword(plain: string): boolean {
  return COMMON_PASSWORDS.has(plain.toLowerCase());
}
