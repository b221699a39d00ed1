/**
 * The one scalar root finder: Brent's method (inverse quadratic interpolation and secant steps,
 * falling back to bisection whenever they would not shrink the bracket fast enough), after
 * R. P. Brent, Algorithms for Minimization without Derivatives, 1973, ch. 4 (procedure `zero`). [src:brent-1973]
 * It needs a sign change on [lo, hi] and converges for any continuous f: never slower than
 * bisection by more than a small factor, superlinear near a simple root.
 */
import { EngineMisuseError } from "../../model/errors.ts";

/** The caller handed a bracket with no sign change, a non-finite value, or too small a budget. */
export class RootFinderError extends EngineMisuseError {
  constructor(message: string) {
    super(message);
    this.name = "RootFinderError";
  }
}

export interface RootOptions {
  /** Absolute tolerance on x (default 0: as far as double precision allows). */
  xTolAbs?: number;
  /** Relative tolerance on x (default 0). */
  xTolRel?: number;
  /** Most iterations before giving up with a RootFinderError (default 200). */
  maxIter?: number;
  /** Names the caller in error messages. */
  what?: string;
}

const EPS = Number.EPSILON;

/** x in [lo, hi] with f(x) = 0 within the tolerances; f(lo) and f(hi) must differ in sign (or be 0). */
export function findRoot(f: (x: number) => number, lo: number, hi: number, opts: RootOptions = {}): number {
  const what = opts.what ?? "findRoot";
  const xAbs = opts.xTolAbs ?? 0;
  const xRel = opts.xTolRel ?? 0;
  const maxIter = opts.maxIter ?? 200;
  if (!Number.isFinite(lo) || !Number.isFinite(hi))
    throw new RootFinderError(`${what}: bracket must be finite, got [${lo}, ${hi}]`);
  let a = lo;
  let b = hi;
  let fa = f(a);
  let fb = f(b);
  if (!Number.isFinite(fa) || !Number.isFinite(fb))
    throw new RootFinderError(`${what}: f is not finite at the bracket ends (f(${a}) = ${fa}, f(${b}) = ${fb})`);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (Math.sign(fa) === Math.sign(fb)) {
    throw new RootFinderError(
      `${what}: no sign change on [${a}, ${b}] (f = ${fa}, ${fb}); widen the bracket or check the equation`,
    );
  }
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < maxIter; iter++) {
    if (Math.sign(fb) === Math.sign(fc)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * EPS * Math.abs(b) + 0.5 * (xAbs + xRel * Math.abs(b));
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) < tol || Math.abs(fa) <= Math.abs(fb)) {
      d = m;
      e = m; // bisection
    } else {
      let p: number;
      let q: number;
      const s = fb / fa;
      if (a === c) {
        p = 2 * m * s; // secant
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1)); // inverse quadratic interpolation
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
    if (!Number.isFinite(fb)) throw new RootFinderError(`${what}: f(${b}) is not finite`);
  }
  throw new RootFinderError(
    `${what}: no convergence in ${maxIter} iterations on [${lo}, ${hi}]; raise maxIter or loosen the tolerance`,
  );
}
