/* wpvol_ntt_simd.c - the volume engine's modular kernels eight residues at a time with the
 * 52-bit integer multiply-add instructions of AVX-512 (IFMA), for primes p < 2^50: the
 * transform butterflies and element-wise passes of wpvol_ntt.c, its pointwise sums (and the
 * window sums of a genus block of wpvol_modp.c), and the classical products of short rows of
 * wpvol_series.c.
 *
 * Why: the scalar butterfly needs a 64x64 -> 128-bit product per twiddle multiplication; the
 * IFMA instructions give the low and high 52 bits of eight 52x52-bit products at once.  With
 * p < 2^50, values lazily in [0, 2p) and their sums up to 4p stay below 2^52, so Shoup's
 * multiplication works unchanged with 2^52 in place of 2^64 (quotients floor(w 2^52 / p)).
 * The results are the same residues as the scalar code's (both exact modulo p); only the
 * representatives in [0, 2p) may differ before the final reduction.
 *
 * The instructions are chosen at run time (wpvol_simd_enabled): the code is compiled for them
 * with function attributes only, so the rest of the library runs on any x86-64 (or any other
 * processor, where this file provides the switch alone, always off).
 */
#include <stdatomic.h>
#include <stdlib.h>
#include <string.h>

#include "wpvol_internal.h"
#include "wpvol.h"

/* 128-bit products (GCC/Clang extension). */
__extension__ typedef unsigned __int128 simd_u128;

#define WPVOL_SIMD_MASK52 ((UWORD(1) << 52) - 1)

/* Whether the vector code may run: compiled in, the processor and the operating system
   support AVX-512F and IFMA, and PSIKAPPA_SIMD is not "off" (to compare or to rule it out). */
static int wpvol_simd_probe(void)
{
    const char *env = getenv("PSIKAPPA_SIMD");

    if (env != NULL && strcmp(env, "off") == 0)
        return 0;
#if WPVOL_SIMD_BUILD
    __builtin_cpu_init();
    return __builtin_cpu_supports("avx512f") && __builtin_cpu_supports("avx512ifma");
#else
    return 0;
#endif
}

/* Probed once per process; the answer never changes during a run (threads may both probe on
   the first call, but they store the same value, atomically). */
int wpvol_simd_enabled(void)
{
    static atomic_int known = -1;
    int k = atomic_load_explicit(&known, memory_order_relaxed);

    if (k < 0)
    {
        k = wpvol_simd_probe();
        atomic_store_explicit(&known, k, memory_order_relaxed);
    }
    return k;
}

/* See wpvol.h. */
int wpvol_default_prime_bits(void)
{
    return wpvol_simd_enabled() ? WPVOL_SIMD_PRIME_BITS : 62;
}

/* See wpvol_internal.h. */
int wpvol_simd_for(ulong p)
{
    return p < (UWORD(1) << WPVOL_SIMD_PRIME_BITS) && wpvol_simd_enabled();
}

/* floor(w 2^52 / p) for w < p < 2^50. */
ulong wpvol_simd_pre52(ulong w, ulong p)
{
    return (ulong) ((((simd_u128) w) << 52) / p);
}

#if WPVOL_SIMD_BUILD

#include <immintrin.h>

#define WPVOL_SIMD_TARGET __attribute__((target("avx512f,avx512ifma")))

/* The prime in every lane, with the constants of the lazy reductions and of simd_mulshoup. */
typedef struct
{
    __m512i p, p2, p4, negp, mask;
} simd_mod_t;

WPVOL_SIMD_TARGET static inline simd_mod_t simd_mod(ulong p)
{
    simd_mod_t M;

    M.p = _mm512_set1_epi64((long long) p);
    M.p2 = _mm512_set1_epi64((long long) (2 * p));
    M.p4 = _mm512_set1_epi64((long long) (4 * p));
    M.negp = _mm512_set1_epi64((long long) ((UWORD(1) << 52) - p));
    M.mask = _mm512_set1_epi64((long long) WPVOL_SIMD_MASK52);
    return M;
}

/* t w mod p in [0, 2p) for t < 2^52 (eight lanes), w < p with wpre = floor(w 2^52 / p):
   q = floor(t wpre / 2^52) <= floor(t w / p) and t w - q p < 2p < 2^52, so the low 52 bits of
   t w + q (2^52 - p) are the result. */
