/* wpvol.h - exact normalised Weil-Petersson volumes
 *     V_{g,n} = int_{Mbar_{g,n}} kappa_1^{3g-3+n} / (3g-3+n)!
 * (Arbarello-Cornalba kappa_1; the volume for the symplectic form 2 pi^2 kappa_1 is
 * (2 pi^2)^{3g-3+n} V_{g,n}).  The method (KdV equation in the coordinates u, v = 1 - I_1,
 * evaluated modulo word-size primes, Chinese remaindering and rational reconstruction) and its
 * cost are described in docs/volumes-engine.md.
 *
 * Ownership: the caller owns every array it passes and must initialise the fmpq entries of `out`
 * before the call and clear them afterwards; the engine keeps no pointer after returning and owns
 * all its scratch memory (released before returning, also on error).  Functions are reentrant:
 * concurrent calls from different threads are allowed (each call starts its own worker threads).
 *
 * Error policy: nothing aborts on bad input or on exhausted memory in this module's own
 * allocations; failures are reported by a status code and `out` is then set to zero entirely.
 * (Arithmetic inside FLINT/GMP follows their own allocation policy.)
 */
#ifndef PSIKAPPA_VOLUMES_WPVOL_H
#define PSIKAPPA_VOLUMES_WPVOL_H

#include <stdatomic.h>
#include <signal.h>
#include <flint/fmpq.h>

