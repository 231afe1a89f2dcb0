/** One row of a count-of-counts table: `levels` distinct levels each occur exactly `count` times. */
export interface CountOfCounts {
  count: number;
  levels: number;
}
