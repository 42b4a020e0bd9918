/** Units of time, defined once (SI second; a minute of 60 s, an hour of 3600 s, a day of 24 h). */

/** Milliseconds in one second. */
export const MS_PER_S = 1000;
/** Seconds in one minute. */
export const SECONDS_PER_MINUTE = 60;
/** Seconds in one hour: Wh = J / 3600, Ah = C / 3600. */
export const SECONDS_PER_HOUR = 3600;
/** Hours in one day. */
export const HOURS_PER_DAY = 24;
/** Seconds in one day. */
export const SECONDS_PER_DAY = SECONDS_PER_HOUR * HOURS_PER_DAY;
/** Milliseconds in one minute. */
export const MS_PER_MINUTE = MS_PER_S * SECONDS_PER_MINUTE;
/** Milliseconds in one hour. */
export const MS_PER_HOUR = MS_PER_S * SECONDS_PER_HOUR;
