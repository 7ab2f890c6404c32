// Types for redis.mjs (imported by the TypeScript test harness).
export declare const DEFAULT_REDIS_PORT: number;

export interface RedisHandle {
  dir: string;
  port: number;
  pid: number | undefined;
  /** redis://127.0.0.1:<port> */
  url: string;
  reused: boolean;
}

export declare function redisCommand(port: number, command: string, options?: { host?: string; timeoutMs?: number }): Promise<string>;
export declare function runningRedis(dir: string): { pid: number; port: number | undefined } | undefined;
export declare function startRedis(options: { dir: string; port?: number; appendOnly?: boolean }): Promise<RedisHandle>;
export declare function stopRedis(options: { dir: string }): Promise<boolean>;
export declare function hasRedisData(dir: string): boolean;
