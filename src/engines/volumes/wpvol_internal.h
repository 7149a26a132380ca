/* wpvol_internal.h - internals of the Weil-Petersson volume engine (not a public interface).
 *
 * Everything here works modulo one word-size prime p (FLINT nmod_t).  A "biv" is a truncated
 * bivariate series  sum_{m} c_m(u) v^{-m}: a block of `rows` power series in u, row r holding
 * the coefficient of v^{-(mlo+r)} truncated to `len` terms (u^0 .. u^{len-1}).  A triangular
 * biv keeps fewer terms in lower rows: the row at distance d from the top row is truncated to
 * len - d terms (the engine only ever needs the terms u^o v^{-m} with d + o below a fixed bound,
 * and that set is closed under d_0 and products); the entries beyond are zero or unused.
 *
 * Ownership: a wpvol_biv owns its coefficient array (wpvol_biv_init / wpvol_biv_clear); the other
 * functions never keep pointers to their arguments.  Series arguments (ulong arrays) belong to
 * the caller.  Nothing here is shared between threads: each worker thread uses its own objects.
 */
#ifndef PSIKAPPA_VOLUMES_WPVOL_INTERNAL_H
#define PSIKAPPA_VOLUMES_WPVOL_INTERNAL_H

#include <flint/flint.h>
#include <flint/ulong_extras.h>
#include <flint/nmod.h>
#include <flint/nmod_vec.h>
#include <flint/nmod_poly.h>
#include <flint/fmpq.h>

typedef struct
{
    slong mlo;   /* power of v^{-1} of row 0 */
    slong rows;  /* number of rows (0 allowed) */
    slong len;   /* series length of every row */
    int tri;     /* 1: row r only holds len - (rows-1-r) meaningful terms (see below) */
    ulong *c;    /* rows*len coefficients, row-major; NULL when rows*len == 0 */
} wpvol_biv_struct;

typedef wpvol_biv_struct wpvol_biv_t[1];

/* Series data shared by all genera for one prime (read-only after wpvol_ctx_init, except the
   scratch behind `work`).  Owns every array it points to except `ntt`. */
typedef struct
{
    nmod_t mod;
    slong len;      /* length of the stored series below */
    ulong *i2;      /* I_2(u) = J_1(2 sqrt u)/sqrt u = sum (-1)^k u^k / (k! (k+1)!) */
    ulong *i2inv;   /* 1 / I_2(u) */
    ulong *inv;     /* inv[k] = 1/k mod p for 1 <= k < invlen (inv[0] unused, 0) */
    slong invlen;
    /* optional transform path for the products by I_2 of long rows (wpvol_ctx_attach_ntt) */
    const struct wpvol_ntt_struct_tag *ntt;   /* borrowed tables, NULL: classical only */
    slong tlen;                  /* transform length (power of two) of the longest product */
    slong nk;                    /* truncations of I_2 cached (see wpvol_ctx_attach_ntt) */
    ulong *i2hat;                /* 2 nk blocks of 2 tlen words (I_2, then 1/I_2): transform
                                    values, Shoup quotients */
    ulong *work;                 /* scratch of tlen words */
} wpvol_ctx_struct;

/* Rows of at most WPVOL_ROW_MIN terms are multiplied by I_2 classically; a longer row of l
   terms by truncated transforms with I_2 cut to K terms, K the least multiple of
   WPVOL_ROW_STEP >= l (K <= the stored length), at about l + K points. */
#define WPVOL_ROW_MIN 128
#define WPVOL_ROW_STEP 32

/* The genus-g products use the first n_g points of their transform of length T_g: the
   product's length rounded up to a multiple of WPVOL_TFT_GRAIN (truncated transforms; the
   grain bounds the depth of their recursion). */
#define WPVOL_TFT_GRAIN 4096

typedef wpvol_ctx_struct wpvol_ctx_t[1];

/* --- wpvol_series.c ---------------------------------------------------------------------- */

/* Zeroed biv with the given shape (tri: triangular truncation); returns 0, or -1 if memory is
   exhausted (then b->c == NULL and b can still be passed to wpvol_biv_clear).  rows, len >= 0. */
int wpvol_biv_init(wpvol_biv_t b, slong mlo, slong rows, slong len, int tri);

