/* wpvol_estimate.c - size, time and memory models of the volume engine.
 *
 * The size model was fitted (least squares, then checked at the corners of the tables) on the
 * exact results of this engine for g <= 50, n <= 5; g <= 3, n <= 500; g <= 20, n <= 60 and
 * g <= 8, n <= 200 (largest under-estimate 62 bits).  Writing W = (3g-3+n)! V_{g,n}:
 *     bits(num W) + bits(den W) ~ log2((3g-3+n)!) + log2((2g-3+n)!)
 *                                 + 4.78 g + 2.72 g log2(g+1) + 0.67 n - 5.8,
 *     bits(den W) ~ 11.2 g (observed maxima: 39, 97, 206, 339, 449, 561 at g = 5..50),
 * and the reconstruction first assumes bits(den W) <= 12.5 g + 40.
 *
 * Denominator multiple.  In every exact value of this engine for g <= 200, n <= 5 the primes of
 * den W are at most 2g + n + 2, and (with m = 2g + n + 2) den W divides
 *     B = m! 2^(v_2(m!) + 4) 3^(floor(g/2) + 3) 5^2
 * (checked on all 1194 values g >= 2 of the table g <= 200, n <= 5; with 5 in place of 5^2 a
 * cofactor 5 remains at (123, 0), with 1 in its place at 27 values g <= 100), with bits(B)
 * about 1.25 bits(den W) (1549 against 1253 at g = 100, n = 0; 3473 against 2689 at g = 200).  B W then has a denominator of a few bits and a numerator of
 * bits(num W) + bits(B) - bits(den W), so its reconstruction needs about bits(B) - bits(den W)
 * bits of modulus where the bound 12.5 g + 40 needed 12.5 g + 40: a sixth fewer primes at
 * g = 100.  B is only a guess outside the checked range; a wrong guess leaves a cofactor in
 * the denominator, which the small bound of the first attempt absorbs up to 2^24, and beyond
 * that the reconstruction falls back to the bounds above (more primes, same values).
 * The factorials reflect the growth V_{g,n} ~ (2g-3+n)! (4 pi^2)^{2g-3+n} / (2 pi^2)^{3g-3+n}
 * for large g.  The models only size the first batch of primes and the first attempt of each
 * reconstruction; wrong guesses cost time, never correctness.
 */
#include <math.h>

#include <flint/fmpz.h>

#include "wpvol.h"
#include "wpvol_internal.h"

/* log2(k!) (0 for k <= 1), by lgamma. */
static double wpvol_estimate_lfact(slong k)
{
    return k <= 1 ? 0.0 : lgamma((double) k + 1.0) / log(2.0);
}

/* Model of bits(num) + bits(den) of (3g-3+n)! V_{g,n} for stable (g, n) (0 otherwise). */
double wpvol_estimate_bits_gn(slong g, slong n)
{
    double b;

    if (g < 0 || n < 0 || 2 * g - 2 + n <= 0)
        return 0.0;
    b = wpvol_estimate_lfact(3 * g - 3 + n) + wpvol_estimate_lfact(2 * g - 3 + n)
        + 4.78 * (double) g + 2.72 * (double) g * log2((double) g + 1.0) + 0.67 * (double) n
        - 5.8;
    return b > 8.0 ? b : 8.0;
}

/* Denominator bound of the first reconstruction attempt for genus g: above the observed
   bits(den W) ~ 11.2 g with some room, since a failed attempt costs primes. */
double wpvol_estimate_den_bits(slong g)
{
    return 12.5 * (double) g + 40.0;
}

/* Bits of modulus that the first reconstruction attempt of (g, n) needs: the numerator (model
   total minus the expected denominator) plus the denominator bound plus the 16 bits of slack
   of the reconstruction bounds (wpvol.c). */
double wpvol_estimate_need_bits(slong g, slong n)
{
    double b = wpvol_estimate_bits_gn(g, n) - 11.2 * (double) g + wpvol_estimate_den_bits(g);

    return b + 16.0;
}

/* v_2(m!) = m - (number of ones of m in binary). */
static slong wpvol_estimate_v2fact(slong m)
{
    slong ones = 0, t;

    for (t = m; t > 0; t >>= 1)
        ones += t & 1;
    return m - ones;
}

/* See wpvol_internal.h: B = m! 2^(v_2(m!) + 4) 3^(floor(g/2) + 3) 5^2, m = 2g + n + 2. */
void wpvol_estimate_den_mult(fmpz_t B, slong g, slong n)
{
    slong m = 2 * g + n + 2;
    fmpz_t t;

    fmpz_init(t);
    fmpz_fac_ui(B, (ulong) m);
    fmpz_mul_2exp(B, B, (ulong) (wpvol_estimate_v2fact(m) + 4));
    fmpz_set_ui(t, 3);
    fmpz_pow_ui(t, t, (ulong) (g / 2 + 3));
    fmpz_mul(B, B, t);
    fmpz_mul_ui(B, B, 25);
    fmpz_clear(t);
}

