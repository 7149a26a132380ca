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

/* floor(w 2^64 / p) for w < p (the quotient fits in one word).
   FLINT's helper keeps us clear of the normalisation rules of udiv_qrnnd. */
static ulong wpvol_ntt_shoup_pre(ulong w, ulong p)
{
    return n_mulmod_precomp_shoup(w, p);
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
    F->w = malloc((size_t) n * 4 * sizeof(ulong));
    if (F->w == NULL)
        return -1;
    F->n = n;
    F->wpre = F->w + n;
    F->iw = F->w + 2 * n;
    F->iwpre = F->w + 3 * n;
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
    return 0;
}

/* Frees the tables (F becomes empty; safe to repeat). */
void wpvol_ntt_clear(wpvol_ntt_t F)
{
    free(F->w);
    memset(F, 0, sizeof(wpvol_ntt_struct));
}

/* Butterfly passes of the forward transform for half-lengths len = hi, hi/2, ..., lo over
   a[0..n) (values lazily in [0, 2p)). */
static void wpvol_ntt_fwd_levels(ulong *a, slong n, slong hi, slong lo, const wpvol_ntt_t F)
{
    ulong p = F->mod.n, p2 = 2 * p;
    slong len, s, j;

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
    for (j = 0; j < n; j++)
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
    for (j = 0; j < n; j++)
        a[j] = a[j] >= p ? a[j] - p : a[j];
}

/* pre[i] = Shoup quotient of b[i] (b in [0, p)), for repeated multiplication by b. */
void wpvol_ntt_shoup_vec(ulong *pre, const ulong *b, slong n, nmod_t mod)
{
    slong i;

    for (i = 0; i < n; i++)
        pre[i] = wpvol_ntt_shoup_pre(b[i], mod.n);
}

/* a[i] = a[i] b[i] mod p in [0, 2p) (a < 2^64 arbitrary), with pre from wpvol_ntt_shoup_vec. */
void wpvol_ntt_mul_shoup_vec(ulong *a, const ulong *b, const ulong *pre, slong n, nmod_t mod)
{
    slong i;

    for (i = 0; i < n; i++)
        a[i] = wpvol_ntt_mulshoup(a[i], b[i], pre[i], mod.n);
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

/* out[i] = 2 sum_k a[k][i] b[k][i] + (sq ? sq[i]^2 : 0) mod p for i < n.  Products are summed
   exactly in 128 bits plus an overflow counter and reduced once per entry (without division);
   the loop runs over blocks of entries, one factor pair at a time, so that each factor is read
   as one sequential stream. */
void wpvol_ntt_dot2(ulong *out, ulong *const *a, ulong *const *b, slong npairs, const ulong *sq,
                    slong n, nmod_t mod)
{
    enum { BLK = 256 };
    wpvol_u128 acc[BLK];
    ulong carry[BLK];
    slong i0, i, k;
    wpvol_red3 R;

    wpvol_red3_init(&R, mod);
    for (i0 = 0; i0 < n; i0 += BLK)
    {
        slong m = FLINT_MIN((slong) BLK, n - i0);
        memset(acc, 0, sizeof(acc));
        memset(carry, 0, sizeof(carry));
        for (k = 0; k < npairs; k++)
        {
            const ulong *x = a[k] + i0, *y = b[k] + i0;
            for (i = 0; i < m; i++)
            {
                wpvol_u128 t = acc[i] + (wpvol_u128) x[i] * y[i];
                carry[i] += (t < acc[i]);
                acc[i] = t;
            }
        }
        for (i = 0; i < m; i++)
            out[i0 + i] = wpvol_ntt_dot_reduce(acc[i], carry[i], sq ? sq[i0 + i] : 0, &R);
    }
}