/* Number of meaningful terms of row r (len, or len - distance to the top row if triangular;
   never negative). */
slong wpvol_biv_rowlen(const wpvol_biv_t b, slong r);

/* Releases the coefficients; b becomes an empty biv.  Safe on an empty or failed biv. */
void wpvol_biv_clear(wpvol_biv_t b);

/* Row for the power v^{-m}, or NULL if m is outside [mlo, mlo+rows). */
ulong *wpvol_biv_row(const wpvol_biv_t b, slong m);

/* Y = d_0 X with d_0 = v^{-1} (d/du - I_2(u) d/dv), truncated to X->len terms.  Y must be
   initialised with mlo = X->mlo+1, rows = X->rows+1, len = X->len, tri = X->tri (overwritten).
   For a rectangular X the last coefficient of every row of Y is not exact (it would need X one
   term longer); for a triangular X every kept term of Y is exact. */
void wpvol_biv_d0(wpvol_biv_t Y, const wpvol_biv_t X, const wpvol_ctx_t ctx);

/* R += s * X * Y, rows and series truncated to t terms (t <= lengths of R, X, Y) by Kronecker
   substitution (one nmod_poly multiplication).  X == Y (same object) is allowed.  The product
   rows must lie inside R: R->mlo <= X->mlo+Y->mlo and the top row inside R.
   Returns 0, or -1 if scratch memory could not be allocated (R unchanged then). */
int wpvol_biv_addmul(wpvol_biv_t R, const wpvol_biv_t X, const wpvol_biv_t Y, slong t, ulong s,
                     nmod_t mod);

/* Series inverse: res[0..n) = 1/a mod u^n, a[0] invertible, a has at least n terms; res and a
   must not overlap.  Quadratic-time (the lengths here are at most a few thousand). */
void wpvol_series_inv(ulong *res, const ulong *a, slong n, nmod_t mod);

/* Prepares the series of ctx for the prime in mod up to length len (>= 1), and the inverses
   1..invlen-1.  Requires p > max(len, invlen) + 1 so that the factorials are invertible.
   Returns 0, or -1 on exhausted memory (ctx then cleared and reusable). */
int wpvol_ctx_init(wpvol_ctx_t ctx, nmod_t mod, slong len, slong invlen);

/* Releases the series of ctx (and its transform data). */
void wpvol_ctx_clear(wpvol_ctx_t ctx);

/* Enables transform products by I_2 for rows of up to maxrow terms, using the tables F (which
   must outlive ctx's use and support length 2^lg for the largest lg needed; otherwise nothing
   is enabled).  Returns 0, or -1 on exhausted memory (ctx then stays classical). */
int wpvol_ctx_attach_ntt(wpvol_ctx_t ctx, const struct wpvol_ntt_struct_tag *F, slong maxrow);

/* res[0..l) = x * I_2 mod u^l, and x / I_2 mod u^l (x has l <= ctx->len terms, res must not
   overlap x; rows longer than the maxrow given to wpvol_ctx_attach_ntt are not allowed once
   transforms are attached). */
void wpvol_ctx_mul_i2(ulong *res, const ulong *x, slong l, const wpvol_ctx_t ctx);
void wpvol_ctx_mul_i2inv(ulong *res, const ulong *x, slong l, const wpvol_ctx_t ctx);

/* --- wpvol_ntt.c ------------------------------------------------------------------------- */

/* Twiddle tables of a number-theoretic transform modulo p = c 2^k + 1 < 2^62 (owned). */
typedef struct wpvol_ntt_struct_tag
{
    nmod_t mod;
    slong n;                 /* largest supported length (power of two), 0 when empty */
    ulong *w, *wpre;         /* w[len+j] = root_{2len}^j and Shoup quotients */
    ulong *iw, *iwpre;       /* the same for the inverse roots */
    ulong *wpre52, *iwpre52; /* quotients floor(w 2^52 / p) of the vector code, or NULL */
    int simd;                /* butterflies by wpvol_ntt_simd.c (p < 2^50 and enabled) */
} wpvol_ntt_struct;

typedef wpvol_ntt_struct wpvol_ntt_t[1];

