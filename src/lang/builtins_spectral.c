/* Spectral curves in the language: curve(x, y) normalises a curve with one simple branch point at
   z = 0 to x = z^2/2 (a series in z holding the odd part of y; curve_over_z in
   builtins_spectral_bessel.c makes the Bessel-type curves y = w/z, held as z*y_odd); omega, omega_coeff, curve_volume,
   curve_times and curve_kdv read it (src/engines/spectral/spectral.h); sin, cos, sinh, cosh of series
   build the usual curves.  Conventions: docs/conventions.md, "Spectral curves". */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>

#include "builtins.h"
#include "cancel.h"
#include "diag.h"
#include "fastvol.h"
#include "series_ops.h"
#include "series/tseries_trig.h"
#include "spectral/spectral.h"
#include "theta_lang.h"
#include "volumes/wpoly.h"
#include "util.h"
#include "builtins_spectral.h"
#include "real_funcs.h"
#include "verify_account.h"
#include "integrate.h"

static value *bsp_trig(interp *I, const node *call, value **args, int which, const char *name)
{
    if (args[0]->kind == V_NUM && fmpq_mpoly_is_zero(args[0]->num, I->ring.ctx))
        return value_new_si(&I->ring, which == TS_COS || which == TS_COSH);
    if (real_applies(I, args[0]))   /* a number or a real: the function's real value */
        return real_unary(I, call, which == TS_SIN ? RF_SIN : which == TS_COS ? RF_COS
                                 : which == TS_SINH ? RF_SINH : RF_COSH, args[0]);
    if (args[0]->kind != V_SERIES) {
        char *msg = xasprintf("%s() takes a series with zero constant term, e.g. %s(series(2*pi*z, z, 41))",
                              name, name);
        builtin_fail_at(call, 0, msg);
        free(msg);
        return NULL;
    }
    value *r = value_new_series(args[0]->ser->var, args[0]->ser->order, &I->ring);
    int rc = tseries_trig(r->ser, args[0]->ser, which, I->ring.ctx);
    if (rc == TS_OK)
        return r;
    value_release(r);
    if (rc == TS_BADARG && args[0]->ser->order > TSERIES_TRIG_MAX_ORDER) {
        char *msg = xasprintf("%s() of a series known beyond order %ld is refused (the cost grows "
                              "with the square of the order)", name, (long) TSERIES_TRIG_MAX_ORDER);
        builtin_fail_at(call, 0, msg);
        free(msg);
        return NULL;
    }
    series_report(call, rc, name);
    return NULL;
}

static value *bsp_sin(interp *I, const node *call, value **args) { return bsp_trig(I, call, args, TS_SIN, "sin"); }
static value *bsp_cos(interp *I, const node *call, value **args) { return bsp_trig(I, call, args, TS_COS, "cos"); }
static value *bsp_sinh(interp *I, const node *call, value **args) { return bsp_trig(I, call, args, TS_SINH, "sinh"); }
static value *bsp_cosh(interp *I, const node *call, value **args) { return bsp_trig(I, call, args, TS_COSH, "cosh"); }

/* Reads x = c*z^2 (z a declared variable, c a nonzero rational): sets *z and c.
   Returns 0 after reporting an error. */
int bsp_read_x(interp *I, const node *call, const value *x, slong *z, fmpq_t c)
{
    ulong e[SCALAR_MAX_VARS];
    slong v, found = -1;
    if (x->kind == V_NUM && fmpq_mpoly_length(x->num, I->ring.ctx) == 1) {
        fmpq_mpoly_get_term_exp_ui(e, x->num, 0, I->ring.ctx);
        for (v = 0; v < SCALAR_MAX_VARS; v++)
            if (e[v] != 0)
                found = (found == -1 && e[v] == 2 && v < SCALAR_PINV) ? v : -2;
        if (found >= 0) {
            fmpq_mpoly_get_term_coeff_fmpq(c, x->num, 0, I->ring.ctx);
            *z = found;
            return 1;
        }
    }
    builtin_fail_at(call, 0, "x must be c*z^2 for a declared variable z and a nonzero rational c "
                             "(the branch point at z = 0; x = z^2/2 is the convention, see docs/conventions.md)");
    return 0;
}

