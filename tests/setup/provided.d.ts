// Values that tests/setup/global-setup.ts provides to every test: `inject('redisUrl')` etc.
export {};

declare module 'vitest' {
  export interface ProvidedContext {
    /** postgres://postgres@127.0.0.1:<port>/postgres on the throwaway test cluster */
    pgAdminUrl: string;
    /** database with every migration applied; clone it with createTestDatabase() */
    templateDb: string;
    /** redis://127.0.0.1:<port>; isolate queues with uniqueQueuePrefix() */
    redisUrl: string;
    /** SMTP fake on 127.0.0.1 (no auth, no TLS) */
    smtpPort: number;
    /** http://127.0.0.1:<port> — GET /messages?to=&limit=, GET /messages/:id, DELETE /messages */
    mailApiUrl: string;
  }
}
