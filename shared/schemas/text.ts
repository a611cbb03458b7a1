import { z } from 'zod';

// Building blocks every input schema uses for free text and for instants, so that what the
// database cannot store is refused at the edge with a field message instead of failing deep
// inside a write (a JSON column rejects a lone surrogate; DATETIME stops at year 9999).

/** A UTF-16 high surrogate not followed by a low one, or a low one without a high one before it. */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

export const LONE_SURROGATE_MESSAGE = 'This text contains a broken character (a lone UTF-16 surrogate). Retype or paste it again.';

export const hasLoneSurrogate = (value: string) => LONE_SURROGATE.test(value);

/**
 * A string that is well-formed Unicode. Use it wherever a schema takes text
 * (`plainText().trim().max(…)` chains like `z.string()`).
 */
export const plainText = (params?: Parameters<typeof z.string>[0]) =>
  z.string(params).refine((v) => !hasLoneSurrogate(v), LONE_SURROGATE_MESSAGE);

/**
 * The instants Faultline accepts anywhere: from 2000-01-01 (before any facility's records in
 * this system) to the end of 2099 (far beyond any planned return or report period). The
 * database's DATETIME(3) would take years 1000–9999, but a date outside this window is always
 * a typo or an attack, and refusing it keeps every later computation inside safe numbers.
 */
export const EARLIEST_INSTANT = new Date('2000-01-01T00:00:00.000Z');
export const LATEST_INSTANT = new Date('2100-01-01T00:00:00.000Z');

export const INSTANT_RANGE_MESSAGE = 'Give a date between the years 2000 and 2099.';

export const isInstantInRange = (value: string | Date) => {
  const ms = typeof value === 'string' ? Date.parse(value) : value.getTime();
  return Number.isFinite(ms) && ms >= EARLIEST_INSTANT.getTime() && ms < LATEST_INSTANT.getTime();
};

/**
 * An ISO 8601 date and time with a UTC offset, within [EARLIEST_INSTANT, LATEST_INSTANT).
 * Stays a string (callers add `.transform((v) => new Date(v))` where they want a Date).
 */
export const isoInstant = (error = 'Give the time as a date and time.') =>
  z.iso.datetime({ offset: true, error }).refine((v) => isInstantInRange(v), INSTANT_RANGE_MESSAGE);
