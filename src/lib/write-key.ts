// A key for a write that may reach the server twice (a resend after a lost answer, or the balancer
// trying another instance): the server files one write per key and answers a repeat with the first.

/** A fresh random key; `crypto.randomUUID` needs a secure context, `getRandomValues` does not. */
export function newWriteKey(): string {
  if (typeof crypto.randomUUID === 'function' && globalThis.isSecureContext !== false) return crypto.randomUUID();
  return Array.from(crypto.getRandomValues(new Uint8Array(16)), (b) => b.toString(16).padStart(2, '0')).join('');
}
