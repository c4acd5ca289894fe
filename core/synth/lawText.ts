/** The scenario's magnitude law in words, as written into the truth file and samples/README.md. */
export const IASPEI_LAW_TEXT =
  'ML = log10(A) + 1.11 log10(R) + 0.00189 R - 2.09 (IASPEI 2013 standard form, Hutton & Boore 1987 coefficients); ' +
  'A = zero-to-peak displacement in nm on a horizontal component as a Wood-Anderson instrument with magnification 1 records it ' +
  '(period 0.8 s, damping 0.7; the constant carries the magnification 2080 of Uhrhammer & Collins 1990), ' +
  'taken as the larger of the two horizontals of the direct S wave before noise and coda, times 10^(station term); ' +
  'R = hypocentral distance in km (from the station elevation to the source depth)';
