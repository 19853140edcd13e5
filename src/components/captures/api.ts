/**
 * The captures list parameters and the page event that tells islands the captures changed.
 * The calls themselves are query functions and mutation hooks in ./queries.
 */
/** Filters, sort and page of the captures list, as the list endpoint names them. */
export interface CaptureListParams {
  q?: string;
  owner?: string;
  tag?: string;
  layout?: string;
  datatype?: string;
  /** Hz. */
  minRate?: number;
  /** Hz. */
  maxRate?: number;
  sort: 'name' | 'createdAt' | 'byteSize' | 'sampleRate';
  order: 'asc' | 'desc';
  page: number;
  pageSize: number;
}


/** Event the upload and synthesis islands send so the captures table reloads. */
export const CAPTURES_CHANGED = 'quadrille:captures-changed';

/** Tells other islands on the page that the captures changed. */
export function announceCapturesChanged(): void {
  window.dispatchEvent(new CustomEvent(CAPTURES_CHANGED));
}
