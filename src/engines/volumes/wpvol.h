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

/* Same as wpvol_table but with explicit control over the multi-modular driver, for tests and
   benchmarks: primes are taken upwards from 2^(prime_bits-1) (prime_bits in [20, 63]; values
   below 40 make many primes and are slow but legal), and at least min_primes primes are used
   before any reconstruction is attempted.  *primes_used (may be NULL) receives the number of
   primes actually used.  Results do not depend on these choices. */
int wpvol_table_ex(fmpq *out, slong G, slong N, int threads, int prime_bits, slong min_primes,
                   slong *primes_used);

#ifdef __cplusplus
}
#endif

#endif