WPVOL_SIMD_TARGET static inline __m512i simd_mulshoup(__m512i t, __m512i w, __m512i wpre,
                                                      const simd_mod_t *M)
{
    __m512i zero = _mm512_setzero_si512();
    __m512i q = _mm512_madd52hi_epu64(zero, t, wpre);
    __m512i r = _mm512_madd52lo_epu64(zero, t, w);

    r = _mm512_madd52lo_epu64(r, q, M->negp);
    return _mm512_and_si512(r, M->mask);
}

/* x - m if x >= m else x (unsigned lanes: the wrapped difference is larger than x). */
WPVOL_SIMD_TARGET static inline __m512i simd_fold(__m512i x, __m512i m)
{
    return _mm512_min_epu64(x, _mm512_sub_epi64(x, m));
}

/* u - v mod p in [0, 2p) for u, v in [0, 2p). */
WPVOL_SIMD_TARGET static inline __m512i simd_sub2(__m512i u, __m512i v, const simd_mod_t *M)
{
    return simd_fold(_mm512_add_epi64(_mm512_sub_epi64(u, v), M->p2), M->p2);
}

/* One butterfly on eight pairs in registers: forward (Gentleman-Sande) x + y, (x - y) w, or
   inverse (Cooley-Tukey) x + w y, x - w y; values in [0, 2p). */
WPVOL_SIMD_TARGET static inline void simd_bf(__m512i *x, __m512i *y, __m512i w, __m512i q,
                                             const simd_mod_t *M, int inverse)
{
    __m512i u = *x, v = *y, t;

    if (inverse)
    {
        t = simd_mulshoup(v, w, q, M);
        *x = simd_fold(_mm512_add_epi64(u, t), M->p2);
        *y = simd_sub2(u, t, M);
    }
    else
    {
        t = _mm512_add_epi64(_mm512_sub_epi64(u, v), M->p2);
        *x = simd_fold(_mm512_add_epi64(u, v), M->p2);
        *y = simd_mulshoup(t, w, q, M);
    }
}

#define SIMD_LD(p) _mm512_loadu_si512(p)

/* One level of half-length len >= 8 over a[0..n). */
WPVOL_SIMD_TARGET static void simd_level(ulong *a, slong n, slong len, const ulong *w,
                                         const ulong *wpre, ulong p, int inverse)
{
    simd_mod_t M = simd_mod(p);
    slong s, j;

    for (s = 0; s < n; s += 2 * len)
        for (j = 0; j < len; j += 8)
        {
            ulong *x = a + s + j, *y = x + len;
            __m512i u = SIMD_LD(x), v = SIMD_LD(y);
            simd_bf(&u, &v, SIMD_LD(w + len + j), SIMD_LD(wpre + len + j), &M, inverse);
            _mm512_storeu_si512(x, u);
            _mm512_storeu_si512(y, v);
        }
}

/* Two levels in one sweep (half-lengths len and len/2, len/2 >= 8): each value is loaded and
   stored once for both, which halves the memory traffic of the long levels.  Forward: len
   then len/2; inverse: len/2 then len. */
WPVOL_SIMD_TARGET static void simd_level2(ulong *a, slong n, slong len, const ulong *w,
                                          const ulong *wpre, ulong p, int inverse)
{
    simd_mod_t M = simd_mod(p);
    slong s, j, m = len / 2;

    for (s = 0; s < n; s += 2 * len)
        for (j = 0; j < m; j += 8)
        {
            ulong *x = a + s + j;
            __m512i x0 = SIMD_LD(x), x1 = SIMD_LD(x + m), x2 = SIMD_LD(x + len);
            __m512i x3 = SIMD_LD(x + len + m);
            __m512i wa = SIMD_LD(w + len + j), qa = SIMD_LD(wpre + len + j);
            __m512i wb = SIMD_LD(w + len + m + j), qb = SIMD_LD(wpre + len + m + j);
            __m512i wc = SIMD_LD(w + m + j), qc = SIMD_LD(wpre + m + j);
            if (!inverse)
            {
                simd_bf(&x0, &x2, wa, qa, &M, 0);
                simd_bf(&x1, &x3, wb, qb, &M, 0);
            }
            simd_bf(&x0, &x1, wc, qc, &M, inverse);
            simd_bf(&x2, &x3, wc, qc, &M, inverse);
            if (inverse)
            {
                simd_bf(&x0, &x2, wa, qa, &M, 1);
                simd_bf(&x1, &x3, wb, qb, &M, 1);
            }
            _mm512_storeu_si512(x, x0);
            _mm512_storeu_si512(x + m, x1);
            _mm512_storeu_si512(x + len, x2);
            _mm512_storeu_si512(x + len + m, x3);
        }
}