/* The terms of p with degree in z of the given parity (1: odd, 0: even), times f. */
void bsp_parity_part(fmpq_mpoly_t out, const fmpq_mpoly_t p, slong z, const fmpq_t f, int parity,
                     const fmpq_mpoly_ctx_t ctx)
{
    ulong e[SCALAR_MAX_VARS];
    fmpq_t c;
    fmpq_init(c);
    fmpq_mpoly_zero(out, ctx);
    for (slong i = 0; i < fmpq_mpoly_length(p, ctx); i++) {
        fmpq_mpoly_get_term_exp_ui(e, p, i, ctx);
        if ((int) (e[z] % 2) != parity)
            continue;
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, ctx);
        fmpq_mul(c, c, f);
        fmpq_mpoly_push_term_fmpq_ui(out, c, e, ctx);
    }
    fmpq_mpoly_sort_terms(out, ctx);
    fmpq_mpoly_combine_like_terms(out, ctx);
    fmpq_clear(c);
}

/* Checks the coefficient y_0 of z in the series s (the odd part): reports and returns 0 when the
   curve has no odd part, when y_0 vanishes or is not a rational number.  A series with a constant
   term is a Bessel-type curve, checked by bsp_check_bessel. */
int bsp_check_curve(interp *I, const node *at, const tseries *s)
{
    fmpq_mpoly_t y0;
    int ok;
    if (bsp_series_kind(I, s) == SP_CURVE_BESSEL)
        return bsp_check_bessel(I, at, s);
    fmpq_mpoly_init(y0, I->ring.ctx);
    tseries_coeff(y0, s, 1, I->ring.ctx);
    ok = !fmpq_mpoly_is_zero(s->p, I->ring.ctx) && fmpq_mpoly_is_fmpq(y0, I->ring.ctx)
         && !fmpq_mpoly_is_zero(y0, I->ring.ctx);
    if (fmpq_mpoly_is_zero(s->p, I->ring.ctx))
        diag_error(&at->loc, "y has no odd part in z: only the odd part of y enters the recursion, "
                             "and without it there is no branch point to expand at");
    else if (fmpq_mpoly_is_zero(y0, I->ring.ctx))
        diag_error(&at->loc, "the coefficient of z in y vanishes: the branch point at z = 0 is not "
                             "simple (y must start with y_0*z, y_0 a nonzero rational)");
    else if (!ok)
        diag_error(&at->loc, "the coefficient of z in y must be a nonzero rational number "
                             "(rescale y; symbolic coefficients are allowed from z^3 on)");
    fmpq_mpoly_clear(y0, I->ring.ctx);
    return ok;
}

/* curve(x, y): the odd part of y in z, times 2c for x = c*z^2 (only y dx enters the recursion, so
   x = c z^2 with y is x = z^2/2 with 2c y).  A polynomial y is exact to every order. */
static value *bsp_curve_new(interp *I, const node *call, value **args)
{
    slong z;
    fmpq_t c;
    value *r = NULL;
    fmpq_init(c);
    if (!bsp_read_x(I, call, args[0], &z, c))
        goto done;
    if (args[1]->kind == V_SERIES && args[1]->ser->var != z) {
        builtin_fail_at(call, 1, "y is a series in another variable than the z of x = c*z^2");
        goto done;
    }
    if (args[1]->kind != V_SERIES && args[1]->kind != V_NUM) {
        builtin_fail_at(call, 1, "y must be a polynomial or a series in z");
        goto done;
    }
    fmpq_mul_2exp(c, c, 1);
    r = value_new_series(z, args[1]->kind == V_SERIES ? args[1]->ser->order : TSERIES_MAX_ORDER, &I->ring);
    bsp_parity_part(r->ser->p, args[1]->kind == V_SERIES ? args[1]->ser->p : args[1]->num, z, c, 1, I->ring.ctx);
    if (args[1]->kind == V_NUM && fmpq_mpoly_degree_si(r->ser->p, z, I->ring.ctx) > TSERIES_MAX_ORDER) {
        builtin_fail_at(call, 1, "y has too high a degree in z");
        value_release(r);
        r = NULL;
    } else if (!bsp_check_curve(I, call->list->items[1], r->ser)) {
        value_release(r);
        r = NULL;
    }
done:
    fmpq_clear(c);
    return r;
}

