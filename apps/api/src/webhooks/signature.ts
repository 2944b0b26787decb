/**
 * Signing per the Standard Webhooks specification (standardwebhooks.com, "Signature scheme"): the signed content is
 * `${webhook-id}.${webhook-timestamp}.${body}`, signed with HMAC-SHA256 under the secret's bytes (base64 after the
 * `whsec_` prefix), sent as `webhook-signature: v1,<base64 signature>`.
 */
import { createHmac, randomBytes } from 'node:crypto';

export const SECRET_PREFIX = 'whsec_';

/** A new endpoint secret: `whsec_` + base64 of 32 random bytes (the specification asks for 24 to 64 bytes). */
export function newSecret(): string {
  return SECRET_PREFIX + randomBytes(32).toString('base64');
}

/** The three headers of one delivery. */
export function signedHeaders(secret: string, messageId: string, timestampSeconds: number, body: string): Record<string, string> {
  if (!secret.startsWith(SECRET_PREFIX)) throw new Error('a webhook secret starts with whsec_');
  const key = Buffer.from(secret.slice(SECRET_PREFIX.length), 'base64');
  const signature = createHmac('sha256', key).update(`${messageId}.${timestampSeconds}.${body}`).digest('base64');
  return { 'webhook-id': messageId, 'webhook-timestamp': String(timestampSeconds), 'webhook-signature': `v1,${signature}` };
}
