/** ms in a day: the one definition every package converts days with. */
export const DAY_MS = 86_400_000;
