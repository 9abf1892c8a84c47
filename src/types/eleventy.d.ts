// Eleventy 3 ships no type declarations; these cover the calls Ridgeline makes.
declare module "@11ty/eleventy" {
  export default class Eleventy {
    constructor(input?: string, output?: string, options?: { quietMode?: boolean; configPath?: string; pathPrefix?: string; runMode?: "build" | "serve" | "watch" }, eleventyConfig?: unknown);
    write(): Promise<unknown>;
    watch(): Promise<void>;
    serve(port?: number): Promise<void>;
  }
}