void bsp_curve_clear(bsp_curve *C)
{
    if (C->y != NULL) {
        for (slong k = 0; k <= C->K; k++)
            fmpq_mpoly_clear(C->y + k, C->ctx);
        flint_free(C->y);
        fmpq_mpoly_ctx_clear(C->ctx);
    }
    free(C->map);
}

/* Reads y_0..y_K from the series v (argument i) into C, in a context of the variables used;
   the series must be known to z^{2K+1}, `what` names the request in that error.
   Returns 0 after reporting an error (C is then empty). */
int bsp_curve_read(interp *I, const node *call, value **args, int i, slong K, const char *what,
                          bsp_curve *C)
{
    const value *v = args[i];
    int used[SCALAR_MAX_VARS];
    memset(C, 0, sizeof *C);
    if (v->kind != V_SERIES) {
        builtin_fail_at(call, i, "expected a curve: make it with curve(z^2/2, y)");
        return 0;
    }
    if (!bsp_check_curve(I, call->list->items[i], v->ser))
        return 0;
    C->kind = bsp_series_kind(I, v->ser);
    slong top = C->kind == SP_CURVE_BESSEL ? 2 * K : 2 * K + 1;    /* the power of z holding y_K */
    if (v->ser->order < top) {
        char *msg = xasprintf("%s needs the curve to order z^%ld, but it is known to O(z^%ld): build "
                              "it from series(z, z, %ld) or higher", what, (long) top,
                              (long) (v->ser->order + 1), (long) top);
        builtin_fail_at(call, i, msg);
        free(msg);
        return 0;
    }
    fmpq_mpoly_used_vars(used, v->ser->p, I->ring.ctx);
    used[v->ser->var] = 0;
    C->z = v->ser->var;
    C->K = K;
    C->kind = bsp_series_kind(I, v->ser);
    C->map = xmalloc(SCALAR_MAX_VARS * sizeof(slong));
    for (slong j = 0; j < SCALAR_MAX_VARS; j++)
        if (used[j])
            C->map[C->nv++] = j;
    fmpq_mpoly_ctx_init(C->ctx, C->nv > 0 ? C->nv : 1, ORD_LEX);
    slong *back = xmalloc(SCALAR_MAX_VARS * sizeof(slong));
    for (slong j = 0, l = 0; j < SCALAR_MAX_VARS; j++)
        back[j] = used[j] ? l++ : -1;
    C->y = flint_malloc((size_t) (K + 1) * sizeof(fmpq_mpoly_struct));
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, I->ring.ctx);
    for (slong k = 0; k <= K; k++) {
        fmpq_mpoly_init(C->y + k, C->ctx);
        tseries_coeff(t, v->ser, C->kind == SP_CURVE_BESSEL ? 2 * k : 2 * k + 1, I->ring.ctx);
        fmpq_mpoly_compose_fmpq_mpoly_gen(C->y + k, t, back, I->ring.ctx, C->ctx);
    }
    fmpq_mpoly_clear(t, I->ring.ctx);
    free(back);
    while (C->K > 0 && fmpq_mpoly_is_zero(C->y + C->K, C->ctx))      /* the curve's own degree */
        fmpq_mpoly_clear(C->y + C->K--, C->ctx);
    return 1;
}

/* out (ring) = p (curve context) with the curve's variables put back. */
void bsp_to_ring(interp *I, fmpq_mpoly_t out, const fmpq_mpoly_t p, const bsp_curve *C)
{
    slong map1 = C->nv > 0 ? C->map[0] : -1;
    fmpq_mpoly_compose_fmpq_mpoly_gen(out, p, C->nv > 0 ? C->map : &map1, C->ctx, I->ring.ctx);
}

/* Declares prefix_1..prefix_n (as V_{g,n} declares L_i) with ring indices in vars.
   Returns 0 after reporting an error. */
