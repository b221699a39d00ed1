// Worker entry shim: Node 20 cannot start a .ts worker even under tsx, so this plain module
// registers tsx's loader in the worker and then loads the TypeScript worker body.
import { register } from "tsx/esm/api";

register();
await import("./size-worker-main.ts");
