/* rng.c - the counter-based stream generator behind gsl_rng_type.
 * Hand-written because every GSL generator takes at most 32 bits of seed
 * (mt19937 masks it, taus2 and ranlxd reduce it), so per-sample streams
 * seeded from (seed, i) would collide by the birthday bound once n nears
 * 1e5, and seeding mt19937 per sample costs 624 words of set-up. SplitMix64
 * keyed by a 64-bit hash needs one word of state and seeks in O(1); it passes
 * TestU01 BigCrush (Steele, Lea & Flood 2014). */
#include "base/rng.h"

#include <string.h>

#define GOLDEN 0x9e3779b97f4a7c15ULL

typedef struct {
    uint64_t x;
} sm_state;

/* the SplitMix64 output function (Stafford's "Mix13" finaliser) */
static inline uint64_t mix64(uint64_t z)
{
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

static inline uint64_t next64(sm_state *s)
{
    s->x += GOLDEN;
    return mix64(s->x);
}

static void sm_set(void *state, unsigned long seed)
{
    ((sm_state *)state)->x = (uint64_t)seed;
}

static unsigned long sm_get(void *state)
{
    return (unsigned long)(next64(state) >> 32);
}

static double sm_get_double(void *state)
{
    /* 53 random bits in [0, 1) */
    return (double)(next64(state) >> 11) * 0x1.0p-53;
}

static const gsl_rng_type SM_TYPE = {"sinkrate-splitmix64", 0xffffffffUL, 0, sizeof(sm_state), sm_set, sm_get,
                                     sm_get_double};

const gsl_rng_type *const sr_rng_splitmix64 = &SM_TYPE;

uint64_t sr_rng_key(uint64_t seed, uint64_t sample, uint64_t slot)
{
    /* each line is a bijection of h for fixed other arguments, so keys differ
     * whenever exactly one argument differs */
    uint64_t h = mix64(seed + GOLDEN);
    h = mix64(h ^ (sample + 0x632be59bd9b4e019ULL));
    h = mix64(h ^ (slot * GOLDEN + 0x8cb92ba72f3d8dd7ULL));
    return h;
}

void sr_rng_seek(gsl_rng *r, uint64_t key)
{
    sm_state *s = r->state;
    memcpy(&s->x, &key, sizeof key);
}