static int bsp_declare(interp *I, const node *call, const char *prefix, slong n, int *vars)
{
    if (strcmp(prefix, "L") == 0)
        return integrate_declare_lengths(I, call, n, vars);
    for (slong i = 0; i < n; i++) {
        char name[32];
        snprintf(name, sizeof name, "%s_%ld", prefix, (long) (i + 1));
        vars[i] = scalar_ring_declare(&I->ring, name);
        if (vars[i] < 0) {
            diag_error(&call->loc, "not enough formal variables left for %s_1..%s_%ld", prefix, prefix, (long) n);
            return 0;
        }
        if (!scope_lookup(I->globals, name)) {
            value *v = value_new_num(&I->ring);
            scalar_set_gen(v->num, &I->ring, vars[i]);
            scope_bind_value(I->globals, name, v);
        }
    }
    return 1;
}

/* Reports a failed engine status at the call. */
static void bsp_report(const node *call, int st, slong g, slong n)
{
    if (st == SP_CANCELLED)
        diag_error(&call->loc, "%s", cancel_message());
    else if (st == SP_LIMIT)
        diag_error(&call->loc, "omega_{%ld,%ld} of this curve is beyond the engine's limits "
                               "(correlator table or memory; see --max-table)", (long) g, (long) n);
    else
        diag_error(&call->loc, "omega_{%ld,%ld}: %s", (long) g, (long) n, sp_status_string(st));
}

/* Refuses omega_{g,n} of the read curve C by estimate: the volume engine's time, or the correlator
   table's size bound (loose: only absurd requests) and the number of correlators.  Returns 0
   after reporting. */
static int bsp_refuse_by_estimate(interp *I, const node *call, const bsp_curve *C, slong g, slong n)
{
    if (C->kind == SP_CURVE_BESSEL)
        return bsp_refuse_bessel(I, call, C, g, n);
    if (sp_shift_uses_volumes(g, n, C->y, C->K, C->ctx)) {
        double sec, bytes;
        wpoly_estimate(&sec, &bytes, g, n);
        if (sec > I->lim.max_seconds)
            diag_error(&call->loc, "omega_{%ld,%ld} by the volume engine needs about %.3g s (limit %.3g s, "
                                   "raise with --max-seconds S)", (long) g, (long) n, sec, I->lim.max_seconds);
        return sec <= I->lim.max_seconds;
    }
    double est = sp_shift_estimate(g, n, C->K), memo = wk_estimate_entries(g, n + 3 * g - 3 + n);
    if (memo > 1e4 * I->lim.max_table) {
        diag_error(&call->loc, "omega_{%ld,%ld} of this curve needs correlators of genus %ld with up to %ld "
                               "points, far beyond the correlator table's limit (bound %.3g entries; --max-table)",
                   (long) g, (long) n, (long) g, (long) (3 * g - 3 + 2 * n), memo);
        return 0;
    }
    if (est > I->lim.max_terms) {
        char *num = est > 1e18 ? xstrdup("more than 1e18") : xasprintf("about %.3g", est);
        diag_error(&call->loc, "omega_{%ld,%ld} needs %s correlators, above the limit of %.3g "
                               "(raise it with --max-terms N)", (long) g, (long) n, num, I->lim.max_terms);
        free(num);
        return 0;
    }
    return 1;
}

/* Under --verify: W against the residue route when its memo estimate is small.  Returns SP_OK, the
   residue route's error, or -1 after reporting a disagreement. */
static int bsp_verify(interp *I, const node *call, const bsp_curve *C, const sp_table *W, slong g, slong n)
{
    sp_table R;
    int st;
    if (!I->verify)
        return SP_OK;
    if (sp_residue_estimate(g, n) > 1e5)
        return verify_unchecked(I, call, VERIFY_VALUE, 1, "the residue route's estimate is above its limit of 1e5")
                   ? SP_OK : -1;
    sp_table_init(&R, C->ctx);
    st = sp_omega_residue_kind(&R, C->kind, g, n, C->y, C->K, 1e6, &cancel_flag, C->ctx);
    if (st == SP_OK && !sp_table_equal(W, &R, C->ctx)) {
        diag_error(&call->loc, "verification failed: the intersection numbers and the recursion's "
                               "residues disagree on omega_{%ld,%ld} (please report this input)", (long) g, (long) n);
        st = -1;
    } else if (st == SP_OK) {
        verify_checked(I, VERIFY_VALUE, 1);
    }
    sp_table_clear(&R, C->ctx);
    return st;
}

