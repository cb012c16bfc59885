/**
 * The link an alert mail carries to open its alert: `/api/v1/alerts/<id>/from-mail?sig=…`,
 * signed with an HMAC-SHA256 of the alert id under the server's secret, so a link cannot be
 * changed to point at another alert or page. Opening it still needs a session: the signature
 * proves the link came from Turnstone, it is not a credential.
 */
import { createHmac, timingSafeEqual } from 'node:crypto';

const sign = (secret: string, alertId: number) =>
  createHmac('sha256', secret).update(`alert-mail-link:${alertId}`).digest('base64url');

/** The mail's link to the alert (base: the public address, no trailing slash). */
export function alertMailLink(base: string, secret: string, alertId: number): string {
  return `${base}/api/v1/alerts/${alertId}/from-mail?sig=${sign(secret, alertId)}`;
}

/** Whether `sig` is the signature of this alert's link (compared in constant time). */
export function isAlertLinkSignature(secret: string, alertId: number, sig: string): boolean {
  const want = Buffer.from(sign(secret, alertId));
  const got = Buffer.from(sig);
  return got.length === want.length && timingSafeEqual(got, want);
}
