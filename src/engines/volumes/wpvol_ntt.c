/* wpvol_ntt.c - number-theoretic transforms modulo primes p = c 2^k + 1 < 2^62, used by the
 * volume engine for its large products (FLINT 2.9's nmod_poly multiplication goes through
 * integer multiplication, which is several times slower at these sizes, and a transform can be
 * reused for all the products that share a factor).
 *
 * Radix-2 Gentleman-Sande forward transform (natural order in, bit-reversed out) and
 * Cooley-Tukey inverse (bit-reversed in, natural out), with Shoup's precomputed quotients for
 * the twiddle factors and values kept lazily in [0, 2p); p < 2^62 keeps 4p below 2^64.
 * See wpvol_internal.h for ownership.
 */
#include <stdlib.h>
#include <string.h>

#include <flint/ulong_extras.h>

#include "wpvol_internal.h"

#if !defined(__SIZEOF_INT128__)
#error "wpvol_ntt.c needs a compiler with a 128-bit integer type (GCC or Clang on 64-bit targets)"
#endif

/* 128-bit products (GCC/Clang extension; FLINT's longlong.h macros change between versions). */
__extension__ typedef unsigned __int128 wpvol_u128;

/* Shoup multiplication: returns t*w mod p in [0, 2p) for any t < 2^64, given wpre =
   floor(w 2^64 / p) and w < p. */
static inline ulong wpvol_ntt_mulshoup(ulong t, ulong w, ulong wpre, ulong p)
{
    ulong qh = (ulong) (((wpvol_u128) t * wpre) >> 64);

    return t * w - qh * p;
}

/* t*w mod p in [0, 2p) for t < 2^52, with wpre = floor(w 2^52 / p), w < p < 2^50: the scalar
   form of the vector code's multiplication (for tails shorter than eight). */
static inline ulong wpvol_ntt_mulshoup52(ulong t, ulong w, ulong wpre, ulong p)
{
    ulong qh = (ulong) (((wpvol_u128) t * wpre) >> 52);

    return t * w - qh * p;
}

/* floor(w 2^64 / p) for w < p (the quotient fits in one word).
   FLINT's helper keeps us clear of the normalisation rules of udiv_qrnnd. */
static ulong wpvol_ntt_shoup_pre(ulong w, ulong p)
{
    return n_mulmod_precomp_shoup(w, p);
}

/* See wpvol_internal.h (C11 aligned_alloc wants a size that is a multiple of the alignment). */
ulong *wpvol_words_alloc(slong n)
{
    size_t bytes = ((size_t) FLINT_MAX(n, 1) * sizeof(ulong) + 63) & ~(size_t) 63;

    return aligned_alloc(64, bytes);
}

/* Largest prime p < min(below, 2^62) with p = 1 mod 2^k, or 0 if there is none.
   Deterministic, so every run and every thread sees the same sequence of primes. */
ulong wpvol_ntt_prime_below(ulong below, int k)
{
    ulong top = UWORD(1) << 62, c;

    if (below == 0 || below > top)
        below = top;
    if (k < 1 || k > 60)
        return 0;
    c = (below - 2) >> k;   /* c 2^k + 1 < below */
    for (; c >= 1; c--)
    {
        ulong p = (c << k) + 1;
        if (n_is_prime(p))
            return p;
    }
    return 0;
}

/* A primitive n-th root of unity (n a power of two dividing p-1): a^((p-1)/n) for the first
   small a whose power has order exactly n.  Returns 0 if none is found (p not prime). */
static ulong wpvol_ntt_root(nmod_t mod, slong n)
{
    ulong a;

    for (a = 2; a < 1000; a++)
    {
        ulong w = n_powmod2_ui_preinv(a, (mod.n - 1) / (ulong) n, mod.n, mod.ninv);
        ulong h = n_powmod2_ui_preinv(w, (ulong) n / 2, mod.n, mod.ninv);
        if (n == 1 || h == mod.n - 1)
            return w;
    }
    return 0;
}

/* Fills tw[len + j] = root_{2len}^j for len = n/2, n/4, ..., 1 from powers of a primitive
   n-th root r, with Shoup quotients in pre. */
