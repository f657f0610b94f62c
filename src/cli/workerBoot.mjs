// Worker-thread entry: loads the TypeScript sources through tsx, then serves
// analyseFolder requests (see workerPool.ts).
import { register } from "tsx/esm/api";
register();
await import("./worker.ts");
