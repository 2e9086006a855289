/**
 * Chart colours: distinguishable for common colour-vision deficiencies (blue/orange/teal/
 * purple/grey family, after the Okabe–Ito set) and each ≥ 3:1 against white for graphical
 * objects (WCAG 2.2 SC 1.4.11). Series are also labelled in legends and the table view, so
 * colour is never the only cue.
 */
export const SERIES_COLORS = ['#0b6fa4', '#b45f06', '#067647', '#7a4cc2', '#57534e', '#b42318'] as const;