static void wpvol_ntt_fill(ulong *tw, ulong *pre, ulong r, slong n, nmod_t mod)
{
    slong len, j, half = n / 2;

    if (half >= 1)
    {
        tw[half] = 1;
        for (j = 1; j < half; j++)
            tw[half + j] = nmod_mul(tw[half + j - 1], r, mod);
        for (len = half / 2; len >= 1; len /= 2)
            for (j = 0; j < len; j++)
                tw[len + j] = tw[2 * len + 2 * j];   /* root_{2len}^j = root_{4len}^{2j} */
    }
    for (j = 1; j < n; j++)
        pre[j] = wpvol_ntt_shoup_pre(tw[j], mod.n);
}

/* Twiddle tables for all transform sizes up to n (a power of two with p = 1 mod n, p < 2^62).
   Returns 0, -1 on exhausted memory, -2 if p or n is unsuitable; F is empty on failure. */
int wpvol_ntt_init(wpvol_ntt_t F, nmod_t mod, slong n)
{
    memset(F, 0, sizeof(wpvol_ntt_struct));
    F->mod = mod;
    if (n < 1 || (n & (n - 1)) != 0)
        return -2;
    F->w = malloc((size_t) n * (wpvol_simd_enabled() ? 6 : 4) * sizeof(ulong));
    if (F->w == NULL)
        return -1;
    F->n = n;
    F->wpre = F->w + n;
    F->iw = F->w + 2 * n;
    F->iwpre = F->w + 3 * n;
    if (wpvol_simd_enabled())
    {
        F->wpre52 = F->w + 4 * n;
        F->iwpre52 = F->w + 5 * n;
    }
    if (wpvol_ntt_set_prime(F, mod) != 0)
    {
        wpvol_ntt_clear(F);
        return -2;
    }
    return 0;
}

/* Refills the tables of F (same maximal length) for another prime, reusing the memory.
   Returns 0, or -2 if p is unsuitable (p >= 2^62 or p != 1 mod F->n); F is unchanged then. */
int wpvol_ntt_set_prime(wpvol_ntt_t F, nmod_t mod)
{
    slong n = F->n;
    ulong r;

    if (n < 1 || mod.n >= (UWORD(1) << 62) || (mod.n - 1) % (ulong) n != 0)
        return -2;
    r = wpvol_ntt_root(mod, n);
    if (r == 0)
        return -2;
    F->mod = mod;
    F->w[0] = F->wpre[0] = F->iw[0] = F->iwpre[0] = 0;
    wpvol_ntt_fill(F->w, F->wpre, r, n, mod);
    wpvol_ntt_fill(F->iw, F->iwpre, nmod_inv(r, mod), n, mod);
    F->simd = F->wpre52 != NULL && mod.n < (UWORD(1) << WPVOL_SIMD_PRIME_BITS);
    if (F->simd)
    {
        slong j;
        F->wpre52[0] = F->iwpre52[0] = 0;
        for (j = 1; j < n; j++)
        {
            F->wpre52[j] = wpvol_simd_pre52(F->w[j], mod.n);
            F->iwpre52[j] = wpvol_simd_pre52(F->iw[j], mod.n);
        }
    }
    return 0;
}

/* Frees the tables (F becomes empty; safe to repeat). */
void wpvol_ntt_clear(wpvol_ntt_t F)
{
    free(F->w);
    memset(F, 0, sizeof(wpvol_ntt_struct));
}

/* Whether the vector code takes the levels hi..lo over a[0..n): groups of 8 in every level,
   and either all levels down to 1 (fused in registers below 8) or none below 8. */
#define WPVOL_NTT_SIMD_LEVELS(F, n, hi, lo) \
    ((F)->simd && (n) >= 8 && (hi) >= 4 && ((lo) == 1 || (lo) >= 8))

/* Butterfly passes of the forward transform for half-lengths len = hi, hi/2, ..., lo over
   a[0..n) (values lazily in [0, 2p)). */
