import { createSecretKey, randomUUID, type KeyObject } from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { Role } from '../../shared/schemas/common';

export interface TokenClaims {
  sub: string;
  org: string;
  role: Role;
  ver: number;
  jti: string;
  exp: number;
}

export function signToken(
  secret: string,
  ttlHours: number,
  user: { id: string; organizationId: string; role: Role; tokenVersion: number },
): { token: string; expiresAt: Date } {
  const jti = randomUUID();
  const token = jwt.sign({ org: user.organizationId, role: user.role, ver: user.tokenVersion }, secret, {
    algorithm: 'HS256',
    subject: user.id,
    jwtid: jti,
    expiresIn: Math.round(ttlHours * 3600),
  });
  const { exp } = jwt.decode(token) as { exp: number };
  return { token, expiresAt: new Date(exp * 1000) };
}

/**
 * The signing secret as a KeyObject, made once per secret: given a string, jsonwebtoken first tries (and fails) to read
 * it as a PEM public key on every verification, which costs more than the HMAC itself.
 */
const secretKeys = new Map<string, KeyObject>();
function secretKeyOf(secret: string): KeyObject {
  let key = secretKeys.get(secret);
  if (!key) secretKeys.set(secret, (key = createSecretKey(Buffer.from(secret))));
  return key;
}

/**
 * Verifies signature and expiry; returns null on any problem (the caller answers 401). A token must carry `iat` and
 * `exp`, and live no longer than `maxTtlHours` (the configured lifetime, at most 12 h): a token signed with the secret
 * but without an expiry, or with a longer one, is refused.
 */
export function verifyToken(secret: string, token: string, maxTtlHours = 12, nowMs = Date.now()): TokenClaims | null {
  try {
    const claims = jwt.verify(token, secretKeyOf(secret), {
      algorithms: ['HS256'],
      clockTimestamp: Math.floor(nowMs / 1000),
    });
    if (typeof claims !== 'object' || !claims.sub || !claims.jti) return null;
    const { iat, exp } = claims;
    if (typeof iat !== 'number' || typeof exp !== 'number' || !Number.isFinite(iat) || !Number.isFinite(exp))
      return null;
    const maxSeconds = Math.round(maxTtlHours * 3600);
    const now = nowMs / 1000;
    // A few seconds of slack for clocks of several servers.
    if (exp - iat > maxSeconds || iat > now + 60 || exp > now + maxSeconds + 60) return null;
    return claims as unknown as TokenClaims;
  } catch {
    return null;
  }
}