/* n words aligned to 64 bytes (a cache line: the vector code's loads then never straddle
   two), uninitialised; NULL if memory is exhausted.  The caller owns it and frees it with
   free(). */
ulong *wpvol_words_alloc(slong n);

/* Largest prime below min(below, 2^62) (below == 0: 2^62) congruent to 1 mod 2^k; 0 if none. */
ulong wpvol_ntt_prime_below(ulong below, int k);

/* Tables for lengths up to n (power of two, p = 1 mod n, p < 2^62).  Returns 0, -1 (memory) or
   -2 (unsuitable p or n); F is empty on failure.  Release with wpvol_ntt_clear. */
int wpvol_ntt_init(wpvol_ntt_t F, nmod_t mod, slong n);

/* Refills the tables of an initialised F for another prime (same maximal length, no new
   memory).  Returns 0 or -2 (unsuitable p: F unchanged). */
int wpvol_ntt_set_prime(wpvol_ntt_t F, nmod_t mod);

/* Frees the tables; F becomes empty. */
void wpvol_ntt_clear(wpvol_ntt_t F);

/* In place, length n (power of two <= F->n), inputs in [0,p): natural order in, bit-reversed
   order out, reduced. */
void wpvol_ntt_fwd(ulong *a, slong n, const wpvol_ntt_t F);

/* Inverse of wpvol_ntt_fwd up to the factor n (the result is n times the input), reduced;
   inputs may be in [0, 2p). */
void wpvol_ntt_inv(ulong *a, slong n, const wpvol_ntt_t F);

/* Truncated transforms: the first n values (bit-reversed order) of the length-N transform of
   the coefficients a[0..d) (0 <= d <= n <= N, N a power of two <= F->n, inputs in [0,p);
   a[d..N) not read), in a[0..n); a[n..N) clobbered.  They are the first n values of the
   transform of every length N' >= N with N' >= d as well. */
void wpvol_ntt_fwd_trunc(ulong *a, slong N, slong n, slong d, const wpvol_ntt_t F);

/* Inverse: a[0..n) the first n transform values (in [0,2p)) and a[n..N) the coefficients of
   index >= n (in [0,p)) become a[0..n) = the coefficients of index < n, exactly (no factor N);
   a[n..N) clobbered. */
void wpvol_ntt_inv_trunc(ulong *a, slong N, slong n, const wpvol_ntt_t F);

/* pre[i] = Shoup quotient of b[i] (b in [0,p)): floor(b 2^64 / p), or floor(b 2^52 / p) where
   wpvol_simd_for(p) (the form wpvol_ntt_mul_shoup_vec expects for that prime). */
void wpvol_ntt_shoup_vec(ulong *pre, const ulong *b, slong n, nmod_t mod);

/* a[i] = a[i] b[i] mod p, result in [0, 2p) (accepted as input by wpvol_ntt_inv); a[i] < 2^52
   where wpvol_simd_for(p). */
void wpvol_ntt_mul_shoup_vec(ulong *a, const ulong *b, const ulong *pre, slong n, nmod_t mod);

/* out[i] = 2 sum_{k<npairs} a[k][i] b[k][i] + (sq ? sq[i]^2 : 0) mod p, i < n (out may not alias
   the inputs).  Exact three-word accumulation, one reduction per entry. */
void wpvol_ntt_dot2(ulong *out, ulong *const *a, ulong *const *b, slong npairs, const ulong *sq,
                    slong n, nmod_t mod);

/* One pointwise sum: out[i] = (add ? add[i] : 0) + 2 sum_{k<npairs} a[k][i] b[k][i]
   + (sq ? sq[i]^2 : 0) mod p for i < n (all arrays borrowed; add and sq in [0, p); out may
   alias add but no factor). */
typedef struct
{
    ulong *out;
    ulong *const *a;
    ulong *const *b;
    slong npairs;
    const ulong *sq;
    const ulong *add;
    slong n;
} wpvol_dot_t;

/* All the sums d[0..count), interleaved block by block so that the factors they share are
   read from memory once per block (outputs must not alias each other or any factor). */
void wpvol_ntt_dot2_many(const wpvol_dot_t *d, slong count, nmod_t mod);

/* --- wpvol_ntt_simd.c -------------------------------------------------------------------- */

