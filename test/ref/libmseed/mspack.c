/*
 * mspack: packs test signals into miniSEED records with libmseed 2.19 (msr_pack(3)), as the
 * reference writer for Daybreak's reader tests.
 *
 *   mspack OUT.mseed key=value ...
 *
 * Keys: samples=FILE (raw samples in host byte order), type=i|f|d|a (int32, float32, float64,
 * ASCII bytes), net, sta, loc, cha, quality (D R Q M), start (integer microseconds since the
 * epoch), rate (Hz, any double strtod reads), encoding (0 1 3 4 5 10 11), byteorder (0 little,
 * 1 big), reclen (bytes), seq (first sequence number), append (1 to append to OUT),
 * b1001 (1, the default, adds a blockette 1001 to the template so that libmseed writes the start
 * time's microseconds beyond the 0.0001 s BTIME; without it msr_pack rounds them away),
 * b100 (1 adds a blockette 100 holding the rate as a float, default 0).
 *
 * Every record is written to OUT as libmseed hands it to the record handler. Prints
 * {"records": N, "samples": M, "seconds": S} on stdout: records written, samples packed and the
 * wall-clock time msr_pack took (the reference for the writer's speed).
 */
#include <libmseed.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

static FILE *out = NULL;
static int written = 0;

static void record_handler (char *record, int reclen, void *unused)
{
  (void)unused;
  if (fwrite (record, (size_t)reclen, 1, out) != 1)
  {
    fprintf (stderr, "mspack: cannot write record\n");
    exit (3);
  }
  written++;
}

static const char *arg (int argc, char **argv, const char *key, const char *fallback)
{
  size_t n = strlen (key);
  for (int i = 2; i < argc; i++)
    if (strncmp (argv[i], key, n) == 0 && argv[i][n] == '=')
      return argv[i] + n + 1;
  return fallback;
}

int main (int argc, char **argv)
{
  if (argc < 3)
  {
    fprintf (stderr, "usage: mspack OUT.mseed samples=FILE type=i|f|d|a [key=value ...]\n");
    return 2;
  }
  const char *samplesPath = arg (argc, argv, "samples", NULL);
  char type = arg (argc, argv, "type", "i")[0];
  int size = ms_samplesize (type);
  if (!samplesPath || size <= 0)
  {
    fprintf (stderr, "mspack: samples=FILE and type=i|f|d|a are required\n");
    return 2;
  }
  FILE *in = fopen (samplesPath, "rb");
  if (!in)
  {
    fprintf (stderr, "mspack: cannot open %s\n", samplesPath);
    return 2;
  }
  fseek (in, 0, SEEK_END);
  long bytes = ftell (in);
  fseek (in, 0, SEEK_SET);
  void *data = malloc (bytes > 0 ? (size_t)bytes : 1);
  if (bytes > 0 && fread (data, 1, (size_t)bytes, in) != (size_t)bytes)
  {
    fprintf (stderr, "mspack: cannot read %s\n", samplesPath);
    return 2;
  }
  fclose (in);

  MSRecord *msr = msr_init (NULL);
  strncpy (msr->network, arg (argc, argv, "net", "XX"), 10);
  strncpy (msr->station, arg (argc, argv, "sta", "TEST"), 10);
  strncpy (msr->location, arg (argc, argv, "loc", ""), 10);
  strncpy (msr->channel, arg (argc, argv, "cha", "HHZ"), 10);
  msr->dataquality = arg (argc, argv, "quality", "D")[0];
  msr->starttime = (hptime_t)strtoll (arg (argc, argv, "start", "0"), NULL, 10);
  msr->samprate = strtod (arg (argc, argv, "rate", "100"), NULL);
  msr->encoding = (int8_t)atoi (arg (argc, argv, "encoding", "11"));
  msr->byteorder = (int8_t)atoi (arg (argc, argv, "byteorder", "1"));
  msr->reclen = atoi (arg (argc, argv, "reclen", "4096"));
  msr->sequence_number = atoi (arg (argc, argv, "seq", "1"));
  msr->datasamples = data;
  msr->numsamples = bytes / size;
  msr->sampletype = type;

  if (atoi (arg (argc, argv, "b1001", "1")))
  {
    struct blkt_1001_s b1001;
    memset (&b1001, 0, sizeof b1001);
    if (!msr_addblockette (msr, (char *)&b1001, sizeof b1001, 1001, 0))
    {
      fprintf (stderr, "mspack: cannot add blockette 1001\n");
      return 3;
    }
  }

  if (atoi (arg (argc, argv, "b100", "0")))
  {
    struct blkt_100_s b100;
    memset (&b100, 0, sizeof b100);
    b100.samprate = (float)msr->samprate;
    if (!msr_addblockette (msr, (char *)&b100, sizeof b100, 100, 0))
    {
      fprintf (stderr, "mspack: cannot add blockette 100\n");
      return 3;
    }
  }

  out = fopen (argv[1], atoi (arg (argc, argv, "append", "0")) ? "ab" : "wb");
  if (!out)
  {
    fprintf (stderr, "mspack: cannot open %s\n", argv[1]);
    return 2;
  }
  int64_t packed = 0;
  struct timespec t0, t1;
  clock_gettime (CLOCK_MONOTONIC, &t0);
  int records = msr_pack (msr, record_handler, NULL, &packed, 1, 0);
  clock_gettime (CLOCK_MONOTONIC, &t1);
  if (records < 0)
  {
    fprintf (stderr, "mspack: msr_pack failed\n");
    return 3;
  }
  if (fclose (out) != 0)
    return 3;
  printf ("{\"records\":%d,\"samples\":%lld,\"seconds\":%.9f}\n", written, (long long)packed,
          (double)(t1.tv_sec - t0.tv_sec) + 1e-9 * (double)(t1.tv_nsec - t0.tv_nsec));
  msr->datasamples = NULL;
  msr_free (&msr);
  free (data);
  return 0;
}
