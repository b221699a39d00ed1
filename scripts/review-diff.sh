#!/usr/bin/env bash
# What a pull request does to the catalogue: builds the base and the head, each with its own
# program, and prints `pulsewright diff` between the two. The review workflow runs exactly this
# (.github/workflows/review.yml); run it locally for the same report before you push:
#
#   scripts/review-diff.sh                      # base = main (or origin/main), head = this checkout
#   scripts/review-diff.sh --base v0.1 --markdown
#
# Options:
#   --base REF        git ref of the base (default: origin/main if it exists, else main)
#   --base-dir DIR    use this checkout as the base instead of extracting REF
#   --head-dir DIR    the head checkout (default: the checkout holding this script)
#   --work DIR        where the two sites and the reports go (default: a new temporary folder)
#   --no-sim          size and render only (no SPICE runs); quicker, no simulation differences
#   --strict          the head build fails on simulations that disagree or fail (as in CI)
#   --markdown        print the Markdown report instead of the text one
#   --summary FILE    append the Markdown report (at most --limit rows per section) to FILE
#   --limit N         rows per section in the --summary report (default 300)
#   --fail-on KINDS   passed to `pulsewright diff` (exit 1 when such a difference exists)
#
# Nothing is published and nothing in either checkout is changed, apart from the shared
# simulation cache (.cache/sim of the head, content-addressed: see src/verify/cache.ts).
# Exit status: the head build's when it fails, else 1 for a --fail-on gate, else 0.
set -euo pipefail

die() { echo "review-diff: $*" >&2; exit 2; }

base_ref="" base_dir="" head_dir="" work="" markdown=0 summary="" limit=300 fail_on="" build_flags=() head_flags=()
while [ $# -gt 0 ]; do
  case "$1" in
    --base) base_ref="${2:?--base needs a ref}"; shift 2 ;;
    --base-dir) base_dir="${2:?--base-dir needs a folder}"; shift 2 ;;
    --head-dir) head_dir="${2:?--head-dir needs a folder}"; shift 2 ;;
    --work) work="${2:?--work needs a folder}"; shift 2 ;;
    --no-sim) build_flags+=(--no-sim); shift ;;
    --strict) head_flags+=(--strict); shift ;;
    --markdown) markdown=1; shift ;;
    --summary) summary="${2:?--summary needs a file}"; shift 2 ;;
    --limit) limit="${2:?--limit needs a number}"; shift 2 ;;
    --fail-on) fail_on="${2:?--fail-on needs kinds}"; shift 2 ;;
    -h|--help) sed -n '2,/^set -euo/p' "$0" | sed '$d; s/^# \{0,1\}//'; exit 0 ;;
    *) die "unknown option \"$1\" (see --help)" ;;
  esac
done
[ -n "$base_ref" ] && [ -n "$base_dir" ] && die "--base and --base-dir exclude each other"

head_dir="$(cd "${head_dir:-$(dirname "$0")/..}" && pwd)"
[ -f "$head_dir/bin/pulsewright.mjs" ] || die "$head_dir is not a pulsewright checkout (no bin/pulsewright.mjs)"
if [ -z "$work" ]; then work="$(mktemp -d "${TMPDIR:-/tmp}/pulsewright-review.XXXXXX")"; fi
mkdir -p "$work"
work="$(cd "$work" && pwd)"
rm -f "$work/diff.txt" "$work/diff.md" "$work/diff-summary.md"

# The base: a checkout given, or the ref extracted from git (no worktree or branch is touched).
if [ -z "$base_dir" ]; then
  if [ -z "$base_ref" ]; then
    base_ref=main
    if git -C "$head_dir" rev-parse -q --verify origin/main >/dev/null; then base_ref=origin/main; fi
  fi
  git -C "$head_dir" rev-parse -q --verify "$base_ref^{commit}" >/dev/null || die "no such git ref: $base_ref"
  base_dir="$work/base"
  rm -rf "$base_dir" && mkdir -p "$base_dir"
  git -C "$head_dir" archive "$base_ref" | tar -x -C "$base_dir"
  echo "base: $base_ref ($(git -C "$head_dir" rev-parse --short "$base_ref")) extracted into $base_dir" >&2
fi
base_dir="$(cd "$base_dir" && pwd)"

# The base runs its own program: the head's packages when the lock files agree, else its own.
if [ ! -e "$base_dir/node_modules" ]; then
  if cmp -s "$base_dir/package-lock.json" "$head_dir/package-lock.json"; then
    ln -s "$head_dir/node_modules" "$base_dir/node_modules"
  else
    echo "base: package-lock.json differs from the head's — npm ci in $base_dir" >&2
    (cd "$base_dir" && npm ci --no-audit --no-fund >&2)
  fi
fi
# One simulation cache for both builds. Entries are named by a hash of the netlist and everything
# else the measurements depend on, so sharing is safe: a changed deck never finds an old entry.
mkdir -p "$head_dir/.cache/sim"
if [ ! -e "$base_dir/.cache" ]; then ln -s "$head_dir/.cache" "$base_dir/.cache"; fi

build() { # name dir [flags...]
  local name="$1" dir="$2"
  shift 2
  echo "building the $name into $work/site-$name" >&2
  (cd "$dir" && node bin/pulsewright.mjs build --out "$work/site-$name" "$@" >&2)
}
base_rc=0 head_rc=0
build base "$base_dir" ${build_flags[@]+"${build_flags[@]}"} || base_rc=$?
build head "$head_dir" ${build_flags[@]+"${build_flags[@]}"} ${head_flags[@]+"${head_flags[@]}"} || head_rc=$?

diff_cmd() { (cd "$work" && node "$head_dir/bin/pulsewright.mjs" diff site-base site-head "$@"); }
diff_rc=0
if [ "$base_rc" -ne 0 ] || [ ! -f "$work/site-base/catalogue.json" ]; then
  note="The base could not be built (exit $base_rc): there is nothing to compare the head with."
  echo "$note" > "$work/diff.txt"
  printf '### What this change does to the catalogue\n\n%s\n' "$note" | tee "$work/diff-summary.md" > "$work/diff.md"
elif [ ! -f "$work/site-head/catalogue.json" ]; then
  note="The head could not be built (exit $head_rc): see the build step's log."
  echo "$note" > "$work/diff.txt"
  printf '### What this change does to the catalogue\n\n%s\n' "$note" | tee "$work/diff-summary.md" > "$work/diff.md"
else
  gate=()
  if [ -n "$fail_on" ]; then gate=(--fail-on "$fail_on"); fi
  diff_cmd ${gate[@]+"${gate[@]}"} > "$work/diff.txt" || diff_rc=$?
  [ "$diff_rc" -le 1 ] || exit "$diff_rc"
  diff_cmd --markdown > "$work/diff.md"
  diff_cmd --markdown --limit "$limit" > "$work/diff-summary.md"
  if [ "$head_rc" -ne 0 ]; then
    printf '\n> The head build exited with status %s (with --strict: a simulation disagreed or failed).\n' \
      "$head_rc" >> "$work/diff-summary.md"
  fi
fi
if [ -n "$summary" ]; then cat "$work/diff-summary.md" >> "$summary"; fi
if [ "$markdown" -eq 1 ]; then cat "$work/diff.md"; else cat "$work/diff.txt"; fi
echo "reports: $work/diff.txt, $work/diff.md; sites: $work/site-base, $work/site-head" >&2
if [ "$head_rc" -ne 0 ]; then exit "$head_rc"; fi
exit "$diff_rc"