/* log2 of the denominator multiple B of (g, n). */
static double wpvol_estimate_mult_bits(slong g, slong n)
{
    slong m = 2 * g + n + 2;

    return wpvol_estimate_lfact(m) + (double) (wpvol_estimate_v2fact(m) + 4)
           + (double) (g / 2 + 3) * log2(3.0) + log2(25.0);
}

/* Modelled modulus bits of the first reconstruction of B W.  With den W about 0.78 bits(B)
   (0.81 observed at g = 10, 50, 100), B W has bits(num W) + bits(B) - den W bits, i.e.
   total - 2 (0.78 bits(B)) + bits(B); plus the first attempt's denominator bound 2^24 and the
   16 bits of slack of the reconstruction. */
static double wpvol_estimate_need_bits_mult(slong g, slong n)
{
    return wpvol_estimate_bits_gn(g, n) - 0.56 * wpvol_estimate_mult_bits(g, n) + 24.0 + 16.0;
}

/* See wpvol_internal.h: genus >= 2 and few points, near where B was checked. */
int wpvol_estimate_uses_mult(slong g, slong n)
{
    return g >= 2 && n <= WPVOL_MULT_MAX_N;
}

/* Modelled modulus bits of the first reconstruction of (3g-3+n)! V_{g,n} in the table job:
   with the denominator multiple where it is used, else with the bound. */
double wpvol_estimate_table_need(slong g, slong n)
{
    if (wpvol_estimate_uses_mult(g, n))
        return wpvol_estimate_need_bits_mult(g, n);
    return wpvol_estimate_need_bits(g, n);
}

/* Largest modulus size needed over the table (the model grows with g and n, but check both
   n = 0 and n = N for every genus to stay safe at the unstable corner). */
double wpvol_estimate_bits(slong G, slong N)
{
    double m = 0.0;
    slong g;

    for (g = 0; g <= G; g++)
    {
        double a = wpvol_estimate_table_need(g, N), b = wpvol_estimate_table_need(g, 0);
        m = a > m ? a : m;
        m = b > m ? b : m;
    }
    return m;
}

/* Transform length and points used at genus g (as wpvol_modp.c: the product's length
   (3g-2)(2L-1), the next power of two, and that length rounded up to WPVOL_TFT_GRAIN). */
static void wpvol_estimate_len(double *T, double *n, double g, double L)
{
    double need = (3.0 * g - 2.0) * (2.0 * L - 1.0);

    *T = 1.0;
    while (*T < need)
        *T *= 2.0;
    *n = ceil(need / WPVOL_TFT_GRAIN) * WPVOL_TFT_GRAIN;
    *n = *n < *T ? *n : *T;
}

/* Work of the products of one row of each length a..b by a series (I_2 or 1/I_2): l^2/2
   multiply-adds up to WPVOL_ROW_MIN terms, truncated transforms at about 2l points (about
   2 l log2(2l) butterflies, forward and inverse) above; the sum in closed form. */
static double wpvol_estimate_rows(double a, double b)
{
    double s = 0.0, hi = b < WPVOL_ROW_MIN ? b : WPVOL_ROW_MIN;
    double lo = a > WPVOL_ROW_MIN ? a : WPVOL_ROW_MIN + 1.0;

    if (hi >= a)   /* sum l^2 / 2 */
        s += 0.3 * (hi * (hi + 1.0) * (2.0 * hi + 1.0) - (a - 1.0) * a * (2.0 * a - 1.0)) / 6.0;
    if (b >= lo)   /* integral of 2 x log2(2x) */
        s += 2.6 * ((b + 1.0) * (b + 1.0) * (log2(2.0 * (b + 1.0)) - 0.5 / log(2.0))
                    - lo * lo * (log2(2.0 * lo) - 0.5 / log(2.0)));
    return s;
}

/* Single-core seconds of one prime: per genus the pointwise sums (g/2 products at each of the
   n_g points), the forward transform of B_g at the points of genus G and the inverse one at
   those of genus g (butterflies), the row products of the three d_0 (rows of lengths L - d,
   d < 3g) and of the top-down step (lengths up to 3g - 2); then the outputs.  Weights in
   nanoseconds per operation; the factor 2.2 matches the CPU seconds per prime measured for
   (50, 5), (60, 5), (100, 5), (150, 5), (200, 5) and (3, 500) within 1.65-2.2 (so at most 1.3
   times pessimistic). */
