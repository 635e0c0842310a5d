/**
 * Compile-time proof that a schema's output is the stored type it stands for (db/types/), both
 * ways: `type _Fits = Proven<SameShape<z.output<typeof schema>, StoredType>>` fails to compile
 * when either side gains, loses or changes a field.
 */
export type SameShape<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
export type Proven<T extends true> = T;
