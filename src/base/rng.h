/* rng.h - random streams for Monte Carlo work: one independent stream per
 * (seed, sample, variable), as a GSL generator so GSL's distributions draw from it. */
#ifndef SR_RNG_H
#define SR_RNG_H

#include <gsl/gsl_rng.h>
#include <stdint.h>

/* The generator type: SplitMix64 (Steele, Lea & Flood, "Fast splittable
 * pseudorandom number generators", OOPSLA 2014) behind gsl_rng_type.
 * gsl_rng_get gives 32 bits, gsl_rng_uniform 53 bits. */
extern const gsl_rng_type *const sr_rng_splitmix64;

/* A 64-bit stream key from (seed, sample index, variable slot). Keys differ
 * whenever one argument differs (each step is a bijection of a 64-bit word);
 * otherwise they collide only by chance (2^-64 per pair). */
uint64_t sr_rng_key(uint64_t seed, uint64_t sample, uint64_t slot);

/* Point r (allocated with gsl_rng_alloc(sr_rng_splitmix64)) at the start of
 * the stream with this key. O(1): no warm-up. */
void sr_rng_seek(gsl_rng *r, uint64_t key);

#endif
