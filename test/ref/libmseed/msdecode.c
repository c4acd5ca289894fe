/*
 * msdecode: the reference decoder for Daybreak's miniSEED tests, built on libmseed 2.19.
 *
 *   msdecode IN.mseed OUT.bin
 *
 * Reads every record of IN with ms_readmsr_r (record length detected per record, samples
 * unpacked by libmseed) and prints one JSON object on stdout:
 *
 *   { "records":  [ {offset, id, quality, start, rate, count, encoding, byteorder, reclen,
 *                    type, numsamples, sampleOffset, actFlags, ioFlags, dqFlags,
 *                    timingQuality, b1001usec, hasB100}, ... ],
 *     "segments": [ {id, start, end, rate, count, type, numsamples, sampleOffset}, ... ],
 *     "error": null | {code, offset, message} }
 *
 * Times are integer microseconds since the epoch (libmseed hptime, HPTMODULUS 1000000), record
 * start times as libmseed corrects them (time correction and blockette 1001 applied, see
 * msr_starttime(3)). Segments are libmseed's trace list (mstl_addmsr(3): merged per source name
 * ignoring quality, autoheal, default time tolerance of half a sample and default rate tolerance).
 * Rates are printed with 17 significant digits, which round-trip a double exactly.
 *
 * Samples go to OUT.bin in host byte order, exactly as libmseed unpacked them: each record's
 * samples, then each segment's samples; sampleOffset is the byte offset in OUT.bin, type is
 * libmseed's sample type ('i' int32, 'f' float32, 'd' float64, 'a' ASCII bytes).
 */
#include <libmseed.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static long long binpos = 0;

static void put_string (const char *s)
{
  putchar ('"');
  for (; *s; s++)
  {
    unsigned char c = (unsigned char)*s;
    if (c == '"' || c == '\\')
      printf ("\\%c", c);
    else if (c < 0x20 || c >= 0x7f)
      printf ("\\u%04x", c);
    else
      putchar (c);
  }
  putchar ('"');
}

static long long write_samples (FILE *bin, void *data, int64_t n, char type)
{
  long long at = binpos;
  int size = ms_samplesize (type);
  if (n > 0 && size > 0)
  {
    if (fwrite (data, (size_t)size, (size_t)n, bin) != (size_t)n)
    {
      fprintf (stderr, "msdecode: cannot write samples\n");
      exit (3);
    }
    binpos += (long long)size * n;
  }
  return at;
}

int main (int argc, char **argv)
{
  if (argc != 3)
  {
    fprintf (stderr, "usage: msdecode IN.mseed OUT.bin\n");
    return 2;
  }
  FILE *bin = fopen (argv[2], "wb");
  if (!bin)
  {
    fprintf (stderr, "msdecode: cannot open %s\n", argv[2]);
    return 2;
  }

  MSFileParam *msfp = NULL;
  MSRecord *msr = NULL;
  MSTraceList *mstl = mstl_init (NULL);
  off_t fpos = 0;
  int retcode;
  int first = 1;
  char srcname[50];

  printf ("{\"records\":[");
  while ((retcode = ms_readmsr_r (&msfp, &msr, argv[1], 0, &fpos, NULL, 1, 1, 0)) == MS_NOERROR)
  {
    snprintf (srcname, sizeof srcname, "%s.%s.%s.%s", msr->network, msr->station, msr->location, msr->channel);
    long long at = write_samples (bin, msr->datasamples, msr->numsamples, msr->sampletype);
    printf ("%s\n{\"offset\":%lld,\"id\":", first ? "" : ",", (long long)fpos);
    put_string (srcname);
    printf (",\"quality\":\"%c\",\"start\":%lld,\"rate\":%.17g,\"count\":%lld,\"encoding\":%d,"
            "\"byteorder\":%d,\"reclen\":%d,\"type\":\"%c\",\"numsamples\":%lld,\"sampleOffset\":%lld,"
            "\"actFlags\":%d,\"ioFlags\":%d,\"dqFlags\":%d,\"timingQuality\":%d,\"b1001usec\":%d,\"hasB100\":%s}",
            msr->dataquality ? msr->dataquality : ' ', (long long)msr->starttime, msr->samprate,
            (long long)msr->samplecnt, msr->encoding, msr->byteorder, msr->reclen,
            msr->sampletype ? msr->sampletype : ' ', (long long)msr->numsamples, at,
            msr->fsdh->act_flags, msr->fsdh->io_flags, msr->fsdh->dq_flags,
            msr->Blkt1001 ? msr->Blkt1001->timing_qual : -1,
            msr->Blkt1001 ? msr->Blkt1001->usec : 0,
            msr->Blkt100 ? "true" : "false");
    first = 0;
    if (!mstl_addmsr (mstl, msr, 0, 1, -1.0, -1.0))
    {
      fprintf (stderr, "msdecode: mstl_addmsr failed for %s\n", srcname);
      return 3;
    }
  }
  printf ("],\n\"segments\":[");
  first = 1;
  for (MSTraceID *id = mstl->traces; id; id = id->next)
  {
    snprintf (srcname, sizeof srcname, "%s.%s.%s.%s", id->network, id->station, id->location, id->channel);
    for (MSTraceSeg *seg = id->first; seg; seg = seg->next)
    {
      long long at = write_samples (bin, seg->datasamples, seg->numsamples, seg->sampletype);
      printf ("%s\n{\"id\":", first ? "" : ",");
      put_string (srcname);
      printf (",\"start\":%lld,\"end\":%lld,\"rate\":%.17g,\"count\":%lld,\"type\":\"%c\","
              "\"numsamples\":%lld,\"sampleOffset\":%lld}",
              (long long)seg->starttime, (long long)seg->endtime, seg->samprate,
              (long long)seg->samplecnt, seg->sampletype ? seg->sampletype : ' ',
              (long long)seg->numsamples, at);
      first = 0;
    }
  }
  printf ("],\n\"error\":");
  if (retcode == MS_ENDOFFILE)
    printf ("null");
  else
  {
    printf ("{\"code\":%d,\"offset\":%lld,\"message\":", retcode, (long long)fpos);
    put_string (ms_errorstr (retcode));
    printf ("}");
  }
  printf ("}\n");

  ms_readmsr_r (&msfp, &msr, NULL, 0, NULL, NULL, 0, 0, 0);
  mstl_free (&mstl, 0);
  if (fclose (bin) != 0)
    return 3;
  return 0;
}
