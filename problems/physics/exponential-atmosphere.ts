// Exponential atmosphere model: base altitude (km) and nominal density at that altitude (kg/m^3),
// as tabulated in Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., table 8-4
// (values from memory of that table; the scale heights it also lists are not used here).
// Interpolating log density linearly between the base altitudes gives an exponential profile in
// each band, the model's own form, continuous at the band edges.
export const ATMOSPHERE_ALTITUDE_KM = [
  0, 25, 30, 40, 50, 60, 70, 80, 90, 100, 110, 120, 130, 140, 150, 180, 200, 250, 300, 350, 400, 450,
  500, 600, 700, 800, 900, 1000,
];
export const ATMOSPHERE_DENSITY = [
  1.225, 3.899e-2, 1.774e-2, 3.972e-3, 1.057e-3, 3.206e-4, 8.77e-5, 1.905e-5, 3.396e-6, 5.297e-7, 9.661e-8,
  2.438e-8, 8.484e-9, 3.845e-9, 2.07e-9, 5.464e-10, 2.789e-10, 7.248e-11, 2.418e-11, 9.518e-12, 3.725e-12,
  1.585e-12, 6.967e-13, 1.454e-13, 3.614e-14, 1.17e-14, 5.245e-15, 3.019e-15,
];
