// Reading caught e-mail from the SMTP fake that the test stack runs (see scripts/stack/smtp-fake.mjs).
// The fake is shared by every test file: filter by a recipient address unique to your test rather
// than clearing the inbox.
import { inject } from 'vitest';
import type { CaughtMessage } from '../../scripts/stack/smtp-fake.mjs';

export type { CaughtMessage };

/** Messages newest first, optionally only those delivered to `to`. */
export async function listMail({ to, limit = 50, apiUrl = inject('mailApiUrl') }: { to?: string; limit?: number; apiUrl?: string } = {}): Promise<
  CaughtMessage[]
> {
  const url = new URL('/messages', apiUrl);
  if (to) url.searchParams.set('to', to);
  url.searchParams.set('limit', String(limit));
  const res = await fetch(url);
  if (!res.ok) throw new Error(`mail API answered ${res.status}`);
  return ((await res.json()) as { messages: CaughtMessage[] }).messages;
}

/** One message with its attachment bodies. */
export async function getMail(id: string, apiUrl: string = inject('mailApiUrl')): Promise<CaughtMessage> {
  const res = await fetch(new URL(`/messages/${encodeURIComponent(id)}`, apiUrl));
  if (!res.ok) throw new Error(`mail API answered ${res.status} for message ${id}`);
  return (await res.json()) as CaughtMessage;
}

/**
 * Wait until at least `count` messages delivered to `to` (and matching `where`) have arrived;
 * resolves them newest first. Rejects after `timeoutMs` listing what did arrive.
 */
export async function waitForMail({
  to,
  where = () => true,
  count = 1,
  timeoutMs = 5000,
  apiUrl = inject('mailApiUrl'),
}: {
  to: string;
  where?: (message: CaughtMessage) => boolean;
  count?: number;
  timeoutMs?: number;
  apiUrl?: string;
}): Promise<CaughtMessage[]> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await listMail({ to, limit: 1000, apiUrl })).filter(where);
    if (found.length >= count) return found;
    if (Date.now() > deadline) {
      const subjects = found.map((m) => JSON.stringify(m.subject)).join(', ') || 'none';
      throw new Error(`expected ${count} e-mail(s) to ${to} within ${timeoutMs} ms; got ${found.length} (${subjects})`);
    }
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}