static void wpvol_ntt_fwd_levels(ulong *a, slong n, slong hi, slong lo, const wpvol_ntt_t F)
{
    ulong p = F->mod.n, p2 = 2 * p;
    slong len, s, j;

    if (WPVOL_NTT_SIMD_LEVELS(F, n, hi, lo))
    {
        wpvol_simd_fwd_levels(a, n, hi, lo, F->w, F->wpre52, p);
        return;
    }
    for (len = hi; len >= lo; len /= 2)
        for (s = 0; s < n; s += 2 * len)
        {
            ulong *x = a + s, *y = a + s + len;
            const ulong *w = F->w + len, *wp = F->wpre + len;
            for (j = 0; j < len; j++)
            {
                ulong u = x[j] + y[j], t = x[j] - y[j] + p2;
                x[j] = u >= p2 ? u - p2 : u;
                y[j] = wpvol_ntt_mulshoup(t, w[j], wp[j], p);
            }
        }
}

/* Butterfly passes of the inverse transform for half-lengths len = lo, 2lo, ..., hi. */
static void wpvol_ntt_inv_levels(ulong *a, slong n, slong lo, slong hi, const wpvol_ntt_t F)
{
    ulong p = F->mod.n, p2 = 2 * p;
    slong len, s, j;

    if (WPVOL_NTT_SIMD_LEVELS(F, n, hi, lo))
    {
        wpvol_simd_inv_levels(a, n, lo, hi, F->iw, F->iwpre52, p);
        return;
    }
    for (len = lo; len <= hi; len *= 2)
        for (s = 0; s < n; s += 2 * len)
        {
            ulong *x = a + s, *y = a + s + len;
            const ulong *w = F->iw + len, *wp = F->iwpre + len;
            for (j = 0; j < len; j++)
            {
                ulong t = wpvol_ntt_mulshoup(y[j], w[j], wp[j], p);
                ulong u = x[j] + t, v = x[j] - t + p2;
                x[j] = u >= p2 ? u - p2 : u;
                y[j] = v >= p2 ? v - p2 : v;
            }
        }
}

/* Block length for the cache-resident part of the transforms (32 KiB of data). */
#define WPVOL_NTT_BLOCK 4096

/* In-place forward transform of length n (power of two <= F->n), inputs in [0, p); output in
   bit-reversed order, reduced to [0, p).  The long-distance levels sweep the whole array; once
   a butterfly group fits in a cache-sized block, each block is finished on its own. */
void wpvol_ntt_fwd(ulong *a, slong n, const wpvol_ntt_t F)
{
    ulong p = F->mod.n, p2 = 2 * p;
    slong j, s, blk = FLINT_MIN(n, (slong) WPVOL_NTT_BLOCK);

    if (n >= 2)
    {
        wpvol_ntt_fwd_levels(a, n, n / 2, blk, F);   /* levels whose groups exceed a block */
        for (s = 0; s < n; s += blk)
            wpvol_ntt_fwd_levels(a + s, blk, blk / 2, 1, F);
    }
    for (j = F->simd ? wpvol_simd_reduce4(a, n, p) : 0; j < n; j++)
    {
        ulong u = a[j] >= p2 ? a[j] - p2 : a[j];
        a[j] = u >= p ? u - p : u;
    }
}

/* In-place inverse transform (bit-reversed in, natural out) WITHOUT the factor 1/n: the
   caller folds 1/n into its own scaling.  Inputs in [0, 2p); output reduced to [0, p). */
void wpvol_ntt_inv(ulong *a, slong n, const wpvol_ntt_t F)
{
    ulong p = F->mod.n;
    slong j, s, blk = FLINT_MIN(n, (slong) WPVOL_NTT_BLOCK);

    if (n >= 2)
    {
        for (s = 0; s < n; s += blk)
            wpvol_ntt_inv_levels(a + s, blk, 1, blk / 2, F);
        wpvol_ntt_inv_levels(a, n, blk, n / 2, F);
    }
    for (j = F->simd ? wpvol_simd_reduce4(a, n, p) : 0; j < n; j++)
        a[j] = a[j] >= p ? a[j] - p : a[j];
}

