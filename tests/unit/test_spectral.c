/* test_spectral.c - spectral curves with one simple branch point (src/engines/spectral/spectral.h) on
 * curves with known answers: the Airy curve, the Weil-Petersson (JT) curve and the (2, 2p+1)
 * minimal-model curves, each by both routes (intersection numbers and the recursion's residues).
 * Random curves are in test_spectral_routes.c.
 */
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpz_vec.h>
#include <flint/fmpq.h>
#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "wk_published.h"
#include "spectral_util.h"
#include "unit.h"

static unit_report rep;

/* Both routes for (g, n) on the curve y; checks they agree and returns the table in W. */
static void both_routes(sp_table *W, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                        wk_table *Tw, int force_shift, const fmpq_mpoly_ctx_t ctx)
{
    sp_table R;
    sp_options o;
    int s1, s2;
    sp_options_default(&o);
    o.force_shift = force_shift;
    sp_table_init(&R, ctx);
    s1 = sp_omega_shift(W, g, n, y, K, Tw, &o, ctx);
    s2 = sp_omega_residue(&R, g, n, y, K, 0, NULL, ctx);
    UNIT_CHECK(&rep, s1 == SP_OK && s2 == SP_OK && sp_table_equal(W, &R, ctx),
               "routes disagree on (g,n) = (%ld,%ld): status %d %d", (long) g, (long) n, s1, s2);
    sp_table_clear(&R, ctx);
}

/* Airy y = z: W_{g,n}[d] = (-1)^n prod (2d_i+1)!! <tau_d>_g (E. Witten, "Two-dimensional gravity
   and intersection theory on moduli space", 1991; M. Kontsevich, "Intersection theory on the
   moduli space of curves and the matrix Airy function", 1992: the Airy curve's correlators are
   the Witten-Kontsevich numbers), checked on every row for 2g-2+n <= 6, and on the published
   values of wk_published.h (their sources are named there). */
static void test_airy(const fmpq_mpoly_ctx_t ctx, wk_table *Tw)
{
    slong g, n, r, j, i, checked = 0;
    fmpq_mpoly_struct *y = spu_curve_new(0, ctx);
    fmpq_t c, e;
    fmpz_t df;
    sp_table W;
    fmpq_init(c), fmpq_init(e), fmpz_init(df);
    sp_table_init(&W, ctx);
    fmpq_mpoly_one(y, ctx);
    for (g = 0; g <= 4; g++)
        for (n = 1; 2 * g - 2 + n <= 6; n++) {
            if (2 * g - 2 + n <= 0)
                continue;
            both_routes(&W, g, n, y, 0, Tw, 1, ctx);
            for (r = 0; r < W.len; r++) {
                wk_table_correlator(e, Tw, g, W.d + r * n, n);
                for (j = 0; j < n; j++) {
                    fmpz_one(df);
                    for (i = 3; i <= 2 * W.d[r * n + j] + 1; i += 2)
                        fmpz_mul_ui(df, df, (ulong) i);
                    fmpq_mul_fmpz(e, e, df);
                }
                if (n % 2)
                    fmpq_neg(e, e);
                fmpq_mpoly_get_fmpq(c, W.c + r, ctx);
                UNIT_CHECK(&rep, fmpq_mpoly_is_fmpq(W.c + r, ctx) && fmpq_equal(c, e),
                           "Airy W_{%ld,%ld} row %ld", (long) g, (long) n, (long) r);
                checked++;
            }
        }
    for (i = 0; i < WK_PUBLISHED_COUNT; i++) {
        const wk_published_value *pv = &wk_published_values[i];
        slong d[3];
        memcpy(d, pv->d, sizeof d);
        for (j = 1; j < pv->n; j++)                         /* rows are sorted decreasingly */
            for (r = j; r > 0 && d[r - 1] < d[r]; r--)
                g = d[r], d[r] = d[r - 1], d[r - 1] = g;
        sp_omega_residue(&W, pv->g, pv->n, y, 0, 0, NULL, ctx);
        r = sp_table_find(&W, d);
        fmpq_set_si(e, pv->num, (ulong) pv->den);
        for (j = 0; j < pv->n; j++)
            for (g = 3; g <= 2 * d[j] + 1; g += 2)
                fmpq_mul_si(e, e, g);
        if (pv->n % 2)
            fmpq_neg(e, e);
        fmpq_mpoly_get_fmpq(c, W.c + r, ctx);
        UNIT_CHECK(&rep, r >= 0 && fmpq_equal(c, e), "Airy, published value %ld (%s)", (long) i, pv->source);
    }
    printf("Airy curve: %ld coefficients equal to Witten-Kontsevich numbers by both routes\n", (long) checked);
    sp_table_clear(&W, ctx);
    spu_curve_free(y, 0, ctx);
    fmpq_clear(c), fmpq_clear(e), fmpz_clear(df);
}

