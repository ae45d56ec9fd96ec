// A property computed on first read and then stored as a plain data property. Enumerable, so
// JSON, structured clone and deep equality see the value as if it had always been there.
export function defineLazyProperty<T extends object, K extends keyof T>(target: T, key: K, compute: () => T[K]): void {
  const settle = (value: T[K]): void => {
    Object.defineProperty(target, key, { value, writable: true, enumerable: true, configurable: true });
  };
  Object.defineProperty(target, key, {
    enumerable: true,
    configurable: true,
    get(): T[K] {
      const value = compute();
      settle(value);
      return value;
    },
    set(value: T[K]) {
      settle(value);
    },
  });
}