/* Lanes exchanged with their butterfly partners at half-length 4, 2, 1 (within 8 lanes). */
WPVOL_SIMD_TARGET static inline __m512i simd_partner(__m512i v, int len)
{
    if (len == 4)
        return _mm512_shuffle_i64x2(v, v, 0x4E);        /* 256-bit halves */
    if (len == 2)
        return _mm512_permutex_epi64(v, 0x4E);          /* 128-bit pairs */
    return _mm512_shuffle_epi32(v, (_MM_PERM_ENUM) 0x4E);   /* neighbouring words */
}

/* Twiddles of half-length len in {4, 2} repeated over the 8 lanes (lane l: w[len + l mod len]),
   and the lanes holding the second member of each butterfly. */
WPVOL_SIMD_TARGET static inline __m512i simd_tw_small(const ulong *w, int len)
{
    const long long *t = (const long long *) w + len;

    if (len == 4)
        return _mm512_set_epi64(t[3], t[2], t[1], t[0], t[3], t[2], t[1], t[0]);
    return _mm512_set_epi64(t[1], t[0], t[1], t[0], t[1], t[0], t[1], t[0]);
}

static const __mmask8 simd_upper[5] = { 0, 0xAA, 0xCC, 0, 0xF0 };   /* by half-length 1, 2, 4 */

/* One level of half-length len in {4, 2, 1} inside the 8 lanes of v: both results of each
   butterfly are formed in every lane, and the lanes of the second members (simd_upper) take
   the second one.  Forward: x + y, (x - y) w; inverse: x + w y, x - w y.  The twiddle of
   half-length 1 is 1, so that level has no multiplication. */
WPVOL_SIMD_TARGET static inline __m512i simd_level_in_lanes(__m512i v, int len, __m512i w,
                                                            __m512i q, const simd_mod_t *M,
                                                            int inverse)
{
    __m512i vs = simd_partner(v, len), t, ts;

    if (!inverse)
    {
        __m512i d = _mm512_add_epi64(_mm512_sub_epi64(vs, v), M->p2);
        return _mm512_mask_blend_epi64(simd_upper[len],
                                       simd_fold(_mm512_add_epi64(v, vs), M->p2),
                                       len == 1 ? simd_fold(d, M->p2)
                                                : simd_mulshoup(d, w, q, M));
    }
    t = len == 1 ? v : simd_mulshoup(v, w, q, M);
    ts = len == 1 ? vs : simd_partner(t, len);
    return _mm512_mask_blend_epi64(simd_upper[len], simd_fold(_mm512_add_epi64(v, ts), M->p2),
                                   simd_sub2(vs, t, M));
}

/* The levels of half-length 4, 2, 1 (forward) or 1, 2, 4 (inverse) over a[0..n), n a multiple
   of 8, each group of 8 values kept in a register through the three levels. */
WPVOL_SIMD_TARGET static void simd_tail(ulong *a, slong n, const ulong *w, const ulong *wpre,
                                        ulong p, int inverse)
{
    simd_mod_t M = simd_mod(p);
    __m512i w4 = simd_tw_small(w, 4), q4 = simd_tw_small(wpre, 4);
    __m512i w2 = simd_tw_small(w, 2), q2 = simd_tw_small(wpre, 2), none = w2;
    slong i;

    for (i = 0; i < n; i += 8)
    {
        __m512i v = _mm512_loadu_si512(a + i);
        if (inverse)
        {
            v = simd_level_in_lanes(v, 1, none, none, &M, 1);
            v = simd_level_in_lanes(v, 2, w2, q2, &M, 1);
            v = simd_level_in_lanes(v, 4, w4, q4, &M, 1);
        }
        else
        {
            v = simd_level_in_lanes(v, 4, w4, q4, &M, 0);
            v = simd_level_in_lanes(v, 2, w2, q2, &M, 0);
            v = simd_level_in_lanes(v, 1, none, none, &M, 0);
        }
        _mm512_storeu_si512(a + i, v);
    }
}

void wpvol_simd_fwd_levels(ulong *a, slong n, slong hi, slong lo, const ulong *w,
                           const ulong *wpre52, ulong p)
{
    slong len = hi, floor8 = FLINT_MAX(lo, 8);

    for (; len / 2 >= floor8; len /= 4)
        simd_level2(a, n, len, w, wpre52, p, 0);
    if (len >= floor8)
        simd_level(a, n, len, w, wpre52, p, 0);
    if (lo == 1)
        simd_tail(a, n, w, wpre52, p, 0);
}