/* Checks the volume polynomial of the table W (n <= 4) against the string `expected` times sign. */
static void check_volume(const sp_table *W, const char *expected, int sign, const char *src,
                         const fmpq_mpoly_ctx_t ctx)
{
    sp_table V;
    fmpq_mpoly_t P, E;
    sp_table_init(&V, ctx);
    fmpq_mpoly_init(P, ctx), fmpq_mpoly_init(E, ctx);
    sp_table_to_volume(&V, W, ctx);
    spu_table_poly(P, &V, ctx);
    spu_set(E, expected, ctx);
    if (sign < 0)
        fmpq_mpoly_neg(E, E, ctx);
    UNIT_CHECK(&rep, fmpq_mpoly_equal(P, E, ctx), "V_{%ld,%ld} (%s)", (long) W->g, (long) W->n, src);
    if (!fmpq_mpoly_equal(P, E, ctx)) {
        fprintf(stderr, "    got ");
        fmpq_mpoly_fprint_pretty(stderr, P, spu_names, ctx);
        fprintf(stderr, "\n");
    }
    fmpq_mpoly_clear(P, ctx), fmpq_mpoly_clear(E, ctx);
    sp_table_clear(&V, ctx);
}

/* V_{g,n} of the JT table W against the pushforward reduction (an independent engine):
   [prod L_i^{2a_i}] V = (-1)^n (2 pi^2)^m / m! int psi^a kappa_1^m / prod (2^{a_i} a_i!), m = D - |a|. */
static void check_jt_pushforward(const sp_table *W, wk_table *Tw, const fmpq_mpoly_ctx_t ctx)
{
    slong r, j, D = 3 * W->g - 3 + W->n, m, kmult[2] = {0, 0};
    sp_table V;
    fmpq_t v;
    fmpz_t f;
    fmpq_mpoly_t E;
    int ok = 1;
    sp_table_init(&V, ctx);
    fmpq_init(v), fmpz_init(f);
    fmpq_mpoly_init(E, ctx);
    sp_table_to_volume(&V, W, ctx);
    for (r = 0; r < V.len; r++) {
        for (j = 0, m = D; j < V.n; j++)
            m -= V.d[r * V.n + j];
        kmult[1] = m;
        pf_integral(v, Tw, W->g, V.d + r * V.n, V.n, kmult, 1);
        fmpz_fac_ui(f, (ulong) m);
        fmpq_div_fmpz(v, v, f);
        fmpq_mul_2exp(v, v, (ulong) m);
        for (j = 0; j < V.n; j++) {
            fmpz_fac_ui(f, (ulong) V.d[r * V.n + j]);
            fmpz_mul_2exp(f, f, (ulong) V.d[r * V.n + j]);
            fmpq_div_fmpz(v, v, f);
        }
        if (V.n % 2)
            fmpq_neg(v, v);
        fmpq_mpoly_gen(E, SPU_PI, ctx);
        fmpq_mpoly_pow_ui(E, E, (ulong) (2 * m), ctx);
        fmpq_mpoly_scalar_mul_fmpq(E, E, v, ctx);
        ok &= fmpq_mpoly_equal(E, V.c + r, ctx);
    }
    UNIT_CHECK(&rep, ok && V.len > 0, "JT V_{%ld,%ld} against the pushforward reduction", (long) W->g, (long) W->n);
    fmpq_mpoly_clear(E, ctx);
    fmpq_clear(v), fmpz_clear(f);
    sp_table_clear(&V, ctx);
}