/* Whether this file's vector code can be compiled here (x86-64 with GCC or Clang). */
#if defined(__x86_64__) && (defined(__GNUC__) || defined(__clang__)) && !defined(WPVOL_NO_SIMD)
#define WPVOL_SIMD_BUILD 1
#else
#define WPVOL_SIMD_BUILD 0
#endif

/* Primes below this bound (and the processor) let the vector code run. */
#define WPVOL_SIMD_PRIME_BITS 50

/* 1 if the vector code runs on this processor (AVX-512F and IFMA) and PSIKAPPA_SIMD is not
   "off"; probed once per process. */
int wpvol_simd_enabled(void);

/* wpvol_simd_enabled() and p < 2^50: the vector code serves this prime. */
int wpvol_simd_for(ulong p);

/* floor(w 2^52 / p) for w < p < 2^50. */
ulong wpvol_simd_pre52(ulong w, ulong p);

/* res = x s mod u^l (coefficients in [0, p), res not aliasing x or s), classically, for
   1 <= l <= WPVOL_SIMD_MULLOW_MAX; only when wpvol_simd_for(p). */
#define WPVOL_SIMD_MULLOW_MAX 256
void wpvol_simd_mullow(ulong *res, const ulong *x, const ulong *s, slong l, ulong p);

/* The butterfly levels of wpvol_ntt.c's transforms: forward len = hi, ..., lo; inverse
   len = lo, ..., hi; for n >= 8, hi >= 4 and lo == 1 or lo >= 8 (the levels below 8 are done
   eight values at a time in registers, all three together).  Same lazy ranges as the scalar
   code ([0, 2p)); p < 2^50; only when wpvol_simd_enabled. */
void wpvol_simd_fwd_levels(ulong *a, slong n, slong hi, slong lo, const ulong *w,
                           const ulong *wpre52, ulong p);
void wpvol_simd_inv_levels(ulong *a, slong n, slong lo, slong hi, const ulong *w,
                           const ulong *wpre52, ulong p);

/* Element-wise passes, eight entries at a time (p < 2^50, only when wpvol_simd_enabled); each
   does the first m' = m rounded down to a multiple of 8 entries and returns m'.  Inputs in
   [0, p) and outputs reduced unless said otherwise; w, wpre52 twiddles with their quotients.
   split:      x, y <- x + y, (x - y) w        (y read as 0 if y_zero)
   sub_split:  x, y <- x - y, (x - 2y) w
   addsub:     x <- x + y (sign > 0) or x - y
   mul:        a <- a c (c NULL: the constant s, quotient spre52), a < 2^52, output in [0, 2p)
               unless reduce
   reduce4:    a <- a mod p for a in [0, 4p)
   merge_half: x, y <- (x + y w) / 2, (x - y w) / 2 */
slong wpvol_simd_split(ulong *x, ulong *y, int y_zero, slong m, const ulong *w,
                       const ulong *wpre52, ulong p);
slong wpvol_simd_sub_split(ulong *x, ulong *y, slong m, const ulong *w, const ulong *wpre52,
                           ulong p);
slong wpvol_simd_addsub(ulong *x, const ulong *y, slong m, int sign, ulong p);
slong wpvol_simd_mul(ulong *a, slong m, const ulong *c, const ulong *cpre52, ulong s,
                     ulong spre52, int reduce, ulong p);
slong wpvol_simd_reduce4(ulong *a, slong m, ulong p);
slong wpvol_simd_merge_half(ulong *x, ulong *y, slong m, const ulong *w, const ulong *wpre52,
                            ulong p);

/* The bulk of a genus block's pointwise sums with each factor loaded once for all eight
   genera: out[j][i] = 2 sum_{h = hlo}^{hhi} hat[h][i] hat[g0 + j - h][i] mod p for j < 8,
   i < n (n a multiple of 8; every hat[k], hlo <= k <= g0 + 7 - hlo, has n entries in [0, p),
   hhi - hlo < 2^12).  p < 2^50, only when wpvol_simd_enabled. */
void wpvol_simd_dot_window(ulong *const *out, ulong *const *hat, slong g0, slong hlo, slong hhi,
                           slong n, ulong p);

