import { z } from 'zod';

/**
 * A stored record's version (plans, stations, walkthroughs). A write names the version it was read
 * at, and a write against any other is refused with 409 rather than overwrite someone's change.
 */
export const VersionSchema = z
  .number()
  .int('version must be a whole number')
  .min(1, 'version must be at least 1');

/** The same where it travels as text: a query string or a multipart form field. */
export const VersionTextSchema = z.coerce.number().pipe(VersionSchema);