void wpvol_simd_inv_levels(ulong *a, slong n, slong lo, slong hi, const ulong *w,
                           const ulong *wpre52, ulong p)
{
    slong len = FLINT_MAX(lo, 8);

    if (lo == 1)
        simd_tail(a, n, w, wpre52, p, 1);
    for (; 2 * len <= hi; len *= 4)
        simd_level2(a, n, 2 * len, w, wpre52, p, 1);
    if (len <= hi)
        simd_level(a, n, len, w, wpre52, p, 1);
}

/* The element-wise passes of the truncated transforms and of the products, eight at a time;
   each returns how many entries it did (a multiple of 8), the caller finishes the rest. */

/* x_j, y_j <- x_j + y_j, (x_j - y_j) w_j, reduced (y_j read as 0 if y_zero); x, y in [0, p). */
WPVOL_SIMD_TARGET slong wpvol_simd_split(ulong *x, ulong *y, int y_zero, slong m, const ulong *w,
                                         const ulong *wpre52, ulong p)
{
    simd_mod_t M = simd_mod(p);
    slong j;

    for (j = 0; j + 8 <= m; j += 8)
    {
        __m512i u = _mm512_loadu_si512(x + j);
        __m512i v = y_zero ? _mm512_setzero_si512() : _mm512_loadu_si512(y + j);
        __m512i d = _mm512_add_epi64(_mm512_sub_epi64(u, v), M.p);
        _mm512_storeu_si512(x + j, simd_fold(_mm512_add_epi64(u, v), M.p));
        d = simd_mulshoup(d, _mm512_loadu_si512(w + j), _mm512_loadu_si512(wpre52 + j), &M);
        _mm512_storeu_si512(y + j, simd_fold(d, M.p));
    }
    return j;
}

/* x_j, y_j <- x_j - y_j, (x_j - 2 y_j) w_j mod p, reduced; x, y in [0, p). */
WPVOL_SIMD_TARGET slong wpvol_simd_sub_split(ulong *x, ulong *y, slong m, const ulong *w,
                                             const ulong *wpre52, ulong p)
{
    simd_mod_t M = simd_mod(p);
    slong j;

    for (j = 0; j + 8 <= m; j += 8)
    {
        __m512i u = _mm512_loadu_si512(x + j), v = _mm512_loadu_si512(y + j);
        __m512i a = simd_fold(_mm512_add_epi64(_mm512_sub_epi64(u, v), M.p), M.p);
        __m512i d = _mm512_add_epi64(_mm512_sub_epi64(a, v), M.p);
        _mm512_storeu_si512(x + j, a);
        d = simd_mulshoup(d, _mm512_loadu_si512(w + j), _mm512_loadu_si512(wpre52 + j), &M);
        _mm512_storeu_si512(y + j, simd_fold(d, M.p));
    }
    return j;
}

/* x_j <- x_j + y_j (sign > 0) or x_j - y_j mod p; x, y in [0, p). */
WPVOL_SIMD_TARGET slong wpvol_simd_addsub(ulong *x, const ulong *y, slong m, int sign, ulong p)
{
    simd_mod_t M = simd_mod(p);
    slong j;

    for (j = 0; j + 8 <= m; j += 8)
    {
        __m512i u = _mm512_loadu_si512(x + j), v = _mm512_loadu_si512(y + j);
        u = sign > 0 ? _mm512_add_epi64(u, v) : _mm512_add_epi64(_mm512_sub_epi64(u, v), M.p);
        _mm512_storeu_si512(x + j, simd_fold(u, M.p));
    }
    return j;
}

/* a_j <- a_j c_j mod p (c NULL: the constant s with quotient spre), reduced if `reduce`, else in
   [0, 2p); a_j < 2^52. */
WPVOL_SIMD_TARGET slong wpvol_simd_mul(ulong *a, slong m, const ulong *c, const ulong *cpre52,
                                       ulong s, ulong spre52, int reduce, ulong p)
{
    simd_mod_t M = simd_mod(p);
    __m512i S = _mm512_set1_epi64((long long) s), Q = _mm512_set1_epi64((long long) spre52);
    slong j;

    for (j = 0; j + 8 <= m; j += 8)
    {
        __m512i r = simd_mulshoup(_mm512_loadu_si512(a + j),
                                  c == NULL ? S : _mm512_loadu_si512(c + j),
                                  c == NULL ? Q : _mm512_loadu_si512(cpre52 + j), &M);
        _mm512_storeu_si512(a + j, reduce ? simd_fold(r, M.p) : r);
    }
    return j;
}

