/*
 * Reference bit-true loop in plain C (packages/dsp/README.md, "Bit-true arithmetic"): the same
 * arithmetic as src/sim/bitTrueKernel.ts, in 64-bit integers. Used to prove the TypeScript loop
 * bit-exact (identical checksum) and as the speed reference of the benchmark.
 *
 * Usage: loop PARAMS INPUT [REPEATS]
 *   PARAMS  whitespace-separated integers (bench/cParams.ts writes them):
 *           N P B D Wc Fc Wa rounding overflow waveform S Mhi Mlo G gainShift FS
 *           then 5·S coefficient codes (b0 b1 b2 a1 a2 per section), then 2^P sine-table codes.
 *           rounding: 0 truncate, 1 nearest (half away from zero), 2 half-even; overflow: 0 saturate,
 *           1 wrap; waveform: 0 sine, 1 square.
 *   INPUT   input sample codes, int32 little-endian.
 * Prints one JSON line: {"samples":…,"checksum":…,"seconds":…,"cpuSeconds":…}: wall-clock and
 * process CPU time of the best repeat (CPU time leaves out the time other processes had the core).
 * Assumes gcc's arithmetic right shift of negative integers.
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

typedef struct {
  int n, p, b, d, wc, fc, wa, rounding, overflow, waveform, s;
  uint64_t m;
  int64_t g;
  int gs;
  int32_t fs;
  int64_t *coef;
  int32_t *table;
} params_t;

static int64_t rsh(int64_t v, int s, int mode) {
  if (s <= 0) return (int64_t)((uint64_t)v << -s);
  int64_t q = v >> s;
  if (mode == 0) return q;
  int64_t r = v - (int64_t)((uint64_t)q << s);
  int64_t half = (int64_t)1 << (s - 1);
  if (r > half) return q + 1;
  if (r < half) return q;
  if (mode == 1) return v >= 0 ? q + 1 : q;
  return (q & 1) ? q + 1 : q;
}

/* Signed `bits`-bit word: clamp or keep the low bits sign-extended. */
static int64_t reduce(int64_t v, int bits, int wrap) {
  int64_t max = ((int64_t)1 << (bits - 1)) - 1;
  int64_t min = -max - 1;
  if (v >= min && v <= max) return v;
  if (!wrap) return v > max ? max : min;
  return (int64_t)((uint64_t)v << (64 - bits)) >> (64 - bits);
}

static void fail(const char *what) {
  fprintf(stderr, "loop: %s\n", what);
  exit(2);
}

static void read_params(const char *path, params_t *pp) {
  FILE *f = fopen(path, "r");
  if (!f) fail("cannot open params");
  long long mhi, mlo, g;
  if (fscanf(f, "%d %d %d %d %d %d %d %d %d %d %d %lld %lld %lld %d %d", &pp->n, &pp->p, &pp->b, &pp->d, &pp->wc,
             &pp->fc, &pp->wa, &pp->rounding, &pp->overflow, &pp->waveform, &pp->s, &mhi, &mlo, &g, &pp->gs,
             &pp->fs) != 16)
    fail("bad params header");
  pp->m = ((uint64_t)mhi << 32) | (uint64_t)mlo;
  pp->g = g;
  pp->coef = malloc(sizeof(int64_t) * 5 * pp->s);
  for (int i = 0; i < 5 * pp->s; i++) {
    long long c;
    if (fscanf(f, "%lld", &c) != 1) fail("bad coefficient");
    pp->coef[i] = c;
  }
  int size = 1 << pp->p;
  pp->table = malloc(sizeof(int32_t) * size);
  for (int i = 0; i < size; i++) {
    int t;
    if (fscanf(f, "%d", &t) != 1) fail("bad table");
    pp->table[i] = t;
  }
  fclose(f);
}

