/**
 * `pulsewright check`: load and validate every record, print each issue on its own line
 * (`file:line:col  /pointer  what — how to fix`), then one summary line. Exit code 0 when the
 * records are valid, 1 when any issue was found.
 */
import { variantCount } from "../expand/expand.ts";
import { formatIssue } from "../records/issue.ts";
import { loadProject, type LoadOptions } from "../records/load.ts";

export interface CheckOutput {
  log(s: string): void;
  error(s: string): void;
}

export async function runCheck(root: string, out: CheckOutput, options: LoadOptions = {}): Promise<number> {
  const result = await loadProject(root, options);
  if (!result.ok) {
    for (const issue of result.issues) out.error(formatIssue(issue));
    const files = new Set(result.issues.map((i) => i.file)).size;
    out.error(`check failed: ${plural(result.issues.length, "issue")} in ${plural(files, "file")}`);
    return 1;
  }
  const variants = result.designs.reduce((n, d) => n + variantCount(d.record), 0);
  out.log(
    `check passed: ${plural(result.designs.length, "design")}, ` +
      `${plural(result.devices.size, "device class", "device classes")}, ` +
      `${plural(variants, "variant")} would be built (policy ${result.policy.id} from ${result.policyFile})`,
  );
  return 0;
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}