/* a_j <- a_j mod p for a_j in [0, 4p). */
WPVOL_SIMD_TARGET slong wpvol_simd_reduce4(ulong *a, slong m, ulong p)
{
    simd_mod_t M = simd_mod(p);
    slong j;

    for (j = 0; j + 8 <= m; j += 8)
        _mm512_storeu_si512(a + j, simd_fold(simd_fold(_mm512_loadu_si512(a + j), M.p2), M.p));
    return j;
}

/* The last pass of the inverse truncated transform: with c_j = y_j w_j (w the inverse roots),
   x_j, y_j <- (x_j + c_j) / 2, (x_j - c_j) / 2 mod p, reduced; x, y in [0, p). */
WPVOL_SIMD_TARGET slong wpvol_simd_merge_half(ulong *x, ulong *y, slong m, const ulong *w,
                                              const ulong *wpre52, ulong p)
{
    simd_mod_t M = simd_mod(p);
    __m512i H = _mm512_set1_epi64((long long) ((p >> 1) + 1));   /* 1/2 mod p */
    __m512i one = _mm512_set1_epi64(1);
    slong j;

    for (j = 0; j + 8 <= m; j += 8)
    {
        __m512i b = _mm512_loadu_si512(x + j), c, s, d;
        c = simd_fold(simd_mulshoup(_mm512_loadu_si512(y + j), _mm512_loadu_si512(w + j),
                                    _mm512_loadu_si512(wpre52 + j), &M), M.p);
        s = simd_fold(_mm512_add_epi64(b, c), M.p);
        d = simd_fold(_mm512_add_epi64(_mm512_sub_epi64(b, c), M.p), M.p);
        /* v / 2 = v >> 1, plus (p + 1) / 2 when v is odd */
        s = _mm512_add_epi64(_mm512_srli_epi64(s, 1),
                             _mm512_maskz_mov_epi64(_mm512_test_epi64_mask(s, one), H));
        d = _mm512_add_epi64(_mm512_srli_epi64(d, 1),
                             _mm512_maskz_mov_epi64(_mm512_test_epi64_mask(d, one), H));
        _mm512_storeu_si512(x + j, s);
        _mm512_storeu_si512(y + j, d);
    }
    return j;
}

/* Reduction constants of the pointwise sums: 2^52 and 2^104 modulo p with their quotients,
   and the quotient of 1 (a plain reduction of a 52-bit value). */
typedef struct
{
    simd_mod_t M;
    __m512i c52, c52pre, c104, c104pre, one, onepre;
} simd_red_t;

WPVOL_SIMD_TARGET static void simd_red_init(simd_red_t *R, ulong p)
{
    ulong c52 = (UWORD(1) << 52) % p;
    ulong c104 = (ulong) (((simd_u128) c52 << 52) % p);

    R->M = simd_mod(p);
    R->c52 = _mm512_set1_epi64((long long) c52);
    R->c52pre = _mm512_set1_epi64((long long) wpvol_simd_pre52(c52, p));
    R->c104 = _mm512_set1_epi64((long long) c104);
    R->c104pre = _mm512_set1_epi64((long long) wpvol_simd_pre52(c104, p));
    R->one = _mm512_set1_epi64(1);
    R->onepre = _mm512_set1_epi64((long long) wpvol_simd_pre52(1, p));
}

/* (hi 2^52 + lo) mod p in [0, p), for hi < 2^61 and any lo: with H = hi + (lo >> 52)
   = H1 2^52 + H0, the value is H1 2^104 + H0 2^52 + (lo mod 2^52), three Shoup products in
   [0, 2p) each. */
WPVOL_SIMD_TARGET static inline __m512i simd_reduce(__m512i hi, __m512i lo, const simd_red_t *R)
{
    __m512i H = _mm512_add_epi64(hi, _mm512_srli_epi64(lo, 52));
    __m512i s = simd_mulshoup(_mm512_and_si512(lo, R->M.mask), R->one, R->onepre, &R->M);

    s = _mm512_add_epi64(s, simd_mulshoup(_mm512_and_si512(H, R->M.mask), R->c52, R->c52pre,
                                          &R->M));
    s = _mm512_add_epi64(s, simd_mulshoup(_mm512_srli_epi64(H, 52), R->c104, R->c104pre,
                                          &R->M));
    s = simd_fold(s, R->M.p4);   /* [0, 6p) -> [0, 4p) */
    s = simd_fold(s, R->M.p2);
    return simd_fold(s, R->M.p);
}

/* Pairs summed before the low halves are folded into the high ones: each low half is below
   2^52, so 2048 of them (plus the fold) stay far below 2^64. */
