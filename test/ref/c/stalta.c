/*
 * stalta: the recursive STA/LTA (Withers et al., 1998, BSSA 88(1)) as a plain C loop, the reference
 * beside which the benchmark (test/bench/stalta.bench.ts) measures core/pick/staLta.ts. It does the
 * same arithmetic as the TypeScript in its default setting: CF = x^2, median of the last three CF
 * values (DESPIKE 1, the default; 0 leaves the CF as it is), plain means over the first SEED samples,
 * then coefficients 1/NS and 1/NL, ratio STA/LTA (0 where the LTA is 0).
 *
 *   stalta FILE.f64 NS NL SEED REPEATS [DESPIKE]
 *
 * FILE holds little-endian float64 samples; it is read into memory once (not timed). The loop runs
 * REPEATS times into one output array. Prints one JSON object on stdout:
 *
 *   {"samples": N, "sum": S, "best": SECONDS, "times": [SECONDS, ...]}
 *
 * where "best" is the fastest pass (CLOCK_MONOTONIC) and "sum" the sum of the ratio, so the caller
 * can check both implementations computed the same thing.
 */
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

static double now (void)
{
  struct timespec ts;
  clock_gettime (CLOCK_MONOTONIC, &ts);
  return (double)ts.tv_sec + (double)ts.tv_nsec * 1e-9;
}

static void stalta (const double *x, double *out, long n, long ns, long nl, long seed, int despike)
{
  double sta = 0, lta = 0;
  double a = 1.0 / 0.0, b = -1.0 / 0.0; /* the two CF values before the current one */
  const double cs = 1.0 / (double)ns, cl = 1.0 / (double)nl;
  for (long i = 0; i < n; i++)
  {
    double c = x[i] * x[i];
    double m = c;
    if (despike)
    {
      if (a < b)
        m = b < c ? b : (a < c ? c : a);
      else
        m = a < c ? a : (b < c ? c : b);
      a = b;
      b = c;
    }
    if (i < seed)
    {
      long k = i + 1;
      sta += (m - sta) / (double)(k < ns ? k : ns);
      lta += (m - lta) / (double)k;
    }
    else
    {
      sta += (m - sta) * cs;
      lta += (m - lta) * cl;
    }
    out[i] = lta > 0 ? sta / lta : 0;
  }
}

int main (int argc, char **argv)
{
  if (argc != 6 && argc != 7)
  {
    fprintf (stderr, "usage: stalta FILE.f64 NS NL SEED REPEATS [DESPIKE]\n");
    return 2;
  }
  long ns = atol (argv[2]), nl = atol (argv[3]), seed = atol (argv[4]);
  int repeats = atoi (argv[5]);
  int despike = argc == 7 ? atoi (argv[6]) : 1;
  if (ns < 1 || nl <= ns || seed < 1 || repeats < 1)
  {
    fprintf (stderr, "stalta: need NS >= 1, NL > NS, SEED >= 1, REPEATS >= 1\n");
    return 2;
  }
  FILE *f = fopen (argv[1], "rb");
  if (!f)
  {
    perror (argv[1]);
    return 2;
  }
  fseek (f, 0, SEEK_END);
  long size = ftell (f);
  fseek (f, 0, SEEK_SET);
  long n = size / 8;
  double *x = malloc ((size_t)n * sizeof (double));
  double *out = malloc ((size_t)n * sizeof (double));
  if (!x || !out || fread (x, sizeof (double), (size_t)n, f) != (size_t)n)
  {
    fprintf (stderr, "stalta: cannot read %s\n", argv[1]);
    return 2;
  }
  fclose (f);
  double best = 1e300;
  printf ("{\"samples\": %ld, \"times\": [", n);
  for (int r = 0; r < repeats; r++)
  {
    double t0 = now ();
    stalta (x, out, n, ns, nl, seed, despike);
    double t = now () - t0;
    if (t < best)
      best = t;
    printf ("%s%.6f", r ? ", " : "", t);
  }
  double sum = 0;
  for (long i = 0; i < n; i++)
    sum += out[i];
  printf ("], \"best\": %.6f, \"sum\": %.17g}\n", best, sum);
  free (x);
  free (out);
  return 0;
}
