/**
 * A zod-inferred type without the `[key: string]: unknown` index signatures
 * that loose objects add (at every depth), so the contract types derived from
 * the schemas still refuse a misspelt field. Arrays and typed arrays keep
 * their element types.
 */
export type KnownShape<T> = T extends ArrayBufferView
  ? T
  : T extends readonly (infer U)[]
    ? KnownShape<U>[]
    : T extends object
      ? { [K in keyof T as string extends K ? never : number extends K ? never : K]: KnownShape<T[K]> }
      : T;
