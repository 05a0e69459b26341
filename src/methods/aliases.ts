// Other names under which the built-in methods are published or widely known, so a user can type
// them. Each alias names the same method (the same coefficients and error estimate); the tests
// check the coefficients behind each alias against the code or paper the alias comes from.
export const METHOD_ALIASES: Readonly<Record<string, string>> = {
  // DOPRI5: Hairer and Wanner's code of the Dormand-Prince 5(4) pair (Solving ODEs I, sec. II.5).
  dopri5: 'dormand-prince-54',
  // DOP853: their code of Dormand-Prince 8(5,3) (Solving ODEs I, sec. II.10).
  dop853: 'dormand-prince-853',
  // "RK45" as SciPy's solve_ivp names it: the Dormand-Prince 5(4) pair (not Fehlberg's, which is
  // `fehlberg-45`).
  rk45: 'dormand-prince-54',
  // RADAU5: Hairer and Wanner's code of Radau IIA of order 5 (Solving ODEs II, sec. IV.8).
  radau5: 'radau-iia-5',
  // RODAS4: Hairer and Wanner's Rosenbrock method (Solving ODEs II, sec. IV.7).
  rodas4: 'hairer-wanner-rodas4',
  // TR-BDF2: Bank et al.'s trapezoidal rule / BDF2 method, Hosea-Shampine error estimate.
  'tr-bdf2': 'trapezoidal-bdf2',
};
