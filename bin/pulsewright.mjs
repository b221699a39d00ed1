#!/usr/bin/env node
// Entry point: run the TypeScript CLI through tsx's loader (no compile step).
import { register } from "tsx/esm/api";
register();
await import("../src/cli/main.ts");