#define WPVOL_SIMD_FOLD 2048

/* lo, hi += the low and high 52 bits of the products of the eight lanes of x and y. */
#define SIMD_MADD(lo, hi, x, y)                                                               \
    do                                                                                        \
    {                                                                                         \
        __m512i u_ = (x), v_ = (y);                                                           \
        lo = _mm512_madd52lo_epu64(lo, u_, v_);                                               \
        hi = _mm512_madd52hi_epu64(hi, u_, v_);                                               \
    } while (0)

/* hi += lo >> 52, lo <- lo mod 2^52 (same value hi 2^52 + lo). */
#define SIMD_CARRY(lo, hi, mask)                                                              \
    do                                                                                        \
    {                                                                                         \
        hi = _mm512_add_epi64(hi, _mm512_srli_epi64(lo, 52));                                 \
        lo = _mm512_and_si512(lo, mask);                                                      \
    } while (0)

/* Stores add[i] + 2 (hi 2^52 + lo) + sq[i]^2 mod p at out[i..i+8) (lo < 2^52 after a carry). */
WPVOL_SIMD_TARGET static inline void simd_dot_store(const wpvol_dot_t *d, slong i, __m512i lo,
                                                    __m512i hi, const simd_red_t *R)
{
    __m512i r;

    lo = _mm512_slli_epi64(lo, 1);
    hi = _mm512_slli_epi64(hi, 1);
    if (d->sq != NULL)
        SIMD_MADD(lo, hi, _mm512_loadu_si512(d->sq + i), _mm512_loadu_si512(d->sq + i));
    r = simd_reduce(hi, lo, R);
    if (d->add != NULL)
        r = simd_fold(_mm512_add_epi64(r, _mm512_loadu_si512(d->add + i)), R->M.p);
    _mm512_storeu_si512(d->out + i, r);
}

/* Stores 2 (hi 2^52 + lo) mod p at out[0..8) (lo < 2^52 after a carry). */
WPVOL_SIMD_TARGET static inline void simd_window_store(ulong *out, __m512i lo, __m512i hi,
                                                       const simd_red_t *R)
{
    _mm512_storeu_si512(out, simd_reduce(_mm512_slli_epi64(hi, 1), _mm512_slli_epi64(lo, 1), R));
}

/* Entries [i, i + 32) of the sum d: four groups of eight lanes per sweep over the pairs, each
   with its accumulators in registers (named, so that the compiler does not keep them in
   memory), the low halves carried into the high ones every WPVOL_SIMD_FOLD pairs. */
WPVOL_SIMD_TARGET static void simd_dot_wide(const wpvol_dot_t *d, slong i, const simd_red_t *R)
{
    __m512i l0 = _mm512_setzero_si512(), l1 = l0, l2 = l0, l3 = l0;
    __m512i h0 = l0, h1 = l0, h2 = l0, h3 = l0;
    slong k0, k;

    for (k0 = 0; k0 < d->npairs; k0 += WPVOL_SIMD_FOLD)
    {
        slong end = FLINT_MIN(d->npairs, k0 + WPVOL_SIMD_FOLD);
        for (k = k0; k < end; k++)
        {
            const ulong *x = d->a[k] + i, *y = d->b[k] + i;
            SIMD_MADD(l0, h0, _mm512_loadu_si512(x), _mm512_loadu_si512(y));
            SIMD_MADD(l1, h1, _mm512_loadu_si512(x + 8), _mm512_loadu_si512(y + 8));
            SIMD_MADD(l2, h2, _mm512_loadu_si512(x + 16), _mm512_loadu_si512(y + 16));
            SIMD_MADD(l3, h3, _mm512_loadu_si512(x + 24), _mm512_loadu_si512(y + 24));
        }
        SIMD_CARRY(l0, h0, R->M.mask);
        SIMD_CARRY(l1, h1, R->M.mask);
        SIMD_CARRY(l2, h2, R->M.mask);
        SIMD_CARRY(l3, h3, R->M.mask);
    }
    simd_dot_store(d, i, l0, h0, R);
    simd_dot_store(d, i + 8, l1, h1, R);
    simd_dot_store(d, i + 16, l2, h2, R);
    simd_dot_store(d, i + 24, l3, h3, R);
}

/* The window of wpvol_simd_dot_window: partner j of pair h is hat[g0 + j - h]; moving to
   h + 1 shifts every partner up by one and loads hat[g0 - h - 1] as partner 0. */
