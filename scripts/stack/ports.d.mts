// Types for ports.mjs.
export declare function freePort(host?: string): Promise<number>;
export declare function isPortFree(port: number, host?: string): Promise<boolean>;
export declare function waitForPort(port: number, options?: { host?: string; timeoutMs?: number }): Promise<void>;
