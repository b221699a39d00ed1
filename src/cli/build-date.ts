/**
 * The build's date: pinned by SOURCE_DATE_EPOCH (seconds since 1970, the reproducible-builds
 * convention) when set, so two builds of the same inputs are byte-identical.
 */
import { UsageError } from "../model/errors.ts";

export function buildDate(
  env: Record<string, string | undefined> = process.env,
  now: () => Date = () => new Date(),
): string {
  const epoch = env["SOURCE_DATE_EPOCH"];
  if (epoch !== undefined && epoch !== "") {
    if (!/^\d{1,12}$/.test(epoch))
      throw new UsageError(
        `SOURCE_DATE_EPOCH="${epoch}" is not a whole number of seconds — unset it, or set it to one`,
      );
    return new Date(Number(epoch) * 1000).toISOString();
  }
  return now().toISOString();
}
