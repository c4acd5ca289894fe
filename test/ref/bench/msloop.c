/*
 * msloop: libmseed 2.19's record-by-record decode loop, the reference beside which the decode
 * benchmark (test/bench/mseed.bench.ts) measures the project's reader.
 *
 *   msloop FILE.mseed REPEATS [keep]
 *
 * Reads FILE into memory once (not timed), then REPEATS times walks it record by record with
 * msr_parse(3) (dataflag set: the header is parsed and the samples unpacked by msr_unpack) and
 * sums the samples. Without `keep` each record's samples are left in libmseed's one reused
 * per-record buffer (they are gone when the next record is parsed). With `keep` the loop also
 * delivers what a caller who wants the samples needs: every record's samples are appended to an
 * array per channel (found by msr_srcname; grown by doubling with realloc, which glibc does with
 * mremap for large blocks, so without copying), so the output memory is newly written as a
 * reader's output is. The arrays are summed and freed after the timed pass. Prints one JSON
 * object on stdout:
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
#include <string.h>
#include <time.h>

/** One channel's kept samples (keep mode). */
typedef struct
{
  char id[64];
  int32_t *samples;
  int64_t count, capacity;
} Kept;

#define MAX_KEPT 64

static double now (void)
{
  struct timespec ts;
  clock_gettime (CLOCK_MONOTONIC, &ts);
  return (double)ts.tv_sec + (double)ts.tv_nsec * 1e-9;
}

int main (int argc, char **argv)
{
  if (argc != 3 && !(argc == 4 && strcmp (argv[3], "keep") == 0))
  {
    fprintf (stderr, "usage: msloop FILE.mseed REPEATS [keep]\n");
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

  int keep = argc == 4;
  static Kept kept[MAX_KEPT];
  int nkept = 0;
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
      if (keep)
      {
        if (msr->sampletype != 'i')
        {
          fprintf (stderr, "msloop: keep mode takes integer samples only (byte %ld)\n", offset);
          return 3;
        }
        char id[64];
        msr_srcname (msr, id, 0);
        int k = nkept - 1;
        if (k < 0 || strcmp (kept[k].id, id) != 0)
          for (k = 0; k < nkept && strcmp (kept[k].id, id) != 0; k++)
            ;
        if (k == nkept)
        {
          if (nkept == MAX_KEPT)
          {
            fprintf (stderr, "msloop: more than %d channels\n", MAX_KEPT);
            return 3;
          }
          strcpy (kept[k].id, id);
          kept[k].samples = NULL;
          kept[k].count = kept[k].capacity = 0;
          nkept++;
        }
        Kept *c = &kept[k];
        if (c->count + msr->numsamples > c->capacity)
        {
          int64_t cap = c->capacity ? c->capacity : 1 << 16;
          while (cap < c->count + msr->numsamples)
            cap *= 2;
          c->samples = realloc (c->samples, (size_t)cap * sizeof (int32_t));
          if (!c->samples)
          {
            fprintf (stderr, "msloop: out of memory\n");
            return 3;
          }
          c->capacity = cap;
        }
        memcpy (c->samples + c->count, msr->datasamples, (size_t)msr->numsamples * sizeof (int32_t));
        c->count += msr->numsamples;
      }
      else if (msr->sampletype == 'i')
      {
        const int32_t *s = (const int32_t *)msr->datasamples;
        for (int64_t i = 0; i < msr->numsamples; i++)
          sum += s[i];
      }
      offset += msr->reclen;
    }
    double t = now () - t0;
    msr_free (&msr);
    for (int k = 0; k < nkept; k++)
    {
      for (int64_t i = 0; i < kept[k].count; i++)
        sum += kept[k].samples[i];
      free (kept[k].samples);
    }
    nkept = 0;
    if (t < best)
      best = t;
    printf ("%s%.6f", r ? ", " : "", t);
  }
  printf ("], \"records\": %lld, \"samples\": %lld, \"sum\": %lld, \"best\": %.6f}\n", records, samples, sum, best);
  free (buf);
  return 0;
}
