/** Response types used by several resources of the API (docs/api.md); framework-free types only. */

/** `Difference` of docs/api.md: a changed value at a dotted path; `change` = b − a for numbers. */
export interface Difference {
  readonly path: string;
  readonly a: unknown;
  readonly b: unknown;
  readonly change?: number;
}

/** One entry of a document's revision list. */
export interface RevisionRow {
  readonly revision: number;
  readonly message: string | null;
  readonly authorName: string | null;
  readonly createdAt: string;
}

/** `GET …/compare?from=&to=` of a vehicle or axle design: the changed values of two revisions. */
export interface RevisionCompare {
  readonly from: number;
  readonly to: number;
  readonly changes: readonly Difference[];
}

/** The one error shape of the API: every refusal and failure answers `{ error: { code, message, details? } }`. */
export interface ApiErrorBody {
  readonly error: {
    readonly code: string;
    readonly message: string;
    readonly details?: unknown;
  };
}