/* Truncated transforms (J. van der Hoeven, "The truncated Fourier transform and applications",
 * 2004), in a recursive form of our own: the first n values of the bit-reversed transform of
 * length N are those of its first half-transform, then (if n > N/2) the first n - N/2 of the
 * second, so a product whose length is just above a power of two costs about that length
 * rather than the next power of two.  The first n values of a length-N transform are also the
 * first n values of every longer one (bit-reversed prefixes), so the cached transforms keep
 * working with any genus's n. */

/* x * w mod p reduced to [0, p) (Shoup, w < p with quotient wpre). */
static inline ulong wpvol_ntt_mulred(ulong x, ulong w, ulong wpre, ulong p)
{
    ulong r = wpvol_ntt_mulshoup(x, w, wpre, p);

    return r >= p ? r - p : r;
}

/* x / 2 mod p for x in [0, p), p odd. */
static inline ulong wpvol_ntt_half(ulong x, ulong p)
{
    return (x & 1) ? (x >> 1) + (p >> 1) + 1 : x >> 1;
}

/* a[0..N) *= 1/k mod p (reduced). */
static void wpvol_ntt_scale_inv(ulong *a, slong N, ulong k, const wpvol_ntt_t F)
{
    ulong p = F->mod.n, s = nmod_inv(k % p, F->mod), spre = wpvol_ntt_shoup_pre(s, p);
    slong j = F->simd ? wpvol_simd_mul(a, N, NULL, NULL, s, wpvol_simd_pre52(s, p), 1, p) : 0;

    for (; j < N; j++)
        a[j] = wpvol_ntt_mulred(a[j], s, spre, p);
}

/* The first n values (bit-reversed order, reduced) of the length-N transform of the
   polynomial with coefficients a[0..d) in [0, p) (zero from d on: a[d..N) is not read), in
   a[0..n); a[n..N) is clobbered.  N a power of two <= F->n, 0 <= d <= n <= N. */
void wpvol_ntt_fwd_trunc(ulong *a, slong N, slong n, slong d, const wpvol_ntt_t F)
{
    ulong p = F->mod.n;
    slong j, h = N / 2;

    if (n <= 0)
        return;
    if (n >= N)
    {
        memset(a + d, 0, (size_t) (N - d) * sizeof(ulong));
        wpvol_ntt_fwd(a, N, F);
        return;
    }
    if (n <= h)   /* only the first half: b_j = a_j + a_{j+h} */
    {
        j = F->simd && d > h ? wpvol_simd_addsub(a, a + h, d - h, 1, p) : 0;
        for (; j + h < d; j++)
            a[j] = nmod_add(a[j], a[j + h], F->mod);
        wpvol_ntt_fwd_trunc(a, h, n, FLINT_MIN(d, h), F);
        return;
    }
    j = 0;
    if (F->simd)   /* the runs where both halves, the first only, or neither are given */
    {
        slong both = FLINT_MAX(0, d - h), first = FLINT_MIN(d, h);
        j = wpvol_simd_split(a, a + h, 0, both, F->w + h, F->wpre52 + h, p);
        if (j == both)
            j += wpvol_simd_split(a + j, a + h + j, 1, first - j, F->w + h + j,
                                  F->wpre52 + h + j, p);
    }
    for (; j < FLINT_MIN(d, h); j++)   /* b_j = a_j + a_{j+h}, c_j = (a_j - a_{j+h}) w^j */
    {
        ulong x = a[j], y = j + h < d ? a[j + h] : 0;
        a[j] = nmod_add(x, y, F->mod);
        a[j + h] = wpvol_ntt_mulred(x - y + p, F->w[h + j], F->wpre[h + j], p);
    }
    if (j < h)   /* beyond the data both halves are zero */
    {
        memset(a + j, 0, (size_t) (h - j) * sizeof(ulong));
        memset(a + h + j, 0, (size_t) (h - j) * sizeof(ulong));
    }
    wpvol_ntt_fwd(a, h, F);
    wpvol_ntt_fwd_trunc(a + h, h, n - h, FLINT_MIN(d, h), F);
}

