/** Types of scripts/origin.mjs (the deployment origin written into the build). */
export declare const DEV_ORIGIN: string;
export declare function checkOrigin(text: string): string;
export declare function substituteOrigin(text: string, origin: string): string;
export declare function originSetting(env: { origin?: unknown } | undefined, vars: Record<string, string | undefined> | undefined): string | undefined;
export declare const ORIGIN_ASSETS: RegExp;
export declare const REQUIRED_ORIGIN_ASSETS: readonly string[];