/* The curve y = sin(2 pi z)/(2 pi): s_1 = 2 pi^2 and s_j = 0 otherwise (hand-computed:
   (2k+1)!! y_k = (-2 pi^2)^k / k!), so V_{g,n} = (-1)^n times the Weil-Petersson volume
   polynomial int exp(2 pi^2 kappa_1 + sum L_i^2 psi_i / 2) (y_0 = 1). */
static void test_jt(const fmpq_mpoly_ctx_t ctx, wk_table *Tw)
{
    slong K = 24, j, g, n;
    fmpq_mpoly_struct *y = spu_curve_jt(K, ctx), *s = spu_curve_new(K, ctx);
    fmpq_mpoly_t e;
    sp_table W;
    sp_table_init(&W, ctx);
    fmpq_mpoly_init(e, ctx);
    UNIT_CHECK(&rep, sp_times(s, K, y, K, ctx) == SP_OK, "JT times");
    spu_set(e, "2*pi^2", ctx);
    UNIT_CHECK(&rep, fmpq_mpoly_equal(s + 1, e, ctx), "JT: s_1 = 2 pi^2");
    for (j = 2; j <= K; j++)
        UNIT_CHECK(&rep, fmpq_mpoly_is_zero(s + j, ctx), "JT: s_%ld = 0", (long) j);
    /* M. Mirzakhani, "Simple geodesics and Weil-Petersson volumes of moduli spaces of bordered
       Riemann surfaces", Invent. Math. 167 (2007) 179-222, table of small volumes, from memory;
       V_{1,1} halved for the elliptic involution (docs/conventions.md).  Confirmed below by the
       pushforward reduction. */
    both_routes(&W, 1, 1, y, K, Tw, 0, ctx);
    check_volume(&W, "(L1^2+4*pi^2)/48", -1, "Mirzakhani 2007, from memory", ctx);
    both_routes(&W, 0, 4, y, K, Tw, 0, ctx);
    check_volume(&W, "(4*pi^2+L1^2+L2^2+L3^2+L4^2)/2", 1, "Mirzakhani 2007, from memory", ctx);
    both_routes(&W, 1, 2, y, K, Tw, 0, ctx);
    check_volume(&W, "(4*pi^2+L1^2+L2^2)*(12*pi^2+L1^2+L2^2)/192", 1, "Mirzakhani 2007, from memory", ctx);
    both_routes(&W, 2, 1, y, K, Tw, 0, ctx);
    check_volume(&W, "(4*pi^2+L1^2)*(12*pi^2+L1^2)*(6960*pi^4+384*pi^2*L1^2+5*L1^4)/2211840", -1,
                 "Mirzakhani 2007, from memory", ctx);
    for (g = 0; g <= 3; g++)
        for (n = 1; n <= 4 && 2 * g - 2 + n <= 5; n++)
            if (2 * g - 2 + n > 0) {
                both_routes(&W, g, n, y, K, Tw, 0, ctx);     /* volume engine where it applies */
                check_jt_pushforward(&W, Tw, ctx);
                both_routes(&W, g, n, y, K, Tw, 1, ctx);     /* the shift of the correlator engine */
                check_jt_pushforward(&W, Tw, ctx);
            }
    fmpq_mpoly_clear(e, ctx);
    sp_table_clear(&W, ctx);
    spu_curve_free(y, K, ctx);
    spu_curve_free(s, K, ctx);
}

/* y_k of the (2, N) minimal-model curve, N = 2p+1: y(z) = sin(N arcsin(2 pi z / N)) / (2 pi)
   = (-1)^p T_N(2 pi z / N) / (2 pi), T_N the Chebyshev polynomial (T_N(sin t) = (-1)^p sin(N t)),
   built by T_{k+1} = 2 w T_k - T_{k-1}.  An odd polynomial of degree N with y_0 = 1 that tends to
   sin(2 pi z)/(2 pi) as N grows. */