#define SIMD_WIN_STEP(P0, P1, P2, P3, P4, P5, P6, P7, x)                                      \
    do                                                                                        \
    {                                                                                         \
        SIMD_MADD(l0, h0, x, P0);                                                             \
        SIMD_MADD(l1, h1, x, P1);                                                             \
        SIMD_MADD(l2, h2, x, P2);                                                             \
        SIMD_MADD(l3, h3, x, P3);                                                             \
        SIMD_MADD(l4, h4, x, P4);                                                             \
        SIMD_MADD(l5, h5, x, P5);                                                             \
        SIMD_MADD(l6, h6, x, P6);                                                             \
        SIMD_MADD(l7, h7, x, P7);                                                             \
    } while (0)

/* See wpvol_internal.h: eight coefficients of the product at a time, each lane accumulating
   the low and high 52-bit halves of its terms; s is copied with eight zeros in front (the terms
   x_i s_{k-i} with k < i vanish) and behind (lanes beyond l). */
WPVOL_SIMD_TARGET void wpvol_simd_mullow(ulong *res, const ulong *x, const ulong *s, slong l,
                                         ulong p)
{
    ulong pad[WPVOL_SIMD_MULLOW_MAX + 16];
    simd_red_t R;
    slong k0, i;

    simd_red_init(&R, p);
    memset(pad, 0, sizeof(ulong) * 8);
    memcpy(pad + 8, s, (size_t) l * sizeof(ulong));
    memset(pad + 8 + l, 0, sizeof(ulong) * 8);
    for (k0 = 0; k0 < l; k0 += 8)
    {
        __m512i lo = _mm512_setzero_si512(), hi = lo;
        slong top = FLINT_MIN(k0 + 7, l - 1);
        for (i = 0; i <= top; i++)
            SIMD_MADD(lo, hi, _mm512_set1_epi64((long long) x[i]),
                      _mm512_loadu_si512(pad + 8 + k0 - i));
        SIMD_CARRY(lo, hi, R.M.mask);
        _mm512_mask_storeu_epi64(res + k0, (__mmask8) (l - k0 >= 8 ? 0xFF : (1u << (l - k0)) - 1),
                                 simd_reduce(hi, lo, &R));
    }
}

/* Prefetch distance of the window sums, in entries (four groups of eight). */
#define WPVOL_SIMD_AHEAD 32

/* Entries [i, i + 8) of the eight window sums (see wpvol_simd_dot_window). */
WPVOL_SIMD_TARGET static void simd_window_group(ulong *const *out, ulong *const *hat, slong g0,
                                                slong hlo, slong hhi, slong i,
                                                const simd_red_t *R)
{
    __m512i l0 = _mm512_setzero_si512(), l1 = l0, l2 = l0, l3 = l0, l4 = l0, l5 = l0, l6 = l0;
    __m512i l7 = l0, h0 = l0, h1 = l0, h2 = l0, h3 = l0, h4 = l0, h5 = l0, h6 = l0, h7 = l0;
    __m512i q0, q1, q2, q3, q4, q5, q6, q7;
    slong h;

    q0 = _mm512_loadu_si512(hat[g0 - hlo] + i);
    q1 = _mm512_loadu_si512(hat[g0 + 1 - hlo] + i);
    q2 = _mm512_loadu_si512(hat[g0 + 2 - hlo] + i);
    q3 = _mm512_loadu_si512(hat[g0 + 3 - hlo] + i);
    q4 = _mm512_loadu_si512(hat[g0 + 4 - hlo] + i);
    q5 = _mm512_loadu_si512(hat[g0 + 5 - hlo] + i);
    q6 = _mm512_loadu_si512(hat[g0 + 6 - hlo] + i);
    q7 = _mm512_loadu_si512(hat[g0 + 7 - hlo] + i);
    for (h = hlo; h <= hhi; h++)
    {
        __m512i x = _mm512_loadu_si512(hat[h] + i);
        /* the same lines of the next groups: ~g0 separate streams defeat the hardware
           prefetcher */
        _mm_prefetch((const char *) (hat[h] + i + WPVOL_SIMD_AHEAD), _MM_HINT_T0);
        _mm_prefetch((const char *) (hat[g0 - h - 1] + i + WPVOL_SIMD_AHEAD), _MM_HINT_T0);
        SIMD_WIN_STEP(q0, q1, q2, q3, q4, q5, q6, q7, x);
        q7 = q6;
        q6 = q5;
        q5 = q4;
        q4 = q3;
        q3 = q2;
        q2 = q1;
        q1 = q0;
        q0 = _mm512_loadu_si512(hat[g0 - h - 1] + i);
    }
    SIMD_CARRY(l0, h0, R->M.mask);
    SIMD_CARRY(l1, h1, R->M.mask);
    SIMD_CARRY(l2, h2, R->M.mask);
    SIMD_CARRY(l3, h3, R->M.mask);
    SIMD_CARRY(l4, h4, R->M.mask);
    SIMD_CARRY(l5, h5, R->M.mask);
    SIMD_CARRY(l6, h6, R->M.mask);
    SIMD_CARRY(l7, h7, R->M.mask);
    simd_window_store(out[0] + i, l0, h0, R);
    simd_window_store(out[1] + i, l1, h1, R);
    simd_window_store(out[2] + i, l2, h2, R);
    simd_window_store(out[3] + i, l3, h3, R);
    simd_window_store(out[4] + i, l4, h4, R);
    simd_window_store(out[5] + i, l5, h5, R);
    simd_window_store(out[6] + i, l6, h6, R);
    simd_window_store(out[7] + i, l7, h7, R);
}

