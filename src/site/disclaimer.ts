/**
 * The report's one disclaimer: the HTML footer and every PDF page's footer print this text
 * (base.njk reads it from the global data; the PDF's @page footer is set from it too).
 */
export const DISCLAIMER =
  "Engineering estimates by published methods. They do not replace licensed frequency coordination, local codes and permits, or review by a licensed engineer.";
