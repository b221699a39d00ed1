/**
 * A result whose bulk is worked out when first read. The sizing tries arrangement after arrangement
 * (size.ts) and keeps the first whose core passes; a core that does not pass is mostly left unread
 * beyond its verdict, so the rest of its result (its whole worst case, figures, parts and problems:
 * timing.ts designTiming) is made only if something reads it, then kept. `make` must be pure: the
 * object it returns is the one every later read sees, so a reader cannot tell the two apart.
 */
export function deferred<T extends object, K extends keyof T>(eager: Pick<T, K>, make: () => T): T {
  let made: T | undefined;
  const full = (): T => (made ??= make());
  const isEager = (key: PropertyKey): key is K => Object.prototype.hasOwnProperty.call(eager, key);
  return new Proxy(eager as T, {
    get: (target, key) => (isEager(key) ? target[key] : Reflect.get(full(), key)),
    has: (_target, key) => Reflect.has(full(), key),
    ownKeys: () => Reflect.ownKeys(full()),
    getOwnPropertyDescriptor: (target, key) => {
      const d = Reflect.getOwnPropertyDescriptor(full(), key);
      // A property the target holds is reported as the target holds it (a proxy's invariant).
      return d === undefined || !isEager(key) ? d : { ...d, value: target[key] };
    },
    set: () => false,
    defineProperty: () => false,
    deleteProperty: () => false,
  });
}
