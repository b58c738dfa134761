import argon2 from 'argon2';

// argon2id with the library's defaults (64 MiB, 3 passes), as recommended for password storage.
export function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, { type: argon2.argon2id });
}

export async function verifyPassword(hash: string, password: string): Promise<boolean> {
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false; // a malformed stored hash never signs anyone in
  }
}

let dummyHash: Promise<string> | undefined;

/**
 * A hash to verify against when the e-mail is unknown, so a wrong e-mail takes as long as a wrong
 * password and response times do not reveal which addresses have accounts.
 */
export function hashForUnknownUser(): Promise<string> {
  dummyHash ??= hashPassword('unknown-user-placeholder-password');
  return dummyHash;
}
