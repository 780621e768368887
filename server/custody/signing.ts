import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync, sign, verify, type KeyObject } from 'node:crypto';
import type { Config } from '../config';
import { logger } from '../lib/logger';

// Ed25519 signatures (RFC 8032) on custody-log exports, with the key from CUSTODY_SIGNING_KEY.
// Without one (development and tests) a key is made once per process and the log says so: exports
// signed with it verify only until the process restarts.

export interface CustodySigner {
  keyId: string;
  publicKeyPem: string;
  development: boolean;
  /** Base64 of the 64-byte signature over the UTF-8 bytes of `text`. */
  sign(text: string): string;
  verify(text: string, signatureBase64: string): boolean;
}

let developmentKey: KeyObject | undefined;

function keyFrom(config: Pick<Config, 'custodySigningKey' | 'env'>): { key: KeyObject; development: boolean } {
  if (config.custodySigningKey) return { key: createPrivateKey(config.custodySigningKey), development: false };
  if (config.env === 'production') throw new Error('CUSTODY_SIGNING_KEY is required in production');
  if (!developmentKey) {
    developmentKey = generateKeyPairSync('ed25519').privateKey;
    logger.warn(
      { keyId: keyIdOf(createPublicKey(developmentKey)) },
      'CUSTODY_SIGNING_KEY is not set: custody exports are signed with a development key generated at start; they will not verify after a restart',
    );
  }
  return { key: developmentKey, development: true };
}

/** First 16 hex digits of the SHA-256 of the public key's SubjectPublicKeyInfo (DER). */
export function keyIdOf(publicKey: KeyObject): string {
  return createHash('sha256').update(publicKey.export({ type: 'spki', format: 'der' })).digest('hex').slice(0, 16);
}

export function custodySigner(config: Pick<Config, 'custodySigningKey' | 'env'>): CustodySigner {
  const { key, development } = keyFrom(config);
  const publicKey = createPublicKey(key);
  return {
    keyId: keyIdOf(publicKey),
    publicKeyPem: publicKey.export({ type: 'spki', format: 'pem' }).toString(),
    development,
    // Ed25519 hashes internally (PureEdDSA), so node:crypto takes no digest name here.
    sign: (text) => sign(null, Buffer.from(text, 'utf8'), key).toString('base64'),
    verify: (text, signatureBase64) => {
      const signature = Buffer.from(signatureBase64, 'base64');
      return signature.length === 64 && verify(null, Buffer.from(text, 'utf8'), publicKey, signature);
    },
  };
}