static uint32_t run(const params_t *pp, const int32_t *in, long count) {
  const int mode = pp->rounding, wrap = pp->overflow == 1, d = pp->d, s = pp->s;
  const uint64_t mask = pp->n == 64 ? ~(uint64_t)0 : (((uint64_t)1 << pp->n) - 1);
  const int addr_shift = pp->n - pp->p;
  const uint32_t tmask = (1u << pp->p) - 1, quarter = 1u << (pp->p - 2), half_table = 1u << (pp->p - 1);
  const int mac_check = pp->wa < pp->wc + pp->d + 1;
  int64_t st[4 * 8] = {0};
  uint64_t acc = 0;
  uint32_t h = 2166136261u;
  for (long i = 0; i < count; i++) {
    uint32_t addr = (uint32_t)(((acc >> addr_shift) + quarter) & tmask);
    int32_t c = pp->waveform ? (addr < half_table ? pp->fs : -pp->fs) : pp->table[addr];
    int64_t x = in[i];
    int64_t u = reduce(rsh(x * c, pp->b - 1, mode), d, wrap);
    int64_t v = u;
    for (int j = 0; j < s; j++) {
      const int64_t *k = pp->coef + 5 * j;
      int64_t *q = st + 4 * j;
      int64_t a = k[0] * v + k[1] * q[0] + k[2] * q[1] - k[3] * q[2] - k[4] * q[3];
      if (mac_check) a = reduce(a, pp->wa, wrap);
      int64_t y = reduce(rsh(a, pp->fc, mode), d, wrap);
      q[1] = q[0];
      q[0] = v;
      q[3] = q[2];
      q[2] = y;
      v = y;
    }
    h = (h ^ (uint32_t)in[i]) * 16777619u;
    h = (h ^ (uint32_t)(acc >> 32)) * 16777619u;
    h = (h ^ (uint32_t)acc) * 16777619u;
    h = (h ^ addr) * 16777619u;
    h = (h ^ (uint32_t)c) * 16777619u;
    h = (h ^ (uint32_t)u) * 16777619u;
    h = (h ^ (uint32_t)v) * 16777619u;
    int64_t delta = rsh(v * pp->g, pp->gs, mode);
    acc = (acc + pp->m + (uint64_t)delta) & mask;
  }
  return h;
}

int main(int argc, char **argv) {
  if (argc < 3) fail("usage: loop PARAMS INPUT [REPEATS]");
  params_t pp;
  read_params(argv[1], &pp);
  if (pp.s > 8) fail("at most 8 sections");
  FILE *f = fopen(argv[2], "rb");
  if (!f) fail("cannot open input");
  fseek(f, 0, SEEK_END);
  long bytes = ftell(f);
  fseek(f, 0, SEEK_SET);
  long count = bytes / 4;
  int32_t *in = malloc(bytes > 0 ? bytes : 4);
  if (fread(in, 4, count, f) != (size_t)count) fail("short input");
  fclose(f);
  int repeats = argc > 3 ? atoi(argv[3]) : 1;
  double best = 1e30, bestCpu = 1e30;
  uint32_t h = 0;
  for (int r = 0; r < repeats; r++) {
    struct timespec t0, t1, c0, c1;
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c0);
    clock_gettime(CLOCK_MONOTONIC, &t0);
    h = run(&pp, in, count);
    clock_gettime(CLOCK_MONOTONIC, &t1);
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c1);
    double sec = (t1.tv_sec - t0.tv_sec) + 1e-9 * (t1.tv_nsec - t0.tv_nsec);
    double cpu = (c1.tv_sec - c0.tv_sec) + 1e-9 * (c1.tv_nsec - c0.tv_nsec);
    if (sec < best) best = sec;
    if (cpu < bestCpu) bestCpu = cpu;
  }
  printf("{\"samples\":%ld,\"checksum\":%u,\"seconds\":%.9f,\"cpuSeconds\":%.9f}\n", count, h, best, bestCpu);
  return 0;
}