static fmpq_mpoly_struct *minimal_curve(slong p, const fmpq_mpoly_ctx_t ctx)
{
    slong N = 2 * p + 1, k, i;
    fmpz *a = _fmpz_vec_init(N + 1), *b = _fmpz_vec_init(N + 1), *c = _fmpz_vec_init(N + 1);
    fmpq_mpoly_struct *y = spu_curve_new(p, ctx);
    fmpz_t Np;
    fmpz_one(a + 0);                                  /* T_0 = 1, T_1 = w */
    fmpz_one(b + 1);
    for (k = 1; k < N; k++) {
        _fmpz_vec_zero(c, N + 1);
        for (i = 0; i < N; i++)
            fmpz_mul_2exp(c + i + 1, b + i, 1);
        _fmpz_vec_sub(c, c, a, N + 1);
        _fmpz_vec_set(a, b, N + 1);
        _fmpz_vec_set(b, c, N + 1);
    }
    fmpz_init(Np);
    for (k = 0; k <= p; k++) {                        /* y_k = (-1)^p t_{2k+1} (2 pi)^{2k} / N^{2k+1} */
        fmpq_mpoly_gen(y + k, SPU_PI, ctx);
        fmpq_mpoly_scalar_mul_si(y + k, y + k, 2, ctx);
        fmpq_mpoly_pow_ui(y + k, y + k, (ulong) (2 * k), ctx);
        fmpq_mpoly_scalar_mul_fmpz(y + k, y + k, b + 2 * k + 1, ctx);
        fmpz_set_ui(Np, (ulong) N);
        fmpz_pow_ui(Np, Np, (ulong) (2 * k + 1));
        fmpq_mpoly_scalar_div_fmpz(y + k, y + k, Np, ctx);
        if (p % 2)
            fmpq_mpoly_neg(y + k, y + k, ctx);
    }
    fmpz_clear(Np);
    _fmpz_vec_clear(a, N + 1), _fmpz_vec_clear(b, N + 1), _fmpz_vec_clear(c, N + 1);
    return y;
}

/* The (2, 2p+1) minimal-model curves, p = 1, 2, 3 (the p-th multicritical point: V. Kazakov, "The
   appearance of matter fields from quantum fluctuations of 2D-gravity", Mod. Phys. Lett. A 4
   (1989), from memory).  Checked: y_0 = 1 and the shifted KdV times t_{k+1} = -p_k vanish for
   k > p (a curve of degree 2p+1); the hand-derived times (series of sin(N arcsin w), see
   docs/conventions.md) s_1 = 2 pi^2 (1 - 1/N^2) and s_2 = 16 pi^4 (N^2 - 1) / N^4, which tend to
   the JT times; V_{1,1} = (L^2 + 4 pi^2 (1 - 1/N^2))/48 up to the sign (-1)^n; both routes agree
   for 2g-2+n <= 4. */
