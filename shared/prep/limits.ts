/** Stock counts above this are certainly a typing error (a tub holds several hundred pieces). */
export const MAX_STOCK = 1_000_000;

/** Lessons longer than this are a data error (a school day's teaching time). */
export const MAX_WINDOW_MINUTES = 480;
