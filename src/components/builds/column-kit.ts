/** What the part tables' column definitions share. */
export type Opt = Array<{ value: string; label: string }>;

/** A number field's value for the document: a blank field is NaN, which the schema refuses by name. */
export const num = (v: number | null) => (v === null ? Number.NaN : v);
