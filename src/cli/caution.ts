// The caution every report and recommendation carries.
export const CAUTION_TEXT =
  'Caution: these figures are numerical evidence about integration error on the problems run, not certification. ' +
  'Defer to the applicable verification standards, local codes and licensed review before using them in flight, vehicle or plant software.';
