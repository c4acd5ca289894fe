/*
 * msloop: libmseed 2.19's record-by-record decode loop, the reference beside which the decode
 * benchmark (test/bench/mseed.bench.ts) measures the project's reader.
 *
 *   msloop FILE.mseed REPEATS
 *
 * Reads FILE into memory once (not timed), then REPEATS times walks it record by record with
 * msr_parse(3) (dataflag set: the header is parsed and the samples unpacked by msr_unpack) and
 * sums the samples. Prints one JSON object on stdout:
 *
 *   {"records": R, "samples": N, "sum": S, "best": SECONDS, "times": [SECONDS, ...]}
 *
 * where "best" is the fastest pass (CLOCK_MONOTONIC) and "sum" the int64 sum of every sample
 * (integer encodings only), so the caller can check both decoders saw the same data.
 */
#include <libmseed.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

static double now (void)
{
  struct timespec ts;
  clock_gettime (CLOCK_MONOTONIC, &ts);
  return (double)ts.tv_sec + (double)ts.tv_nsec * 1e-9;
}

int main (int argc, char **argv)
{
  if (argc != 3)
  {
    fprintf (stderr, "usage: msloop FILE.mseed REPEATS\n");
    return 2;
  }
  int repeats = atoi (argv[2]);
  if (repeats < 1)
    repeats = 1;
  FILE *f = fopen (argv[1], "rb");
  if (!f)
  {
    perror (argv[1]);
    return 2;
  }
  fseek (f, 0, SEEK_END);
  long size = ftell (f);
  fseek (f, 0, SEEK_SET);
  char *buf = malloc ((size_t)size);
  if (!buf || fread (buf, 1, (size_t)size, f) != (size_t)size)
  {
    fprintf (stderr, "msloop: cannot read %s\n", argv[1]);
    return 2;
  }
  fclose (f);

  long long records = 0, samples = 0, sum = 0;
  double best = 1e300;
  printf ("{\"times\": [");
  for (int r = 0; r < repeats; r++)
  {
    MSRecord *msr = NULL;
    records = samples = sum = 0;
    double t0 = now ();
    long offset = 0;
    while (offset < size)
    {
      int rc = msr_parse (buf + offset, (int)(size - offset), &msr, -1, 1, 0);
      if (rc != MS_NOERROR)
      {
        fprintf (stderr, "msloop: msr_parse returned %d at byte %ld\n", rc, offset);
        return 3;
      }
      records++;
      samples += msr->numsamples;
      if (msr->sampletype == 'i')
      {
        const int32_t *s = (const int32_t *)msr->datasamples;
        for (int64_t i = 0; i < msr->numsamples; i++)
          sum += s[i];
      }
      offset += msr->reclen;
    }
    double t = now () - t0;
    msr_free (&msr);
    if (t < best)
      best = t;
    printf ("%s%.6f", r ? ", " : "", t);
  }
  printf ("], \"records\": %lld, \"samples\": %lld, \"sum\": %lld, \"best\": %.6f}\n", records, samples, sum, best);
  free (buf);
  return 0;
}