/* W = the table of omega_{g,n} of the curve argument 0, refused by estimate first, compared with
   the residue route under --verify.  Returns 0 after reporting (C and W are then empty). */
static int bsp_compute(interp *I, const node *call, value **args, bsp_curve *C, sp_table *W,
                       slong g, slong n)
{
    sp_options o;
    memset(C, 0, sizeof *C);
    if (2 * g - 2 + n <= 0 || 3 * g - 3 + n > SP_MAX_DIM) {
        diag_error(&call->loc, 2 * g - 2 + n <= 0 ? "omega_{%ld,%ld} is not a stable correlator (needs 2g-2+n > 0)"
                                                  : "omega_{%ld,%ld}: dimension 3g-3+n above 400 is refused", (long) g, (long) n);
        return 0;
    }
    char *what = xasprintf("omega_{%ld,%ld}", (long) g, (long) n);
    int ok = bsp_curve_read(I, call, args, 0, bsp_curve_needs(I, args[0], g, n), what, C);
    free(what);
    if (!ok)
        return 0;
    if (!bsp_refuse_by_estimate(I, call, C, g, n)) {
        bsp_curve_clear(C);
        return 0;
    }
    sp_options_default(&o);
    o.cancel = &cancel_flag;
    o.threads = fastvol_threads();
    wpvol_set_cancel(&cancel_flag);
    if (C->kind == SP_CURVE_BESSEL && (o.theta = theta_lang_table(I, THETA_ROUTE_VIRASORO)) == NULL) {
        diag_error(&call->loc, "out of memory for the table of Theta-psi numbers");
        bsp_curve_clear(C);
        return 0;
    }
    sp_table_init(W, C->ctx);
    int st = sp_omega_shift_kind(W, C->kind, g, n, C->y, C->K, I->wk, &o, C->ctx);
    if (st == SP_OK)
        st = bsp_verify(I, call, C, W, g, n);
    if (st == SP_OK)
        return 1;
    if (st > 0)
        bsp_report(call, st, g, n);
    sp_table_clear(W, C->ctx);
    bsp_curve_clear(C);
    return 0;
}

/* Next permutation of a[0..n-1] in increasing lexicographic order; 0 after the last one. */
static int bsp_next_perm(slong *a, slong n)
{
    slong i = n - 2, j, t;
    while (i >= 0 && a[i] >= a[i + 1])
        i--;
    if (i < 0)
        return 0;
    for (j = n - 1; a[j] <= a[i]; j--)
        ;
    t = a[i], a[i] = a[j], a[j] = t;
    for (i++, j = n - 1; i < j; i++, j--)
        t = a[i], a[i] = a[j], a[j] = t;
    return 1;
}

/* The symmetric polynomial sum over rows and their distinct orderings e of
   W[row] prod var_i^{2 e_i + shift}, in the ring (shift 2: omega in u_i = 1/z_i; 0: V in L_i). */
static value *bsp_table_poly(interp *I, const sp_table *W, const bsp_curve *C, const int *vars, slong shift)
{
    value *r = value_new_num(&I->ring);
    ulong *e = xcalloc(SCALAR_MAX_VARS, sizeof(ulong));
    slong *a = xmalloc((size_t) W->n * sizeof(slong)), n = W->n;
    fmpq_mpoly_t c, m;
    fmpq_t one;
    fmpq_mpoly_init(c, I->ring.ctx), fmpq_mpoly_init(m, I->ring.ctx);
    fmpq_init(one);
    fmpq_one(one);
    for (slong row = 0; row < W->len; row++) {
        if (fmpq_mpoly_is_zero(W->c + row, C->ctx))
            continue;
        bsp_to_ring(I, c, W->c + row, C);
        for (slong i = 0; i < n; i++)                   /* ascending: the first permutation */
            a[i] = W->d[row * n + n - 1 - i];
        do {
            for (slong i = 0; i < n; i++)
                e[vars[i]] = (ulong) (2 * a[i] + shift);
            fmpq_mpoly_zero(m, I->ring.ctx);
            fmpq_mpoly_set_coeff_fmpq_ui(m, one, e, I->ring.ctx);
            fmpq_mpoly_mul(m, m, c, I->ring.ctx);
            fmpq_mpoly_add(r->num, r->num, m, I->ring.ctx);
        } while (bsp_next_perm(a, n));
    }
    fmpq_mpoly_clear(c, I->ring.ctx), fmpq_mpoly_clear(m, I->ring.ctx);
    fmpq_clear(one);
    free(e), free(a);
    r->termwise = 1;
    return r;
}

