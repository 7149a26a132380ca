/* Size and time estimates for the operations on series whose coefficients
   grow with the order (products, quotients, exp, log, powers, composition,
   reversion), so that an absurd order is refused before any work. */
#include <math.h>
#include <stdlib.h>

#include <flint/fmpq_mpoly.h>
#include <flint/fmpz_mpoly.h>

#include "cancel.h"
#include "deadline.h"
#include "diag.h"
#include "scalar.h"
#include "series_ops.h"
#include "util.h"

/* Bits of coefficients a series result may hold in all (about 0.5 GiB of
   numbers; the operations need a few times that while they work). */
#define SERIES_MAX_BITS 4e9

/* What the estimate needs of an operand: log2 of its largest coefficient
   (numerator and denominator), the lowest positive power of x (the
   nonconstant part's valuation, 0 when there is none), whether the constant
   term is zero, and the degree in the other variables and how many occur. */
typedef struct {
    double height, degree, nvars;
    slong valuation, top;   /* lowest positive and highest power of x */
    int no_constant;
} series_shape_info;

static double series_log2_size(const fmpz_t x)
{
    slong b = (slong)fmpz_bits(x);
    return b > 1 ? (double)(b - 1) : 0;
}

/* The lowest positive x-degree of a term of p (0 if none), the highest
   (*top), and whether p has a constant term in x. */
static slong series_valuation(const fmpq_mpoly_t p, slong var, int *no_constant, slong *top,
                              const fmpq_mpoly_ctx_t ctx)
{
    slong nv = fmpq_mpoly_ctx_nvars(ctx), low = 0, len = fmpq_mpoly_length(p, ctx);
    *top = 0;
    ulong *e = xmalloc((size_t)nv * sizeof(ulong));
    *no_constant = 1;
    for (slong i = 0; i < len; i++) {
        fmpq_mpoly_get_term_exp_ui(e, p, i, ctx);
        slong d = (slong)e[var];
        *top = d > *top ? d : *top;
        if (d == 0)
            *no_constant = 0;
        else if (low == 0 || d < low)
            low = d;
    }
    free(e);
    return low;
}

/* Reads the shape of s's polynomial (one pass over its terms). */
static void series_shape_read(series_shape_info *info, const tseries *s, const scalar_ring *R)
{
    const fmpq_mpoly_ctx_struct *ctx = R->ctx;
    const fmpq_mpoly_struct *p = s->p;
    slong nv = fmpq_mpoly_ctx_nvars(ctx);
    info->height = series_log2_size(fmpq_numref(p->content)) + series_log2_size(fmpq_denref(p->content));
    slong zb = fmpz_mpoly_max_bits(p->zpoly);
    info->height += (double)(zb < 0 ? -zb : zb) > 1 ? (double)((zb < 0 ? -zb : zb) - 1) : 0;
    info->degree = info->nvars = 0;
    info->valuation = series_valuation(p, s->var, &info->no_constant, &info->top, ctx);
    if (fmpq_mpoly_is_zero(p, ctx))
        return;
    slong deg[SCALAR_MAX_VARS];
    if (nv > SCALAR_MAX_VARS)
        return;
    fmpq_mpoly_degrees_si(deg, p, R->ctx);
    for (slong i = 0; i < nv; i++) {
        if (i == s->var || deg[i] <= 0)
            continue;
        info->degree += (double)deg[i];
        info->nvars += 1;
    }
}

/* Bits a factor adds to coefficient n of the result beyond the operands'
   height, for m = n/valuation factors: factorials for exp and composition,
   the least common multiple of 1..n (about 1.44 n bits) for log, binomials
   for a power with exponent e, nothing for a quotient. */
static double series_growth(int kind, double m, double n, double exponent)
{
    switch (kind) {
    case SERIES_COST_EXP:
    case SERIES_COST_COMPOSE:
        return m * log2(m + 2);
    case SERIES_COST_LOG:
        return 1.4427 * n;
    case SERIES_COST_POWER:   /* binomial(e, m) or binomial(|e| + m - 1, m) */
        return fmin(m, fabs(exponent)) * log2(m + fabs(exponent) + 1);
    default:
        return 0;
    }
}

