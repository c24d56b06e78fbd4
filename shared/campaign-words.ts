// Campaign words and bounds the public pages show, apart from the zod schemas so a page can use them without zod.

/** Bounds of a custom pledge, in minor units of the campaign currency (1.00 … 25,000.00). */
export const PLEDGE_MIN_MINOR = 100;
export const PLEDGE_MAX_MINOR = 2_500_000;

/** The one name, on every screen and in every e-mail, for a pledge that picks no thank-you gift. */
export const NO_GIFT_LABEL = 'Support without a gift';
/** The one name of the public list of backers' names that some gifts promise. */
export const SAIL_ROLL_LABEL = 'Sail roll';