#ifdef __cplusplus
extern "C" {
#endif

/* WPVOL_NOMEM: an allocation of the engine failed; WPVOL_INTERNAL: a built-in consistency check
   failed (should never happen; reported rather than returning a wrong value). */
enum { WPVOL_OK = 0, WPVOL_BADARG = 1, WPVOL_LIMIT = 2, WPVOL_NOMEM = 3, WPVOL_INTERNAL = 4, WPVOL_CANCELLED = 5 };

/* Requests whose estimated working memory exceeds this many bytes are refused with WPVOL_LIMIT. */
#define WPVOL_MAX_BYTES (8.0 * 1024.0 * 1024.0 * 1024.0)

/* Requests whose estimated single-core time exceeds this many seconds are refused (WPVOL_LIMIT). */
#define WPVOL_MAX_SECONDS (24.0 * 3600.0)

/* out[g*(N+1)+n] = V_{g,n} for all 0 <= g <= G, 0 <= n <= N; unstable (g,n) (V_{0,0}, V_{0,1},
   V_{0,2}, V_{1,0}) get 0.  out must hold (G+1)*(N+1) initialised fmpq.  threads >= 1 worker
   threads (one prime per thread at a time).  Returns WPVOL_OK, or WPVOL_BADARG (G<0, N<0,
   threads<1, out NULL), WPVOL_LIMIT (estimate beyond WPVOL_MAX_BYTES / WPVOL_MAX_SECONDS),
   WPVOL_NOMEM, WPVOL_INTERNAL; on error every entry of out is 0. */
/* Makes wpvol_table poll *flag between primes (e.g. set by a signal handler) and return
   WPVOL_CANCELLED once it is nonzero; NULL turns polling off. The flag is not owned. */
void wpvol_set_cancel(atomic_int *flag);

int wpvol_table(fmpq *out, slong G, slong N, int threads);

/* Rough estimates for wpvol_table(., G, N, .): *seconds of single-core time (calibrated on a
   2020s x86-64 core) and *bytes of peak working memory with one thread (add the per-thread
   part for more threads: see docs/volumes-engine.md).  Both are 0 for G<0 or N<0.  Cheap. */
void wpvol_estimate(double *seconds, double *bytes, slong G, slong N);

/* The prime size wpvol_table and the polynomial engine use on this processor: 50 bits where
   the transforms and pointwise sums run eight residues at a time (AVX-512 IFMA, unless
   PSIKAPPA_SIMD=off), else 62 bits (about 1.24 times fewer primes for the scalar code).  The
   values never depend on it. */
int wpvol_default_prime_bits(void);

/* Same as wpvol_table but with explicit control over the multi-modular driver, for tests and
   benchmarks: primes are taken upwards from 2^(prime_bits-1) (prime_bits in [20, 63]; values
   below 40 make many primes and are slow but legal), and at least min_primes primes are used
   before any reconstruction is attempted.  *primes_used (may be NULL) receives the number of
   primes actually used.  Results do not depend on these choices. */
int wpvol_table_ex(fmpq *out, slong G, slong N, int threads, int prime_bits, slong min_primes,
                   slong *primes_used);

/* --- the table over a list of primes, for drivers outside this engine (other processes) ---
   The engine computes the integers-over-small-denominators W_{g,n} = (3g-3+n)! V_{g,n} modulo
   word-size primes and recovers them by Chinese remaindering and rational reconstruction, each
   value confirmed by 2 primes not used to reconstruct it (docs/volumes-engine.md).  The two
   halves are separate so that the residues can be computed anywhere: wpvol_table_ex is
   wpvol_table_combine with wpvol_table_residues on threads as its source. */

/* res[i*(G+1)*(N+1) + g*(N+1) + n] = W_{g,n} mod primes[i] for i < count, 0 <= g <= G,
   0 <= n <= N (0 for unstable (g, n)), computed on `threads` threads.  The primes should be the
   ones wpvol_table_combine asks for (any prime p >= 2^19 above the engine's bound is accepted;
   a smaller bound is refused with WPVOL_BADARG).  res holds count*(G+1)*(N+1) words (owned by
   the caller).  Returns WPVOL_OK, WPVOL_BADARG (bad sizes, a non-prime or too small prime),
   WPVOL_NOMEM, WPVOL_INTERNAL or WPVOL_CANCELLED. */
int wpvol_table_residues(ulong *res, slong G, slong N, const ulong *primes, slong count,
                         int threads);

/* A prime of the driver's form (c 2^28 + 1) just below 2^61, so none of the primes a run of
   the driver uses (62-bit ones start below 2^62 and go down, with hundreds of millions of that
   form above 2^61; 50-bit ones are below 2^50): with wpvol_table_residues, a check of a table
   computed elsewhere that none of its own primes could have passed by construction. */
ulong wpvol_check_prime(void);

/* A source of residues for wpvol_table_combine: fills res exactly as wpvol_table_residues
   (G and N are those given to wpvol_table_combine) and returns WPVOL_OK or an error code, which
   ends the combination with that code.  ctx is the caller's. */
typedef int (*wpvol_residue_fn)(void *ctx, ulong *res, const ulong *primes, slong count);

/* out[g*(N+1)+n] = V_{g,n} as wpvol_table_ex, asking `residues` for batches of primes (chosen
   as in wpvol_table_ex; batches are rounded up to `width`, the number of primes the source
   works on at once).  No time or memory limit is applied here (the work is the source's: see
   wpvol_estimate_spread).  Returns WPVOL_OK, WPVOL_BADARG, WPVOL_NOMEM, WPVOL_LIMIT (more than
   a million primes), WPVOL_CANCELLED or the source's error; on error out is all zero. */
int wpvol_table_combine(fmpq *out, slong G, slong N, wpvol_residue_fn residues, void *ctx,
                        int width, int prime_bits, slong min_primes, slong *primes_used);

/* Model of wpvol_table_combine with `width` processes of one thread each (width >= 1): *seconds
   of wall time (rounds of one prime per process, the first batch from the size model plus one
   confirming round, then the combination on one process), *bytes_each of peak memory of every
   process (one workspace), *bytes_root of the combining process in addition (residues, Chinese
   remainders), *primes the modelled number of primes.  Derived from the same models as
   wpvol_estimate (calibration there); all 0 for G < 0, N < 0 or width < 1.  Cheap. */
void wpvol_estimate_spread(double *seconds, double *bytes_each, double *bytes_root,
                           double *primes, slong G, slong N, int width);

#ifdef __cplusplus
}
#endif

#endif
