/** Types for cli-bundle.mjs (plain JavaScript: it runs before any TypeScript loader). */
export function cliBundle(entry: string, cacheFolder: string): Promise<string | null>;
