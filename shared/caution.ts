/** Shown with every computed route, reach and timeline, on screen and in every export. */
export const PLANNING_CAUTION =
  "This is a planning aid. It does not replace the programme's certified procedures, flight rules, hardware data and safety review, and its defaults must be checked against them.";