/* Entries [i0, i0 + m') of the sum d (wpvol_ntt_dot2_many), m' = m rounded down to a multiple
   of 32, which it returns; p < 2^50, d->npairs < 2^14, only when wpvol_simd_enabled. */
slong wpvol_simd_dot_block(const wpvol_dot_t *d, slong i0, slong m, ulong p);

/* --- wpvol_modp.c ------------------------------------------------------------------------ */

/* Truncation orders used for the tables up to (G,N): see wpvol_modp.c.  Maximum series length
   over all genera; callers use it to choose primes (p must exceed it, see wpvol_modp_table). */
slong wpvol_modp_maxlen(slong G, slong N);

/* Buffers for all primes of one (G, N) (opaque; one per thread). */
typedef struct wpvol_ws_struct wpvol_ws_t;

/* New workspace for tables up to (G, N) (G, N >= 0), or NULL on exhausted memory.  Owned by
   the caller: release with wpvol_ws_free (NULL allowed). */
wpvol_ws_t *wpvol_ws_new(slong G, slong N);
void wpvol_ws_free(wpvol_ws_t *ws);

/* As wpvol_modp_table_ex for the (G, N) of ws, reusing its buffers. */
int wpvol_modp_run(wpvol_ws_t *ws, ulong *res, nmod_t mod, int allow_ntt);

/* res[g*(N+1)+n] = V_{g,n} mod p for 0 <= g <= G, 0 <= n <= N (0 for unstable (g,n)).
   p must be prime with p > wpvol_modp_maxlen(G,N) + 5G + 30.  Returns WPVOL_OK, WPVOL_BADARG
   (prime too small), WPVOL_NOMEM or WPVOL_INTERNAL (the top-down consistency check failed). */
int wpvol_modp_table(ulong *res, slong G, slong N, nmod_t mod);

/* As wpvol_modp_table; allow_ntt = 0 forces FLINT's products even when p = 1 mod 2^k would
   allow cached transforms (the two paths must agree: used by the tests). */
int wpvol_modp_table_ex(ulong *res, slong G, slong N, nmod_t mod, int allow_ntt);

/* Genus bound G and point bound N of a workspace. */
slong wpvol_ws_genus(const wpvol_ws_t *ws);
slong wpvol_ws_points(const wpvol_ws_t *ws);

/* --- wpvol.c: the multi-modular driver (shared by the volume tables and wpoly.c) ---------- */

/* A family of nv rationals known modulo any large enough prime.  The driver owns nothing of
   the job; ws_new makes one workspace per worker thread (NULL: exhausted memory), which run
   reuses for each of its primes and ws_free releases (NULL allowed). */
typedef struct wpvol_job_struct
{
    slong nv;
    void *(*ws_new)(const struct wpvol_job_struct *job);
    void (*ws_free)(void *ws);
    /* res[0..nv) = the values modulo mod.n; returns WPVOL_OK or an error code */
    int (*run)(void *ws, ulong *res, nmod_t mod);
    /* modelled modulus bits before the first reconstruction of value k; < 0: the value is 0 */
    double (*need_bits)(const struct wpvol_job_struct *job, slong k);
    /* first denominator bound (bits) tried for value k */
    slong (*den_bits)(const struct wpvol_job_struct *job, slong k);
    /* optional (NULL: none): sets B to a likely multiple of the denominator of value k; the
       first attempts then reconstruct B x, whose denominator is small (need_bits must model
       that), before the bounds from den_bits are tried */
    void (*den_mult)(const struct wpvol_job_struct *job, slong k, fmpz_t B);
    double first_bits;   /* modulus bits of the first batch of primes */
    const void *data;    /* the job's parameters (borrowed) */
} wpvol_job_t;

/* Where the driver gets the residues of a batch of primes: residues(ctx, res, primes, count)
   fills res[i*nv + k] with value k of the job modulo primes[i], i < count, and returns WPVOL_OK
   or an error code (which ends the run).  width is the number of primes the source works on at
   once (threads, or processes times threads): batches are rounded up to it.  The threaded
   driver's source is wpvol_job_residues; a distributed one sends the primes elsewhere. */
typedef struct
{
    int (*residues)(void *ctx, ulong *res, const ulong *primes, slong count);
    void *ctx;
    int width;
} wpvol_source_t;

