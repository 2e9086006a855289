/** One series of a chart: the data key and its label. */
export interface Series {
  key: string;
  label: string;
}
