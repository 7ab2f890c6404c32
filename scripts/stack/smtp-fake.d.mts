// Types for smtp-fake.mjs (imported by the TypeScript test harness and tests).
export declare const DEFAULT_SMTP_PORT: number;
export declare const DEFAULT_MAIL_API_PORT: number;

export interface CaughtAttachment {
  filename: string | null;
  contentType: string;
  size: number;
  /** only in GET /messages/:id, and only up to 2 MB */
  contentBase64?: string | null;
}

export interface CaughtMessage {
  id: string;
  receivedAt: string;
  envelope: { from: string; to: string[] };
  /** the From header as text, e.g. "Gillwise <alerts@gillwise.invalid>" */
  from: string;
  /** the From address alone, lower-cased */
  fromAddress: string;
  /** envelope recipients, lower-cased (includes Bcc) */
  to: string[];
  /** addresses in the To header, lower-cased */
  headerTo: string[];
  cc: string[];
  subject: string;
  text: string;
  html: string;
  /** date, message-id, reply-to, list-unsubscribe, auto-submitted, x-* … (lower-case keys) */
  headers: Record<string, string>;
  attachments: CaughtAttachment[];
  sizeBytes: number;
}

export interface SmtpFake {
  smtpPort: number;
  apiPort: number;
  /** http://127.0.0.1:<apiPort> */
  apiUrl: string;
  storeDir: string | undefined;
  close(): Promise<void>;
}

export declare function startSmtpFake(options?: {
  smtpPort?: number;
  apiPort?: number;
  storeDir?: string;
  keep?: number;
  host?: string;
  onMessage?: (message: CaughtMessage) => void;
}): Promise<SmtpFake>;