/* Inverse of wpvol_ntt_fwd_trunc: given the first n transform values of a polynomial of
   length N in a[0..n) (in [0, 2p): they only enter wpvol_ntt_inv) and its coefficients of
   index >= n in a[n..N) (in [0, p)), sets
   a[0..n) to its coefficients of index < n (exact: no factor N); a[n..N) is clobbered.
   With b = first half + second half and c = (first - second half) w^j of the coefficients,
   the values known determine b (if n >= N/2) or the first n values of b, and c follows from
   its known coefficients and its first n - N/2 values by the same problem at length N/2. */
void wpvol_ntt_inv_trunc(ulong *a, slong N, slong n, const wpvol_ntt_t F)
{
    ulong p = F->mod.n;
    slong j, h = N / 2, m = n - h;

    if (n <= 0)
        return;
    if (n >= N)
    {
        wpvol_ntt_inv(a, N, F);
        wpvol_ntt_scale_inv(a, N, (ulong) N, F);
        return;
    }
    if (n <= h)   /* b_j = a_j + a_{j+h}: known for j >= n; then a_j = b_j - a_{j+h} */
    {
        for (j = n + (F->simd ? wpvol_simd_addsub(a + n, a + n + h, h - n, 1, p) : 0); j < h; j++)
            a[j] = nmod_add(a[j], a[j + h], F->mod);
        wpvol_ntt_inv_trunc(a, h, n, F);
        for (j = F->simd ? wpvol_simd_addsub(a, a + h, n, -1, p) : 0; j < n; j++)
            a[j] = nmod_sub(a[j], a[j + h], F->mod);
        return;
    }
    wpvol_ntt_inv(a, h, F);   /* h b */
    wpvol_ntt_scale_inv(a, h, (ulong) h, F);
    j = m + (F->simd ? wpvol_simd_sub_split(a + m, a + m + h, h - m, F->w + h + m,
                                            F->wpre52 + h + m, p) : 0);
    for (; j < h; j++)   /* a_{j+h} known: a_j = b_j - a_{j+h}, and c_j */
    {
        ulong aj = nmod_sub(a[j], a[j + h], F->mod);
        a[j + h] = wpvol_ntt_mulred(aj - a[j + h] + p, F->w[h + j], F->wpre[h + j], p);
        a[j] = aj;
    }
    wpvol_ntt_inv_trunc(a + h, h, m, F);
    j = F->simd ? wpvol_simd_merge_half(a, a + h, m, F->iw + h, F->iwpre52 + h, p) : 0;
    for (; j < m; j++)   /* a_j +- a_{j+h} = b_j, c_j w^-j */
    {
        ulong b = a[j], c = wpvol_ntt_mulred(a[j + h], F->iw[h + j], F->iwpre[h + j], p);
        a[j] = wpvol_ntt_half(nmod_add(b, c, F->mod), p);
        a[j + h] = wpvol_ntt_half(nmod_sub(b, c, F->mod), p);
    }
}

/* pre[i] = Shoup quotient of b[i] (b in [0, p)), for repeated multiplication by b. */
void wpvol_ntt_shoup_vec(ulong *pre, const ulong *b, slong n, nmod_t mod)
{
    slong i;
    int simd = wpvol_simd_for(mod.n);

    for (i = 0; i < n; i++)
        pre[i] = simd ? wpvol_simd_pre52(b[i], mod.n) : wpvol_ntt_shoup_pre(b[i], mod.n);
}

/* a[i] = a[i] b[i] mod p in [0, 2p) (a < 2^64 arbitrary, below 2^52 for primes of the vector
   code), with pre from wpvol_ntt_shoup_vec. */
void wpvol_ntt_mul_shoup_vec(ulong *a, const ulong *b, const ulong *pre, slong n, nmod_t mod)
{
    slong i = wpvol_simd_for(mod.n) ? wpvol_simd_mul(a, n, b, pre, 0, 0, 0, mod.n) : 0;

    for (; i < n; i++)   /* the tail (or all) of either path: pre matches wpvol_ntt_shoup_vec */
        a[i] = wpvol_simd_for(mod.n)
               ? wpvol_ntt_mulshoup52(a[i], b[i], pre[i], mod.n)
               : wpvol_ntt_mulshoup(a[i], b[i], pre[i], mod.n);
}