/* Bits and seconds of a result to `order`: coefficient n is a sum of products
   of about m = n/valuation operand coefficients, so about m times as tall
   plus series_growth, and, with other variables, holds up to
   (m*deg + 1)^nvars terms. Rational coefficients (FLINT's univariate series)
   share one denominator, so each is as tall as the tallest; the generic
   (multivariate) recurrences cost about N^2 T^2 term products (times N for
   composition), FLINT's about their output bits. */
static void series_estimate(const series_shape_info *in, slong order, int kind, double exponent, double *bits,
                            double *seconds)
{
    double N = (double)order, T = 1, v = in->valuation > 0 ? (double)in->valuation : 1, h = 0;
    *bits = 0;
    for (slong n = 0; n <= order && *bits < 1e30; n++) {
        double m = kind == SERIES_COST_PRODUCT ? 1 : (double)n / v;
        h = m * in->height + in->height + series_growth(kind, m, (double)n, exponent) + log2((double)n + 2);
        T = in->nvars > 0 ? fmin(1e15, pow(m * in->degree + 1, in->nvars)) : 1;
        *bits += T * h;
    }
    if (in->nvars == 0)
        *bits = (N + 1) * h;
    double generic = in->nvars > 0 ? N * N * T * T / 2e10 * (kind == SERIES_COST_COMPOSE ? N : 1) : 0;
    /* FLINT's reversion and composition make about N passes over the output
       (measured: revert of x + x^2 to order 1000, 2000, 3000 in 0.4, 1.4, 9 s) */
    double passes = kind == SERIES_COST_COMPOSE ? N * *bits / 3e10 : 0;
    *seconds = *bits / 1e9 + generic + passes;
}

int series_size_ok(interp *I, const node *at, const char *what, int kind, const tseries *a, const tseries *b,
                   slong order, double exponent)
{
    series_shape_info x, y;
    series_shape_read(&x, a, &I->ring);
    if (b) {   /* two operands: the taller and wider of the two, heights adding up in products */
        series_shape_read(&y, b, &I->ring);
        x.height = kind == SERIES_COST_PRODUCT ? x.height + y.height : fmax(x.height, y.height);
        x.degree = kind == SERIES_COST_PRODUCT ? x.degree + y.degree : fmax(x.degree, y.degree);
        x.nvars = fmax(x.nvars, y.nvars);
        x.valuation = x.valuation == 0 ? y.valuation : y.valuation == 0 ? x.valuation
                                                     : (x.valuation < y.valuation ? x.valuation : y.valuation);
    }
    if (x.valuation == 0 || (kind == SERIES_COST_POWER && x.no_constant && (double)x.valuation * fabs(exponent) > (double)order))
        return 1;   /* a constant, or a power beyond the order: nothing grows */
    if (kind == SERIES_COST_POWER && exponent > 0 && exponent * (double)x.top < (double)order)
        order = (slong)(exponent * (double)x.top);   /* a polynomial's power ends there */
    double bits, seconds;
    series_estimate(&x, order, kind, exponent, &bits, &seconds);
    if (bits > SERIES_MAX_BITS) {
        diag_error(&at->loc, "%s to order %ld would need about %.3g bits of coefficients, above the limit of "
                   "%.3g (lower the order)", what, (long)order, bits, SERIES_MAX_BITS);
        return 0;
    }
    double left = deadline_left();
    if (left >= 0 && seconds > left + 1) {   /* one FLINT call that cannot poll: stop now, as the timer would */
        diag_error(&at->loc, "time limit reached: %s to order %ld would take about %.3g s, more than the time "
                   "left under --time-limit", what, (long)order, seconds);
        cancel_flag = CANCEL_TIMEOUT;
        return 0;
    }
    if (seconds > I->lim.max_seconds) {
        diag_error(&at->loc, "%s to order %ld would take about %.3g s, above the limit of %g s "
                   "(lower the order, or raise --max-seconds)", what, (long)order, seconds, I->lim.max_seconds);
        return 0;
    }
    return 1;
}
