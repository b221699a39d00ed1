import { benchRender } from "../../../bench/render.ts";
import { CIRCUIT_FIXTURES } from "../../fixtures/circuits/index.ts";
import { FIXTURE_DEVICES } from "../../fixtures/circuits/devices.ts";
console.log(benchRender(CIRCUIT_FIXTURES.map((f) => ({ circuit: f.circuit, meta: f.meta, devices: FIXTURE_DEVICES })), 10));
