import { z } from 'zod';
import type { Logger } from '../../lib/logger';

// The local SMTP fake's HTTP API (scripts/stack/smtp-fake.mjs): what it actually received. Its answers
// are outside input, parsed with a schema; when it does not answer in time we say so instead of failing.

const TIMEOUT_MS = 1500;

const caughtSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string().default(''),
  to: z.array(z.string()).default([]),
  subject: z.string().default(''),
  text: z.string().default(''),
  headers: z.record(z.string(), z.string()).default({}),
});
export type CaughtMail = z.infer<typeof caughtSchema>;
const listSchema = z.object({ messages: z.array(z.unknown()) });

export class MailCatcherClient {
  constructor(
    private readonly baseUrl: string | null,
    private readonly logger: Logger,
  ) {}

  private async fetchJson(path: string, params: Record<string, string> = {}): Promise<unknown> {
    if (!this.baseUrl) return undefined;
    try {
      const url = new URL(path, this.baseUrl);
      for (const [k, v] of Object.entries(params)) url.searchParams.set(k, v);
      const res = await fetch(url, { signal: AbortSignal.timeout(TIMEOUT_MS), headers: { accept: 'application/json' } });
      if (res.status === 404) return null;
      if (!res.ok) throw new Error(`mail catcher answered ${res.status}`);
      return (await res.json()) as unknown;
    } catch (err) {
      this.logger.debug({ err: err instanceof Error ? err.message : String(err) }, 'mail catcher unreachable');
      return undefined;
    }
  }

  /** Newest messages delivered to `to`; undefined when the catcher cannot be asked. */
  async listFor(to: string, limit = 200): Promise<CaughtMail[] | undefined> {
    const body = listSchema.safeParse(await this.fetchJson('/messages', { to: to.toLowerCase(), limit: String(limit) }));
    if (!body.success) return undefined;
    return body.data.messages.flatMap((m) => {
      const parsed = caughtSchema.safeParse(m);
      return parsed.success ? [parsed.data] : [];
    });
  }

  /** One message with its text; null when the catcher no longer has it, undefined when unreachable. */
  async get(id: string): Promise<CaughtMail | null | undefined> {
    const body = await this.fetchJson(`/messages/${encodeURIComponent(id)}`);
    if (body === undefined || body === null) return body;
    const parsed = caughtSchema.safeParse(body);
    return parsed.success ? parsed.data : undefined;
  }
}
