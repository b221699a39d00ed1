/**
 * Part roles: the closed vocabulary every variant's parts are named by inside their stage
 * (docs/topologies.md). The chain planners and stage builders produce parts with these roles, the
 * circuit assembler numbers reference designators in this order, the schematic places parts by
 * role, and the verifier finds the load and the power devices by role. One list per stage, in
 * numbering order; the union type is read from the lists, so a role used anywhere but listed here
 * fails the type check, and a role listed here but missing from docs/topologies.md fails a test.
 */
import { REF_PREFIX, STAGE_KINDS, type PartKind, type StageKind } from "./kinds.ts";

/** The start network's roles (src/engine/stages/start-network.ts), in numbering order: part of the timing stage. */
export const START_NET_ROLES = [
  "DK_A",
  "DK_B",
  "RK_OR",
  "RK_DIV",
  "RK_SET",
  "QK_SENSE",
  "RK_LATCH",
  "QK_LATCH",
  "RK_MEM",
  "RK_FIRE",
  "CK_MEM",
  "DK_HOLD",
  "RK_HOLD",
  "RK_OFF",
  "QK_HOLD",
] as const;

/** Roles per stage, in reference-designator numbering order (docs/topologies.md, "Role vocabulary"). */
export const STAGE_ROLES = {
  supply: ["F_SUPPLY", "D_SERIES", "D_REVERSE", "Q_RETURN", "RG_RETURN", "DZ_RETURN", "C_BULK"],
  timing: [
    "Q_A",
    "Q_B",
    "RC_A",
    "RC_B",
    "CT_A",
    "CT_B",
    "DB_A",
    "DB_B",
    "RBL_A",
    "RBL_B",
    "RBAL",
    "DBAL",
    "QF_A",
    "QF_B",
    "DF_A",
    "DF_B",
    "RS_A",
    "RS_B",
    // The start network (docs/topologies.md, "Start network"): follower cores.
    ...START_NET_ROLES,
  ],
  duty: [
    "RV_DUTY",
    "RB_A",
    "RB_B",
    "C_PULL",
    "R_PULL",
    "RB_PULL",
    "DB_PULL",
    "D_PULL",
    "Q_PULL",
    "S_OFF",
    "S_ON",
    // The ramp-and-comparator duty stage (with a fixed-duty core: RB_A, RB_B equal, RV_DUTY in the divider).
    "RR_A",
    "CR_A",
    "RR_B",
    "CR_B",
    "RD_HI",
    "RD_LO",
    "Q_CR",
    "Q_CW",
    "R_TAIL",
    "R_CMP",
    "Q_LVL",
    "R_LVL",
    "R_HYS",
    // Its pair's base–emitter protection: a diode in series with each emitter, one across each junction.
    "D_ER",
    "D_EW",
    "D_KR",
    "D_KW",
  ],
  chain: [
    "RT",
    "Q_D1",
    "Q_D2",
    "Q_D3",
    "Q_BUF",
    "RE_BUF",
    "Q_DRV",
    "Q_CL",
    "RE_DRV",
    "RB_P",
    "RPU",
    "RP",
    "RZ",
    "DZ",
    "C_RAIL",
    "Q_HI",
    "Q_LO",
    "RG",
    "RGS",
    "RBE",
    "Q_POWER",
  ],
  load: ["LOAD"],
  protection: ["D_FREEWHEEL"],
} as const satisfies Record<StageKind, readonly string[]>;

/** The roles a part of stage `S` may take. */
export type RoleIn<S extends StageKind> = (typeof STAGE_ROLES)[S][number];

/** Every part role. */
export type PartRole = RoleIn<StageKind>;

/** All roles, stage by stage, in numbering order. */
export const PART_ROLES: readonly PartRole[] = STAGE_KINDS.flatMap((s): readonly PartRole[] => STAGE_ROLES[s]);

/** The timing core's two mirror-image sides. */
export type CoreSide = "A" | "B";

/** Role bases that come once per side of the timing core and duty control (`RC_A`, `RC_B`, ...). */
export type SidedRoleBase = "Q" | "RC" | "CT" | "DB" | "RBL" | "RB" | "QF" | "DF" | "RS";

/** A per-side role for a side letter; the constraint proves every combination is a listed role. */
export type SidedRole<B extends SidedRoleBase = SidedRoleBase, S extends CoreSide = CoreSide> = `${B}_${S}` & PartRole;
type Sided = `${SidedRoleBase}_${CoreSide}`;
// Compile-time check: every base × side combination is in the vocabulary (fails tsc otherwise).
const sidedAreRoles: Sided extends PartRole ? true : never = true;
void sidedAreRoles;

/** The per-side role of a base on a side: sidedRole("RC", "B") → "RC_B". */
export function sidedRole<B extends SidedRoleBase, S extends CoreSide>(base: B, side: S): `${B}_${S}` {
  return `${base}_${side}`;
}

/** The power devices whose dissipation the verifier measures (the switch and a Darlington's stack). */
export const POWER_ROLES = ["Q_POWER", "Q_D1", "Q_D2", "Q_D3"] as const satisfies readonly PartRole[];

const ROLE_SET: ReadonlySet<string> = new Set(PART_ROLES);

/** Narrows a string read from outside the type system (a JSON pointer, a test fixture) to a role. */
export function isPartRole(s: string): s is PartRole {
  return ROLE_SET.has(s);
}

const STAGE_OF: ReadonlyMap<PartRole, StageKind> = new Map(
  STAGE_KINDS.flatMap((s) => STAGE_ROLES[s].map((r): [PartRole, StageKind] => [r, s])),
);

/** The stage a role belongs to (each role belongs to exactly one stage; a test checks it). */
export function stageOfRole(role: PartRole): StageKind {
  return STAGE_OF.get(role)!;
}

/** A reference designator the circuit assembler gives a part: its letter code and a number ("Q3", "RV1"). */
export type RefDesignator = `${(typeof REF_PREFIX)[PartKind]}${number}`;

const REF_RE = new RegExp(`^(${[...new Set(Object.values(REF_PREFIX))].join("|")})[1-9][0-9]*$`);

/** Narrows a string to a reference designator of the circuit model. */
export function isRefDesignator(s: string): s is RefDesignator {
  return REF_RE.test(s);
}