static void test_minimal(const fmpq_mpoly_ctx_t ctx, wk_table *Tw)
{
    slong p, g, n, k, N;
    char buf[200];
    for (p = 1; p <= 3; p++) {
        fmpq_mpoly_struct *y = minimal_curve(p, ctx), *s = spu_curve_new(8, ctx), *q = spu_curve_new(8, ctx);
        fmpq_mpoly_t e;
        sp_table W;
        N = 2 * p + 1;
        fmpq_mpoly_init(e, ctx);
        sp_table_init(&W, ctx);
        UNIT_CHECK(&rep, fmpq_mpoly_is_one(y + 0, ctx), "minimal p=%ld: y_0 = 1", (long) p);
        sp_shift_times(q, 8, y, p, ctx);
        for (k = 1; k <= 8; k++)
            UNIT_CHECK(&rep, fmpq_mpoly_is_zero(q + k, ctx) == (k > p), "minimal p=%ld: p_%ld", (long) p, (long) k);
        sp_times(s, 8, y, p, ctx);
        snprintf(buf, sizeof buf, "2*pi^2*(1-1/%ld)", (long) (N * N));
        spu_set(e, buf, ctx);
        UNIT_CHECK(&rep, fmpq_mpoly_equal(s + 1, e, ctx), "minimal p=%ld: s_1", (long) p);
        snprintf(buf, sizeof buf, "16*pi^4*%ld/%ld", (long) (N * N - 1), (long) (N * N * N * N));
        spu_set(e, buf, ctx);
        UNIT_CHECK(&rep, fmpq_mpoly_equal(s + 2, e, ctx), "minimal p=%ld: s_2", (long) p);
        both_routes(&W, 1, 1, y, p, Tw, 0, ctx);
        snprintf(buf, sizeof buf, "(L1^2+4*pi^2*(1-1/%ld))/48", (long) (N * N));
        check_volume(&W, buf, -1, "hand-derived", ctx);
        for (g = 0; g <= 3; g++)
            for (n = 1; 2 * g - 2 + n <= 4; n++)
                if (2 * g - 2 + n > 0)
                    both_routes(&W, g, n, y, p, Tw, 0, ctx);
        sp_table_clear(&W, ctx);
        fmpq_mpoly_clear(e, ctx);
        spu_curve_free(y, p, ctx), spu_curve_free(s, 8, ctx), spu_curve_free(q, 8, ctx);
    }
}

/* Bad curves: y_0 = 0, y_0 not rational; unstable and invalid (g, n). */
static void test_errors(const fmpq_mpoly_ctx_t ctx, wk_table *Tw)
{
    fmpq_mpoly_struct *y = spu_curve_new(1, ctx);
    sp_table W;
    sp_table_init(&W, ctx);
    spu_set(y + 1, "1", ctx);
    UNIT_CHECK(&rep, sp_omega_shift(&W, 1, 1, y, 1, Tw, NULL, ctx) == SP_Y0_ZERO, "y_0 = 0, shift");
    UNIT_CHECK(&rep, sp_omega_residue(&W, 1, 1, y, 1, 0, NULL, ctx) == SP_Y0_ZERO, "y_0 = 0, residue");
    spu_set(y + 0, "pi", ctx);
    UNIT_CHECK(&rep, sp_omega_shift(&W, 1, 1, y, 1, Tw, NULL, ctx) == SP_Y0_NOT_RATIONAL, "y_0 = pi");
    UNIT_CHECK(&rep, sp_omega_residue(&W, 1, 1, y, 1, 0, NULL, ctx) == SP_Y0_NOT_RATIONAL, "y_0 = pi, residue");
    spu_set(y + 0, "2", ctx);
    UNIT_CHECK(&rep, sp_omega_shift(&W, 0, 2, y, 1, Tw, NULL, ctx) == SP_UNSTABLE, "(0,2)");
    UNIT_CHECK(&rep, sp_omega_residue(&W, 1, 0, y, 1, 0, NULL, ctx) == SP_BADARG, "n = 0");
    UNIT_CHECK(&rep, sp_omega_residue(&W, 3, 2, y, 1, 3, NULL, ctx) == SP_LIMIT && W.len == 0, "memo limit");
    UNIT_CHECK(&rep, sp_omega_shift(&W, 200, 1, y, 1, Tw, NULL, ctx) == SP_LIMIT, "dimension limit");
    sp_table_clear(&W, ctx);
    spu_curve_free(y, 1, ctx);
}

int main(void)
{
    fmpq_mpoly_ctx_t ctx;
    wk_table *Tw = wk_table_new();
    fmpq_mpoly_ctx_init(ctx, SPU_NVARS, ORD_LEX);
    test_airy(ctx, Tw);
    test_jt(ctx, Tw);
    test_minimal(ctx, Tw);
    test_errors(ctx, Tw);
    wk_table_free(Tw);
    fmpq_mpoly_ctx_clear(ctx);
    flint_cleanup();
    return unit_finish("test_spectral", &rep);
}
