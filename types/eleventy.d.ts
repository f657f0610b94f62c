declare module "@11ty/eleventy" {
  interface EleventyOptions {
    source?: string;
    configPath?: string;
    quietMode?: boolean;
    config?: (config: any) => void;
  }
  export class Eleventy {
    constructor(input?: string, output?: string, options?: EleventyOptions);
    init(): Promise<void>;
    write(): Promise<unknown>;
    setIsVerbose(v: boolean): void;
    disableLogger(): void;
  }
}
