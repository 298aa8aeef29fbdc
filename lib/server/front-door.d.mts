// Types for front-door.mjs (plain JS so scripts/serve.mjs runs under node without a build).
import type { IncomingMessage, ServerResponse } from "node:http";
export declare const CLIENT_HEADER: string;
export declare const FRONT_DOOR: unique symbol;
export declare const HSTS_VALUE: string;
export declare function parseTrustProxy(value: string | undefined): number;
export declare function clientAddressOf(remoteAddress: string | undefined, forwardedFor: string | string[] | undefined, hops: number): string;
export declare function isLoopback(address: string | null | undefined): boolean;
export declare function frontDoor(opts?: { hops?: number; hsts?: boolean }): (req: IncomingMessage, res: ServerResponse) => void;
