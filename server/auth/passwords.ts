import argon2 from 'argon2';

/** argon2id with the library's defaults (memory-hard; OWASP-recommended family). */
export function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, { type: argon2.argon2id });
}

export async function verifyPassword(hash: string, password: string): Promise<boolean> {
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}

/** A valid argon2id hash of a random string, verified against when the e-mail is unknown so timing does not tell. */
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword(`no-such-user-${Math.random()}`);
  return dummyHash;
}