void wpvol_simd_dot_window(ulong *const *out, ulong *const *hat, slong g0, slong hlo, slong hhi,
                           slong n, ulong p)
{
    simd_red_t R;
    slong i;

    simd_red_init(&R, p);
    for (i = 0; i < n; i += 8)
        simd_window_group(out, hat, g0, hlo, hhi, i, &R);
}

slong wpvol_simd_dot_block(const wpvol_dot_t *d, slong i0, slong m, ulong p)
{
    simd_red_t R;
    slong i;

    simd_red_init(&R, p);
    for (i = i0; i + 32 <= i0 + m; i += 32)
        simd_dot_wide(d, i, &R);
    return i - i0;
}

#else /* !WPVOL_SIMD_BUILD: never called (wpvol_simd_enabled is 0) */

void wpvol_simd_fwd_levels(ulong *a, slong n, slong hi, slong lo, const ulong *w,
                           const ulong *wpre52, ulong p)
{
    (void) a; (void) n; (void) hi; (void) lo; (void) w; (void) wpre52; (void) p;
    abort();
}

void wpvol_simd_inv_levels(ulong *a, slong n, slong lo, slong hi, const ulong *w,
                           const ulong *wpre52, ulong p)
{
    (void) a; (void) n; (void) hi; (void) lo; (void) w; (void) wpre52; (void) p;
    abort();
}

slong wpvol_simd_dot_block(const wpvol_dot_t *d, slong i0, slong m, ulong p)
{
    (void) d; (void) i0; (void) m; (void) p;
    return 0;
}

void wpvol_simd_dot_window(ulong *const *out, ulong *const *hat, slong g0, slong hlo, slong hhi,
                           slong n, ulong p)
{
    (void) out; (void) hat; (void) g0; (void) hlo; (void) hhi; (void) n; (void) p;
    abort();
}

void wpvol_simd_mullow(ulong *res, const ulong *x, const ulong *s, slong l, ulong p)
{
    (void) res; (void) x; (void) s; (void) l; (void) p;
    abort();
}

slong wpvol_simd_split(ulong *x, ulong *y, int y_zero, slong m, const ulong *w,
                       const ulong *wpre52, ulong p)
{
    (void) x; (void) y; (void) y_zero; (void) m; (void) w; (void) wpre52; (void) p;
    return 0;
}

slong wpvol_simd_sub_split(ulong *x, ulong *y, slong m, const ulong *w, const ulong *wpre52,
                           ulong p)
{
    (void) x; (void) y; (void) m; (void) w; (void) wpre52; (void) p;
    return 0;
}

slong wpvol_simd_addsub(ulong *x, const ulong *y, slong m, int sign, ulong p)
{
    (void) x; (void) y; (void) m; (void) sign; (void) p;
    return 0;
}

slong wpvol_simd_mul(ulong *a, slong m, const ulong *c, const ulong *cpre52, ulong s,
                     ulong spre52, int reduce, ulong p)
{
    (void) a; (void) m; (void) c; (void) cpre52; (void) s; (void) spre52; (void) reduce; (void) p;
    return 0;
}

slong wpvol_simd_reduce4(ulong *a, slong m, ulong p)
{
    (void) a; (void) m; (void) p;
    return 0;
}

slong wpvol_simd_merge_half(ulong *x, ulong *y, slong m, const ulong *w, const ulong *wpre52,
                            ulong p)
{
    (void) x; (void) y; (void) m; (void) w; (void) wpre52; (void) p;
    return 0;
}

#endif
