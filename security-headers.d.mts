// Types for security-headers.mjs (plain JS so next.config.mjs can load it).
export declare function contentSecurityPolicy(opts?: { dev?: boolean }): string;
export declare const PERMISSIONS_POLICY: string;
export declare function securityHeaders(opts?: { dev?: boolean }): { key: string; value: string }[];
