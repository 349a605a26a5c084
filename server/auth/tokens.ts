import { randomUUID } from 'node:crypto';
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

/** Verifies signature and expiry; returns null on any problem (the caller answers 401). */
export function verifyToken(secret: string, token: string): TokenClaims | null {
  try {
    const claims = jwt.verify(token, secret, { algorithms: ['HS256'] });
    if (typeof claims !== 'object' || !claims.sub || !claims.jti) return null;
    return claims as unknown as TokenClaims;
  } catch {
    return null;
  }
}