static double wpvol_estimate_work(slong G, slong N)
{
    double L = (double) (N >= 1 ? 3 * G + N - 4 : 3 * G - 3) + 1.0, w = 0.0, TG, nG;
    slong g;

    if (L < 1.0)
        L = 1.0;
    wpvol_estimate_len(&TG, &nG, (double) G, L);
    for (g = 2; g <= G; g++)
    {
        double T, n, d = 3.0 * (double) g < L ? 3.0 * (double) g : L;
        wpvol_estimate_len(&T, &n, (double) g, L);
        w += 0.55 * (double) g * n + 0.65 * (nG * log2(TG) + n * log2(T))
             + 3.0 * wpvol_estimate_rows(L - d + 1.0, L)
             + wpvol_estimate_rows(1.0, 3.0 * (double) g - 2.0);
    }
    /* outputs: a series composition of length N per genus (FLINT, about N^2 log N) */
    w += (double) (G + 1) * (double) N * (double) N * log2((double) N + 2.0) * 1.5 + 1.0e5;
    return w * 2.2e-9;
}

/* The parts of the models for the table up to (G, N), G, N >= 0: *work single-core seconds of
   one prime, *ws bytes of one workspace, *nv values. */
static void wpvol_estimate_parts(double *work, double *ws, double *nv, slong G, slong N)
{
    double L, T = 1.0, n = 1.0;

    L = (double) (N >= 1 ? 3 * G + N - 4 : 3 * G - 3) + 1.0;
    L = L < 1.0 ? 1.0 : L;
    if (G >= 2)
        wpvol_estimate_len(&T, &n, (double) G, L);
    *nv = (double) (G + 1) * (double) (N + 1);
    *ws = 8.0 * ((double) (G + 8) * n                 /* cached transforms, genus-block sums */
                 + 1.5 * (double) G * (double) G * L  /* rows of B_h, h < G */
                 + 3.0 * (3.0 * (double) G + 1.0) * L /* A, C, D of one genus */
                 + 5.0 * T);                          /* product buffer, twiddle tables */
    *work = wpvol_estimate_work(G, N);
}

/* Bytes of residues, Chinese remainders and candidates for nv values over `primes` primes. */
static double wpvol_estimate_crt_bytes(double nv, double primes)
{
    return 8.0 * nv * primes + 3.0 * nv * 8.0 * primes;
}

/* Seconds of the Chinese remaindering (quadratic in the number of primes per value). */
static double wpvol_estimate_crt_seconds(double nv, double primes)
{
    return 1.0e-9 * nv * primes * primes * 20.0;
}

/* See wpvol.h.  Seconds: primes (from the size model) times the per-prime work, plus the
   Chinese remaindering.  Bytes: one thread's workspace (cached transforms, stored rows,
   buffers) plus residues and big integers. */
void wpvol_estimate(double *seconds, double *bytes, slong G, slong N)
{
    double primes, work, ws, nv;

    *seconds = 0.0;
    *bytes = 0.0;
    if (G < 0 || N < 0)
        return;
    primes = wpvol_estimate_bits(G, N) / 61.0 + 3.0;
    wpvol_estimate_parts(&work, &ws, &nv, G, N);
    *bytes = ws + wpvol_estimate_crt_bytes(nv, primes);
    *seconds = primes * work + wpvol_estimate_crt_seconds(nv, primes);
}

/* See wpvol.h.  The driver's schedule with `width` primes at a time: a first batch of
   max(bits/61 + 1, width) primes, then one confirming batch of max(width, 2) primes (if the
   size model holds); each batch takes ceil(size/width) rounds of one prime per process. */
void wpvol_estimate_spread(double *seconds, double *bytes_each, double *bytes_root,
                           double *primes, slong G, slong N, int width)
{
    double first, confirm, rounds, work, ws, nv;

    *seconds = *bytes_each = *bytes_root = *primes = 0.0;
    if (G < 0 || N < 0 || width < 1)
        return;
    first = floor(wpvol_estimate_bits(G, N) / 61.0) + 1.0;
    first = first > (double) width ? first : (double) width;
    confirm = width > 2 ? (double) width : 2.0;
    rounds = ceil(first / width) + ceil(confirm / width);
    wpvol_estimate_parts(&work, &ws, &nv, G, N);
    *primes = first + confirm;
    *bytes_each = ws;
    *bytes_root = wpvol_estimate_crt_bytes(nv, *primes);
    *seconds = rounds * work + wpvol_estimate_crt_seconds(nv, *primes);
}