/* Constants for reducing three-word sums modulo p < 2^62 without division: 2^64 and 2^128
   modulo p with their Shoup quotients, and floor(2^64 / p) for one-word values. */
typedef struct
{
    ulong p, r64, r64pre, r128, r128pre, onepre;
} wpvol_red3;

static void wpvol_red3_init(wpvol_red3 *R, nmod_t mod)
{
    R->p = mod.n;
    R->r64 = n_ll_mod_preinv(1, 0, mod.n, mod.ninv);
    R->r128 = n_mulmod2_preinv(R->r64, R->r64, mod.n, mod.ninv);
    R->r64pre = wpvol_ntt_shoup_pre(R->r64, mod.n);
    R->r128pre = wpvol_ntt_shoup_pre(R->r128, mod.n);
    R->onepre = wpvol_ntt_shoup_pre(1, mod.n);
}

/* x in [0, 2p) to [0, p). */
static inline ulong wpvol_red3_fold(ulong x, ulong p)
{
    return x >= p ? x - p : x;
}

/* (hi 2^128 + mid 2^64 + lo) mod p: three Shoup products in [0, 2p), each folded to [0, p)
   so that their sum stays below 3p < 2^64. */
static inline ulong wpvol_red3_apply(ulong hi, ulong mid, ulong lo, const wpvol_red3 *R)
{
    ulong p = R->p;
    ulong s = wpvol_red3_fold(wpvol_ntt_mulshoup(lo, 1, R->onepre, p), p)
              + wpvol_red3_fold(wpvol_ntt_mulshoup(mid, R->r64, R->r64pre, p), p)
              + wpvol_red3_fold(wpvol_ntt_mulshoup(hi, R->r128, R->r128pre, p), p);

    s = s >= 2 * p ? s - 2 * p : s;
    return s >= p ? s - p : s;
}

/* One reduced entry: 2 (carry 2^128 + acc) + sq^2 mod p (sq < p, or 0 for no square). */
static inline ulong wpvol_ntt_dot_reduce(wpvol_u128 acc, ulong carry, ulong sq,
                                         const wpvol_red3 *R)
{
    ulong hi = 2 * carry + (ulong) (acc >> 127);
    wpvol_u128 t = acc << 1, s = (wpvol_u128) sq * sq;

    hi += (t + s < t);
    t += s;
    return wpvol_red3_apply(hi, (ulong) (t >> 64), (ulong) t, R);
}

/* Entries per block of the pointwise sums: the block's accumulators (6 KiB) stay in L1, and the
   blocks of all factors of a pass (2 KiB each) in L2, so a pass of several sums reads each
   factor from memory once. */
#define WPVOL_DOT_BLK 256

/* Products p^2 < 2^124 for p < 2^62: 16 of them fit in 128 bits without a carry check. */
#define WPVOL_DOT_CHUNK 16

/* part[i] (= if set, else +=) sum of the products of the pairs k0 <= k < k1, entries i0 + i,
   i < m, four pairs per sweep where possible (one update of part per four products). */
static void wpvol_ntt_dot_chunk(wpvol_u128 *part, ulong *const *a, ulong *const *b, slong k0,
                                slong k1, slong i0, slong m)
{
    slong k = k0, i;
    int set = 1;

    for (; k + 4 <= k1; k += 4, set = 0)
    {
        const ulong *x0 = a[k] + i0, *x1 = a[k + 1] + i0, *x2 = a[k + 2] + i0,
                    *x3 = a[k + 3] + i0, *y0 = b[k] + i0, *y1 = b[k + 1] + i0,
                    *y2 = b[k + 2] + i0, *y3 = b[k + 3] + i0;
        for (i = 0; i < m; i++)
        {
            wpvol_u128 t = (wpvol_u128) x0[i] * y0[i] + (wpvol_u128) x1[i] * y1[i]
                           + (wpvol_u128) x2[i] * y2[i] + (wpvol_u128) x3[i] * y3[i];
            part[i] = set ? t : part[i] + t;
        }
    }
    for (; k < k1; k++, set = 0)
    {
        const ulong *x = a[k] + i0, *y = b[k] + i0;
        for (i = 0; i < m; i++)
        {
            wpvol_u128 t = (wpvol_u128) x[i] * y[i];
            part[i] = set ? t : part[i] + t;
        }
    }
}

