// The caution every report carries near its top, worded once for HTML and Markdown.

/** The same caution in one paragraph, for terminal output (choose, summaries). */
export const CAUTION_SHORT =
  'Caution: these figures are numerical evidence about integration error on the problems run, not certification. ' +
  'Defer to the applicable verification standards, local codes and licensed review before using them in flight, vehicle or plant software.';

export const CAUTION_TITLE = 'Read this before using these figures';

export const CAUTION_TEXT =
  'The figures in this report are numerical evidence about error on the problems that were run, ' +
  'with the methods and settings listed, on the machine described below. They are not a ' +
  'certification of any method, program or design. Where a result matters for safety, ' +
  'regulation or contract, defer to the applicable verification standards, local codes and ' +
  'licensed professional review.';
