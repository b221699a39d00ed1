/**
 * The routing memo (src/render/route-memo.ts): a schematic drawn from a kept routing is the one the
 * router would draw afresh, and a key changes with every input the router reads. Common practice
 * (no source): a cache must return what the function it stands for returns.
 */
import { describe, expect, it } from "vitest";
import { renderSchematic } from "../../src/render/schematic.ts";
import { place } from "../../src/render/schematic-place.ts";
import { wire } from "../../src/render/schematic-wire.ts";
import { RouteMemo, routeKey } from "../../src/render/route-memo.ts";
import { CIRCUIT_FIXTURES } from "../fixtures/circuits/index.ts";

describe("the routing memo", () => {
  it("hands out the routing the router makes afresh, frozen, for the same geometry", () => {
    const memo = new RouteMemo();
    for (const f of CIRCUIT_FIXTURES) {
      const { placed, hints } = place(f.circuit);
      const first = memo.get(placed, hints, () => wire(placed, hints));
      const again = place(f.circuit);
      const second = memo.get(again.placed, again.hints, () => {
        throw new Error("routed again although the geometry is the same");
      });
      expect(second).toBe(first);
      expect(Object.isFrozen(first.wires[0]!.segs)).toBe(true);
      expect(JSON.stringify(second)).toBe(JSON.stringify(wire(again.placed, again.hints)));
    }
    expect(memo.hits).toBe(CIRCUIT_FIXTURES.length);
    expect(memo.misses).toBe(CIRCUIT_FIXTURES.length);
  });

  it("draws each fixture's schematic the same bytes the first time and from the memo", () => {
    for (const f of CIRCUIT_FIXTURES)
      expect(renderSchematic(f.circuit, f.meta)).toBe(renderSchematic(f.circuit, f.meta));
  });

  it("changes its key with any box, pin, net or hint the router reads, and tells -0 from 0", () => {
    const f = CIRCUIT_FIXTURES[0]!;
    const base = () => place(f.circuit);
    const key0 = routeKey(base().placed, base().hints);
    const changed: ((p: ReturnType<typeof base>) => void)[] = [
      (p) => (p.placed[1]!.box = { ...p.placed[1]!.box, w: p.placed[1]!.box.w + 1 }),
      (p) => (p.placed[2]!.label.box = { ...p.placed[2]!.label.box, h: p.placed[2]!.label.box.h + 0.5 }),
      (p) => (p.placed[0]!.cx += 1),
      (p) => {
        const [name, pt] = Object.entries(p.placed[3]!.pins)[0]!;
        p.placed[3]!.pins = { ...p.placed[3]!.pins, [name]: [pt[0], pt[1] + 10] };
      },
      (p) => {
        const [name] = Object.keys(p.placed[3]!.nets);
        p.placed[3]!.nets = { ...p.placed[3]!.nets, [name!]: "elsewhere" };
      },
      (p) =>
        p.hints.push({
          net: "x",
          pts: [
            [0, 0],
            [0, 10],
          ],
        }),
      (p) => (p.placed[0]!.cy = p.placed[0]!.cy === 0 ? -0 : p.placed[0]!.cy * -1),
    ];
    for (const change of changed) {
      const p = base();
      change(p);
      expect(routeKey(p.placed, p.hints)).not.toBe(key0);
    }
    expect(routeKey([], [{ net: "n", pts: [[0, 1]] }])).not.toBe(routeKey([], [{ net: "n", pts: [[-0, 1]] }]));
  });

  it("keeps at most its size, letting the oldest go first", () => {
    const memo = new RouteMemo(2);
    const routing = () => ({ wires: [], grounds: [], flags: [], dots: [], hintsRefused: 0 });
    const hint = (n: number) => [{ net: "n", pts: [[n, 0] as const] }];
    let made = 0;
    const get = (n: number) => memo.get([], hint(n), () => (made++, routing()));
    get(1);
    get(2);
    get(3); // 1 goes
    get(2);
    get(1);
    expect(made).toBe(4);
  });
});
