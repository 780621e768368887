import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { Role, OrganizationKind } from '@shared/vocabulary';

export interface AccessClaims {
  sub: string;
  org: string;
  kind: OrganizationKind;
  role: Role;
}

const ISSUER = 'platterpost';
const AUDIENCE = 'platterpost-app';

export function signAccessToken(claims: AccessClaims, secret: string, ttlSeconds: number): string {
  return jwt.sign(claims, secret, { algorithm: 'HS256', expiresIn: ttlSeconds, issuer: ISSUER, audience: AUDIENCE });
}

export const accessTokenVerifyOptions = { algorithms: ['HS256' as const], issuer: ISSUER, audience: AUDIENCE };

export function sha256(text: string): string {
  return createHash('sha256').update(text).digest('hex');
}

/**
 * Opaque tokens for refresh cookies and e-mailed links: "<row id>.<secret>". Only the
 * secret's SHA-256 is stored, so a copy of the database cannot be replayed.
 */
export function newOpaqueSecret(): { secret: string; hash: string } {
  const secret = randomBytes(32).toString('base64url');
  return { secret, hash: sha256(secret) };
}

export function formatOpaqueToken(id: string, secret: string): string {
  return `${id}.${secret}`;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export function parseOpaqueToken(token: string | undefined | null): { id: string; secret: string } | null {
  if (!token) return null;
  const dot = token.indexOf('.');
  if (dot <= 0) return null;
  const id = token.slice(0, dot);
  const secret = token.slice(dot + 1);
  if (!UUID.test(id) || secret.length < 20) return null;
  return { id, secret };
}

export function secretMatches(secret: string, storedHash: string): boolean {
  const a = Buffer.from(sha256(secret), 'hex');
  const b = Buffer.from(storedHash, 'hex');
  return a.length === b.length && timingSafeEqual(a, b);
}