/* acc[i] (three words: carry 2^128 + acc) += sum_{k<npairs} a[k][i0+i] b[k][i0+i], i < m:
   each chunk of pairs is summed in 128 bits without carry checks, then added once. */
static void wpvol_ntt_dot_accumulate(wpvol_u128 *acc, ulong *carry, ulong *const *a,
                                     ulong *const *b, slong npairs, slong i0, slong m)
{
    wpvol_u128 part[WPVOL_DOT_BLK];
    slong k0, i;

    for (k0 = 0; k0 < npairs; k0 += WPVOL_DOT_CHUNK)
    {
        wpvol_ntt_dot_chunk(part, a, b, k0, FLINT_MIN(npairs, k0 + WPVOL_DOT_CHUNK), i0, m);
        for (i = 0; i < m; i++)
        {
            wpvol_u128 t = acc[i] + part[i];
            carry[i] += (t < acc[i]);
            acc[i] = t;
        }
    }
}

/* Entries [i0, i0+m) of one sum of wpvol_ntt_dot2_many. */
static void wpvol_ntt_dot_block(const wpvol_dot_t *d, slong i0, slong m, const wpvol_red3 *R)
{
    wpvol_u128 acc[WPVOL_DOT_BLK];
    ulong carry[WPVOL_DOT_BLK];
    slong i;

    if (d->npairs < (WORD(1) << 14) && wpvol_simd_for(R->p))
    {
        slong done = wpvol_simd_dot_block(d, i0, m, R->p);   /* the rest (m mod 8) below */
        i0 += done;
        m -= done;
        if (m == 0)
            return;
    }

    memset(acc, 0, sizeof(acc));
    memset(carry, 0, sizeof(carry));
    wpvol_ntt_dot_accumulate(acc, carry, d->a, d->b, d->npairs, i0, m);
    for (i = 0; i < m; i++)
    {
        ulong r = wpvol_ntt_dot_reduce(acc[i], carry[i], d->sq ? d->sq[i0 + i] : 0, R);
        if (d->add != NULL)
        {
            r += d->add[i0 + i];
            r = r >= R->p ? r - R->p : r;
        }
        d->out[i0 + i] = r;
    }
}

/* Every sum of d[0..count) (see wpvol_internal.h), block by block of entries: for each block
   all the sums are done before the next block, so factors shared by several sums are read
   from memory once per block rather than once per sum. */
void wpvol_ntt_dot2_many(const wpvol_dot_t *d, slong count, nmod_t mod)
{
    slong i0, j, n = 0;
    wpvol_red3 R;

    wpvol_red3_init(&R, mod);
    for (j = 0; j < count; j++)
        n = FLINT_MAX(n, d[j].n);
    for (i0 = 0; i0 < n; i0 += WPVOL_DOT_BLK)
        for (j = 0; j < count; j++)
            if (d[j].n > i0)
                wpvol_ntt_dot_block(&d[j], i0, FLINT_MIN((slong) WPVOL_DOT_BLK, d[j].n - i0), &R);
}

/* out[i] = 2 sum_k a[k][i] b[k][i] + (sq ? sq[i]^2 : 0) mod p for i < n: one sum of
   wpvol_ntt_dot2_many. */
void wpvol_ntt_dot2(ulong *out, ulong *const *a, ulong *const *b, slong npairs, const ulong *sq,
                    slong n, nmod_t mod)
{
    wpvol_dot_t d = { .out = out, .a = a, .b = b, .npairs = npairs, .sq = sq, .add = NULL,
                      .n = n };

    wpvol_ntt_dot2_many(&d, 1, mod);
}
