// Types for postgres.mjs (imported by the TypeScript test harness).
export declare const DEFAULT_PG_PORT: number;

export interface PostgresHandle {
  dataDir: string;
  port: number;
  pid: number;
  /** postgres://postgres@127.0.0.1:<port>/postgres */
  adminUrl: string;
  /** true when a cluster was already running from this data folder and was reused */
  reused: boolean;
}

export declare function dataRoot(): string;
export declare function pgBinDir(): string | undefined;
export declare function runningCluster(dataDir: string): { pid: number; port: number } | undefined;
export declare function isCluster(dataDir: string): boolean;
export declare function startPostgres(options: {
  dataDir: string;
  port?: number;
  fsyncOff?: boolean;
  maxConnections?: number;
}): Promise<PostgresHandle>;
export declare function stopPostgres(options: { dataDir: string; mode?: 'smart' | 'fast' | 'immediate' }): Promise<boolean>;
export declare function createDatabase(
  url: string,
  name: string,
  options?: { template?: string; retryMs?: number },
): Promise<boolean>;
export declare function dropDatabase(url: string, name: string): Promise<void>;