/* omega(C, g, n) (u = 1/z) and curve_volume(C, g, n) (in L): the polynomial of the table. */
static value *bsp_poly_builtin(interp *I, const node *call, value **args, int volume)
{
    bsp_curve C;
    sp_table W;
    slong g, n;
    fmpz_t terms;
    if (!builtin_get_slong(I, call, args, 1, 0, SP_MAX_DIM, &g) || !builtin_get_slong(I, call, args, 2, 1, SP_MAX_DIM, &n))
        return NULL;
    fmpz_init(terms);
    if (3 * g - 3 + n >= 0)
        fmpz_bin_uiui(terms, (ulong) (3 * g - 3 + 2 * n), (ulong) n);   /* monomials of degree <= D */
    if (fmpz_cmp_si(terms, I->lim.max_class_terms) > 0) {
        diag_error(&call->loc, "omega_{%ld,%ld} has about %.3g terms, above the limit of %ld (raise it with "
                               "--max-terms N)", (long) g, (long) n, fmpz_get_d(terms), (long) I->lim.max_class_terms);
        fmpz_clear(terms);
        return NULL;
    }
    fmpz_clear(terms);
    if (!bsp_compute(I, call, args, &C, &W, g, n))
        return NULL;
    int *vars = xmalloc((size_t) n * sizeof(int));
    value *r = NULL;
    if (volume)
        sp_table_to_volume(&W, &W, C.ctx);
    if (bsp_declare(I, call, volume ? "L" : "u", n, vars))
        r = bsp_table_poly(I, &W, &C, vars, volume ? 0 : 2);
    free(vars);
    sp_table_clear(&W, C.ctx);
    bsp_curve_clear(&C);
    return r;
}

static value *bsp_omega(interp *I, const node *call, value **args) { return bsp_poly_builtin(I, call, args, 0); }
static value *bsp_volume(interp *I, const node *call, value **args) { return bsp_poly_builtin(I, call, args, 1); }

/* Reads argument i as a multi-index: one integer (n = 1) or a list of integers >= 0.
   Returns n, or 0 after reporting an error; *d is allocated (caller frees). */
slong bsp_read_index(interp *I, const node *call, value **args, int i, slong **d)
{
    const value *v = args[i];
    slong n = v->kind == V_LIST ? v->len : 1;
    *d = xmalloc((size_t) (n > 0 ? n : 1) * sizeof(slong));
    for (slong j = 0; j < n; j++) {
        const value *x = v->kind == V_LIST ? v->items[j] : v;
        if (x->kind != V_NUM || !scalar_get_slong(*d + j, x->num, &I->ring) || (*d)[j] < 0 || (*d)[j] > SP_MAX_DIM) {
            builtin_fail_at(call, i, "expected the exponents d_i as an integer >= 0 or a list [d_1, ..., d_n]");
            free(*d);
            *d = NULL;
            return 0;
        }
    }
    if (n == 0) {
        builtin_fail_at(call, i, "expected at least one exponent d_i");
        free(*d);
        *d = NULL;
    }
    return n;
}

/* omega_coeff(C, g, d): the coefficient of prod dz_i / z_i^{2 d_i + 2} in omega_{g,n}. */
static value *bsp_omega_coeff(interp *I, const node *call, value **args)
{
    bsp_curve C;
    sp_table W;
    slong g, n, *d = NULL, r;
    if (!builtin_get_slong(I, call, args, 1, 0, SP_MAX_DIM, &g) || (n = bsp_read_index(I, call, args, 2, &d)) == 0)
        return NULL;
    if (!bsp_compute(I, call, args, &C, &W, g, n)) {
        free(d);
        return NULL;
    }
    for (slong i = 1; i < n; i++)                       /* rows are sorted decreasingly */
        for (slong j = i; j > 0 && d[j - 1] < d[j]; j--) {
            slong t = d[j];
            d[j] = d[j - 1], d[j - 1] = t;
        }
    r = sp_table_find(&W, d);
    value *v = value_new_num(&I->ring);
    if (r >= 0)
        bsp_to_ring(I, v->num, W.c + r, &C);
    free(d);
    sp_table_clear(&W, C.ctx);
    bsp_curve_clear(&C);
    return v;
}