/* res[i*job->nv + k] = value k of job modulo primes[i] for i < count, on `threads` worker
   threads (the calling thread works too; cancel flag polled between primes).  Returns WPVOL_OK
   or the first error of job->run (WPVOL_NOMEM when a workspace cannot be made). */
int wpvol_job_residues(ulong *res, const ulong *primes, slong count, const wpvol_job_t *job,
                       int threads);

/* As wpvol_drive, with the residues of every batch from src (the Chinese remaindering, rational
   reconstruction and confirmation are the same code whatever the source). */
int wpvol_drive_from(fmpq *out, const wpvol_job_t *job, const wpvol_source_t *src, int prime_bits,
                     slong min_primes, slong *primes_used);

/* out[0..nv) = the values of job (out initialised by the caller, untouched on error): primes
   as in wpvol_table_ex, residues combined by Chinese remaindering, rational reconstruction
   confirmed by 2 further primes, `threads` worker threads, cancel flag polled between primes.
   Returns WPVOL_OK, WPVOL_NOMEM, WPVOL_LIMIT, WPVOL_CANCELLED or the first error of run. */
int wpvol_drive(fmpq *out, const wpvol_job_t *job, int threads, int prime_bits, slong min_primes,
                slong *primes_used);

/* Nonzero once the flag of wpvol_set_cancel is set (long per-prime runs poll it too, once per
   genus); safe from any thread (the request is read through a C11 atomic). */
int wpvol_cancelled(void);

/* --- wpoly_modp.c: coefficients of V_{g,n}(L) modulo one prime (see wpoly.h) ------------ */

typedef struct wpoly_ws_struct wpoly_ws_t;

/* Workspace for (g, n) with `extra` orders of truncation beyond the bound, for the nidx
   multi-indices idx (n entries each, sorted decreasingly; borrowed: must outlive ws), or NULL
   on exhausted memory.  Owned by the caller: wpoly_ws_free (NULL allowed). */
wpoly_ws_t *wpoly_ws_new(slong g, slong n, slong extra, const slong *idx, slong nidx);
void wpoly_ws_free(wpoly_ws_t *ws);
/* on != 0: for n = 1 compute all indices by the transposed recursion (wpoly_adjoint.c) for the
   primes with transforms, the others by the per-index route. */
void wpoly_ws_set_adjoint(wpoly_ws_t *ws, int on);

/* res[k] = (D-|a|)! W_a mod p for the k-th multi-index a of ws.  Returns WPVOL_OK,
   WPVOL_BADARG (prime too small), WPVOL_NOMEM, WPVOL_INTERNAL or WPVOL_CANCELLED (res zero on
   error). */
int wpoly_modp_run(wpoly_ws_t *ws, ulong *res, nmod_t mod);

/* --- wpvol_estimate.c -------------------------------------------------------------------- */

/* Rough number of bits of the product of primes needed to reconstruct every (int kappa_1^d)
   of the table up to (G, N) (max of wpvol_estimate_need_bits).  Used to size the first batch
   of primes; underestimates only cost extra batches. */
double wpvol_estimate_bits(slong G, slong N);

/* Model of the modulus bits needed by the first reconstruction attempt of (g, n). */
double wpvol_estimate_need_bits(slong g, slong n);

/* Model of bits(num) + bits(den) of (3g-3+n)! V_{g,n} (0 for unstable (g, n)). */
double wpvol_estimate_bits_gn(slong g, slong n);

/* Model bound on bits(den) of (3g-3+n)! V_{g,n}: the first denominator bound tried. */
double wpvol_estimate_den_bits(slong g);

/* Whether the table job reconstructs (3g-3+n)! V_{g,n} with a denominator multiple first
   (g >= 2, n <= WPVOL_MULT_MAX_N); B = that multiple (see wpvol_estimate.c). */
#define WPVOL_MULT_MAX_N 10
int wpvol_estimate_uses_mult(slong g, slong n);
void wpvol_estimate_den_mult(fmpz_t B, slong g, slong n);

/* Modelled modulus bits of the first reconstruction of value (g, n) of the table job. */
double wpvol_estimate_table_need(slong g, slong n);

#endif