/* curve_times(C, N) = [s_1, ..., s_N] and curve_kdv(C, N) = [t_0, ..., t_N] (t_{k+1} = -p_k). */
static value *bsp_dictionary(interp *I, const node *call, value **args, int kdv)
{
    slong N;
    bsp_curve C;
    if (!builtin_get_slong(I, call, args, 1, kdv ? 0 : 1, 100000, &N))
        return NULL;
    int bessel = args[0]->kind == V_SERIES && bsp_series_kind(I, args[0]->ser) == SP_CURVE_BESSEL;
    slong M = kdv && !bessel ? N - 1 : N, len = kdv ? N + 1 : N;   /* Bessel kind: t_k = -p_k */
    if (!bsp_curve_read(I, call, args, 0, M, kdv ? "curve_kdv" : "curve_times", &C))
        return NULL;
    fmpq_mpoly_struct *s = flint_malloc((size_t) (M + 2) * sizeof(fmpq_mpoly_struct));
    for (slong k = 0; k <= M + 1; k++)
        fmpq_mpoly_init(s + k, C.ctx);
    if (kdv)
        sp_shift_times_kind(s, M < 0 ? 0 : M, C.kind, C.y, C.K, C.ctx);
    else
        sp_times_kind(s, M, C.kind, C.y, C.K, C.ctx);
    value *r = value_new_list(len, &I->ring);
    for (slong i = 0; i < len; i++) {
        r->items[i] = value_new_num(&I->ring);
        if (kdv && i >= (bessel ? 1 : 2)) {             /* t_i = -p_{i-1}, Bessel kind -p_i */
            bsp_to_ring(I, r->items[i]->num, s + (bessel ? i : i - 1), &C);
            fmpq_mpoly_neg(r->items[i]->num, r->items[i]->num, I->ring.ctx);
        } else if (!kdv)
            bsp_to_ring(I, r->items[i]->num, s + (i + 1), &C);
    }
    for (slong k = 0; k <= M + 1; k++)
        fmpq_mpoly_clear(s + k, C.ctx);
    flint_free(s);
    bsp_curve_clear(&C);
    return r;
}

static value *bsp_times(interp *I, const node *call, value **args) { return bsp_dictionary(I, call, args, 0); }
static value *bsp_kdv(interp *I, const node *call, value **args) { return bsp_dictionary(I, call, args, 1); }

const builtin builtins_spectral[] = {
    {"sin", 1, bsp_sin, "sin(S) for a series S with zero constant term"},
    {"cos", 1, bsp_cos, "cos(S) for a series S with zero constant term"},
    {"sinh", 1, bsp_sinh, "sinh(S) for a series S with zero constant term"},
    {"cosh", 1, bsp_cosh, "cosh(S) for a series S with zero constant term"},
    {"curve", 2, bsp_curve_new, "curve(x, y) with x = c*z^2: the spectral curve, normalised to x = z^2/2"},
    {"curve_over_z", 2, bsp_curve_over_z, "curve_over_z(x, w) with x = c*z^2: the curve y = w/z (Bessel type when w(0) != 0)"},
    {"omega", 3, bsp_omega, "omega(C, g, n): omega_{g,n} of the curve C in u_i = 1/z_i"},
    {"omega_coeff", 3, bsp_omega_coeff, "omega_coeff(C, g, [d_1, ..., d_n]): coefficient of prod 1/z_i^(2d_i+2)"},
    {"curve_volume", 3, bsp_volume, "curve_volume(C, g, n): the volume polynomial V_{g,n}(L_1..L_n) of C"},
    {"curve_times", 2, bsp_times, "curve_times(C, N): the kappa times [s_1, ..., s_N] of C"},
    {"curve_kdv", 2, bsp_kdv, "curve_kdv(C, N): the shifted KdV times [t_0, ..., t_N] of C"},
    {NULL, 0, NULL, NULL},
};

