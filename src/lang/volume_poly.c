/* V_{g,n}(L_1..L_n) as a polynomial: by the volume engine when it is faster or the only one
   in reach (fastvol.c), else coefficient by coefficient by the reduction. */
#include <stdlib.h>
#include <string.h>

#include <flint/fmpq_vec.h>

#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "diag.h"
#include "fastvol.h"
#include "verify_account.h"
#include "integrate.h"
#include "progress.h"
#include "route_reduction.h"
#include "util.h"
#include "volumes/wpoly.h"
#include "verify_account.h"

/* Coefficient of L^{2 alpha} pi^{2(D-m)} in V_{g,n}(L), m = |alpha|:
   2^{D-m}/(D-m)! * int psi^alpha kappa_1^{D-m} / (2^m prod alpha_i!).
   Memoised on the sorted alpha, since V_{g,n} is symmetric. */
static int volume_coeff(fmpq_t c, interp *I, keymap *memo, slong g, slong n, const slong *alpha)
{
    slong *key = xmalloc((n + 1) * sizeof(slong));
    memcpy(key, alpha, n * sizeof(slong));
    for (slong i = 1; i < n; i++)
        for (slong j = i; j > 0 && key[j - 1] < key[j]; j--) {
            slong t = key[j];
            key[j] = key[j - 1];
            key[j - 1] = t;
        }
    const fmpq *hit = keymap_get(memo, key, n);
    int rc = WK_OK;
    if (hit) {
        fmpq_set(c, hit);
    } else {
        slong D = 3 * g - 3 + n, m = 0, kmult[2];
        for (slong i = 0; i < n; i++)
            m += key[i];
        kmult[0] = 0;
        kmult[1] = D - m;
        reduction_run run;
        run.I = I;
        run.done = 0;
        progress_start(&run.bar, "V_{g,n}: coefficients", 0);
        run.bar.enabled = 0;   /* one monomial at a time: the caller's loop is what takes long */
        rc = reduction_monomial(c, &run, g, key, n, kmult, D - m > 0 ? 1 : 0);
        fmpz_t f;
        fmpz_init(f);
        fmpz_fac_ui(f, (ulong)(D - m));
        fmpq_div_fmpz(c, c, f);
        fmpq_mul_2exp(c, c, (ulong)(D - m));
        fmpq_div_2exp(c, c, (ulong)m);
        for (slong i = 0; i < n; i++) {
            fmpz_fac_ui(f, (ulong)key[i]);
            fmpq_div_fmpz(c, c, f);
        }
        fmpz_clear(f);
        if (rc == WK_OK)
            keymap_set(memo, key, n, c);
    }
    free(key);
    return rc;
}

typedef struct {
    interp *I;
    keymap memo;
    slong g, n, D;
    const int *vars;       /* ring index of L_1..L_n */
    slong *alpha;
    ulong *exps;
    scalar_terms terms;    /* the result, collected (one rescaling at the end) */
    fmpq_t c;
} volume_walk;

/* Visits every alpha with |alpha| <= D, adding its term to the result. The recursion is
   n < SCALAR_MAX_VARS deep; the stack guard covers calls from deeply nested user code. */
static int volume_visit(volume_walk *W, slong i, slong left)
{
    if (util_stack_exhausted())
        return WK_TOO_DEEP;
    if (i == W->n) {
        int rc = volume_coeff(W->c, W->I, &W->memo, W->g, W->n, W->alpha);
        if (rc != WK_OK || fmpq_is_zero(W->c))
            return rc;
        memset(W->exps, 0, SCALAR_MAX_VARS * sizeof(ulong));
        for (slong k = 0; k < W->n; k++)
            W->exps[W->vars[k]] = 2 * (ulong)W->alpha[k];
        W->exps[SCALAR_PI] = 2 * (ulong)left;
        scalar_terms_push(&W->terms, W->c, W->exps);
        return WK_OK;
    }
    for (slong a = 0; a <= left; a++) {
        W->alpha[i] = a;
        int rc = volume_visit(W, i + 1, left - a);
        if (rc != WK_OK)
            return rc;
    }
    return WK_OK;
}

/* Declares L_1..L_n (reusing existing ones) as formal variables, binds the names
   that are still free in the global scope, and records their ring indices in
   vars[0..n); the order is the same for every route that builds V_{g,n}(L).
   Returns 0 after reporting an error. */
int integrate_declare_lengths(interp *I, const node *where, slong n, int *vars)
{
    for (slong i = 0; i < n; i++) {
        char name[32];
        snprintf(name, sizeof name, "L_%ld", (long)(i + 1));
        vars[i] = scalar_ring_declare(&I->ring, name);
        if (vars[i] < 0) {
            diag_error(&where->loc, "not enough formal variables left for L_1..L_%ld", (long)n);
            return 0;
        }
        if (!scope_lookup(I->globals, name)) {   /* so that the script can use L_i afterwards */
            value *v = value_new_num(&I->ring);
            scalar_set_gen(v->num, &I->ring, vars[i]);
            scope_bind_value(I->globals, name, v);
        }
    }
    return 1;
}

static value *volume_reference(interp *I, const node *where, slong g, slong n);
static value *volume_compare(interp *I, const node *where, value *slow, value *fast);

/* With --verify: the reduction's polynomial, if within its limits, must be
   the same. Returns fast, or NULL after reporting a disagreement. */
static value *volume_engine_verify(interp *I, const node *where, slong g, slong n, double terms, value *fast)
{
    if (!I->verify)
        return fast;
    if (terms > I->lim.max_terms)
        return verify_unchecked_value(I, where, fast, VERIFY_WHY_REDUCTION_TERMS);
    if (fastvol_reduction_refused(I, g, n))
        return verify_unchecked_value(I, where, fast, VERIFY_WHY_REDUCTION_TABLE);
    verify_second_begin(I);
    value *slow = volume_reference(I, where, g, n);
    verify_second_end(I);
    return volume_compare(I, where, slow, fast);
}

/* V_{g,n}(L) = int exp(2 pi^2 kappa_1 + sum_i L_i^2 psi_i / 2) from the coefficients w,
   printed term by term. Returns a new value. */
static value *volume_engine_sum(interp *I, const fmpq *w, const slong *idx, slong nidx, slong n, slong D,
                                 const int *vars)
{
    fmpq_mpoly_t c;
    fmpq_mpoly_struct b[WPOLY_MAX_POINTS];
    fmpq_mpoly_init(c, I->ring.ctx);
    scalar_set_gen(c, &I->ring, SCALAR_PI);
    fmpq_mpoly_mul(c, c, c, I->ring.ctx);
    fmpq_mpoly_scalar_mul_si(c, c, 2, I->ring.ctx);
    for (slong i = 0; i < n; i++) {
        fmpq_mpoly_init(b + i, I->ring.ctx);
        scalar_set_gen(b + i, &I->ring, vars[i]);
        fmpq_mpoly_mul(b + i, b + i, b + i, I->ring.ctx);
        fmpq_mpoly_scalar_div_si(b + i, b + i, 2, I->ring.ctx);
    }
    value *r = fastvol_exp_sum(I, w, idx, nidx, n, D, c, b);
    r->termwise = 1;
    for (slong i = 0; i < n; i++)
        fmpq_mpoly_clear(b + i, I->ring.ctx);
    fmpq_mpoly_clear(c, I->ring.ctx);
    return r;
}

/* With --verify for one point beyond the reduction's limits: the engine's per-index route (one
   perturbed run per coefficient) checks its transposed route when its estimate is within
   --max-seconds. */
static int volume_engine_second_wanted(interp *I, slong g, slong n, double terms, const slong *idx, slong nidx)
{
    double sec, bytes;
    if (!I->verify || n != 1 || nidx < 3)
        return 0;
    if (terms <= I->lim.max_terms && !fastvol_reduction_refused(I, g, n))
        return 0;   /* the reduction checks */
    wpoly_estimate_at_route(&sec, &bytes, g, n, idx, nidx, WPOLY_ROUTE_PER_INDEX);
    return sec <= I->lim.max_seconds;
}

/* The check of volume_engine_second_wanted: fast, or NULL after reporting a disagreement (or
   the check's failure). */
static value *volume_engine_second(interp *I, const node *where, slong g, slong n, const slong *idx, slong nidx,
                                   const int *vars, value *fast)
{
    verify_second_begin(I);
    fmpq *w = fastvol_poly_run_route(I, where, g, n, idx, nidx, WPOLY_ROUTE_PER_INDEX);
    verify_second_end(I);
    if (!w) {
        value_release(fast);
        return NULL;
    }
    value *slow = volume_engine_sum(I, w, idx, nidx, n, 3 * g - 3 + n, vars);
    _fmpq_vec_clear(w, nidx);
    int same = fmpq_mpoly_equal(slow->num, fast->num, I->ring.ctx);
    value_release(slow);
    if (same) {
        verify_checked(I, VERIFY_VALUE, 1);
        return fast;
    }
    diag_error(&where->loc, "verification failed: the transposed and the per-index routes of the volume engine "
                            "disagree (please report this input)");
    value_release(fast);
    return NULL;
}

/* V_{g,0} = (2 pi^2)^D V_{g,0} (normalised) from the session's table of the volume engine, on
   every processor; NULL after reporting an error. */
static value *volume_closed_engine_value(interp *I, const node *where, slong g)
{
    fmpq_t V;
    fmpq_init(V);
    value *r = NULL;
    if (fastvol_get(I, where, V, g, 0)) {
        fmpq_mpoly_t c;
        fmpq_mpoly_init(c, I->ring.ctx);
        scalar_set_gen(c, &I->ring, SCALAR_PI);
        fmpq_mpoly_mul(c, c, c, I->ring.ctx);
        fmpq_mpoly_scalar_mul_si(c, c, 2, I->ring.ctx);
        r = value_new_num(&I->ring);
        fmpq_mpoly_pow_ui(r->num, c, (ulong)(3 * g - 3), I->ring.ctx);
        fmpq_mpoly_scalar_mul_fmpq(r->num, r->num, V, I->ring.ctx);
        fmpq_mpoly_clear(c, I->ring.ctx);
    }
    fmpq_clear(V);
    return r;
}

/* V_{g,0} by the engine when the reduction's kappa_1 pushforward would be large (the threshold of
   the kappa_1 routes of int_{g,n}) or --volume-engine asks for it. */
static value *volume_closed_by_engine(interp *I, const node *where, slong g, int *handled)
{
    slong D = 3 * g - 3, kmult[2] = {0, D};
    double terms = pf_estimate_terms(kmult, 1);
    *handled = I->route_volumes || terms > FASTVOL_MIN_TERMS;
    if (!*handled)
        return NULL;
    value *r = volume_closed_engine_value(I, where, g);
    return r ? volume_engine_verify(I, where, g, 0, terms, r) : NULL;
}

/* All coefficients of V_{g,n}(L), 1 <= n <= WPOLY_MAX_POINTS, by the polynomial engine; NULL
   after reporting an error. */
static value *volume_poly_engine_value(interp *I, const node *where, slong g, slong n, const slong *idx, slong nidx,
                                       int *vars)
{
    value *r = NULL;
    fmpq *w = integrate_declare_lengths(I, where, n, vars) ? fastvol_poly_run(I, where, g, n, idx, nidx) : NULL;
    if (w) {
        r = volume_engine_sum(I, w, idx, nidx, n, 3 * g - 3 + n, vars);
        _fmpq_vec_clear(w, nidx);
    }
    return r;
}

/* With --verify, a polynomial the reduction computed is recomputed by the volume engine (the
   table for n = 0, the polynomial engine for 1 <= n <= WPOLY_MAX_POINTS, g >= 2) when the
   engine's estimate is within its limits. Returns r, or NULL after reporting a disagreement. */
static value *volume_reduction_verify(interp *I, const node *where, slong g, slong n, value *r)
{
    char msg[320];
    double sec;
    if (!r || !I->verify)
        return r;
    if (g < 2 || n > WPOLY_MAX_POINTS)
        return verify_unchecked_value(I, where, r, VERIFY_WHY_NO_ROUTE_VOLUME);
    slong nidx = n == 0 ? 0 : wpoly_indices(NULL, g, n);
    slong *idx = xmalloc((size_t)(nidx * n + 1) * sizeof(slong));
    if (n > 0)
        wpoly_indices(idx, g, n);
    int vars[WPOLY_MAX_POINTS];
    value *eng = NULL;
    if ((n == 0 ? fastvol_table_cost(I, g, 0, &sec, msg, sizeof msg)
                : fastvol_poly_cost(I, g, n, idx, nidx, &sec, msg, sizeof msg)) != NULL) {
        free(idx);
        return verify_unchecked_value(I, where, r, VERIFY_WHY_ENGINE_COST);
    }
    verify_second_begin(I);
    eng = n == 0 ? volume_closed_engine_value(I, where, g) : volume_poly_engine_value(I, where, g, n, idx, nidx, vars);
    verify_second_end(I);
    free(idx);
    return volume_compare(I, where, eng, r);
}

static value *volume_by_engine(interp *I, const node *where, slong g, slong n, int *handled)
{
    *handled = 0;
    if (g >= 2 && n == 0)
        return volume_closed_by_engine(I, where, g, handled);
    if (g < 2 || n < 1 || n > WPOLY_MAX_POINTS)
        return NULL;
    slong nidx = wpoly_indices(NULL, g, n);
    slong *idx = xmalloc((size_t)(nidx * n) * sizeof(slong));
    wpoly_indices(idx, g, n);
    double terms = fastvol_poly_terms(g, n, idx, nidx);
    value *r = NULL;
    int vars[WPOLY_MAX_POINTS];
    if (fastvol_poly_wanted(I, g, n, terms, idx, nidx)) {
        *handled = 1;
        r = volume_poly_engine_value(I, where, g, n, idx, nidx, vars);
        if (r) {
            if (volume_engine_second_wanted(I, g, n, terms, idx, nidx))
                r = volume_engine_second(I, where, g, n, idx, nidx, vars, r);
            else
                r = volume_engine_verify(I, where, g, n, terms, r);
        }
    }
    free(idx);
    return r;
}

/* Whether V_{g,n}(L) has few enough terms to be written out; reports when not. */
static int volume_size_ok(interp *I, const node *where, slong g, slong n)
{
    slong D = 3 * g - 3 + n;
    fmpz_t terms;
    fmpz_init(terms);
    fmpz_bin_uiui(terms, (ulong)(D + n), (ulong)n);
    int small = fmpz_cmp_si(terms, I->lim.max_class_terms) <= 0;
    if (!small)
        diag_error(&where->loc, "V_{%ld,%ld}(L) has about %.3g terms, above the limit of %ld (raise it with --max-terms N)",
                   (long)g, (long)n, fmpz_get_d(terms), (long)I->lim.max_class_terms);
    fmpz_clear(terms);
    return small;
}

/* Whether the reduction of all of V_{g,n}(L) may run: the fitted model of fastvol.c for
   2 <= n <= WPOLY_MAX_POINTS, the proven table bound otherwise; reports when not. */
static int volume_reduction_ok(interp *I, const node *where, slong g, slong n)
{
    if (n < 2 || n > WPOLY_MAX_POINTS)
        return integrate_table_ok(I, where, g, n + 3 * g - 3 + n);
    double sec = fastvol_reduction_seconds(g, n);
    if (fastvol_reduction_refused(I, g, n)) {
        diag_error(&where->loc, "V_{%ld,%ld}(L) by the reduction needs a correlator table above the limit of %.3g "
                                "entries (raise it with --max-table N)", (long)g, (long)n, I->lim.max_table);
        return 0;
    }
    if (sec <= I->lim.max_seconds)
        return 1;
    diag_error(&where->loc, "V_{%ld,%ld}(L) by the reduction needs about %.3g s, above the limit of %g s (raise it "
                            "with --max-seconds S)", (long)g, (long)n, sec, I->lim.max_seconds);
    return 0;
}

/* Every coefficient by the reduction, memoised on the sorted multi-index. */
static value *volume_by_reduction(interp *I, const node *where, slong g, slong n)
{
    if (n > SCALAR_MAX_VARS - 1 || !volume_reduction_ok(I, where, g, n))
        return NULL;
    int *vars = xmalloc((n + 1) * sizeof(int));
    value *r = NULL;
    if (integrate_declare_lengths(I, where, n, vars)) {
        r = value_new_num(&I->ring);
        volume_walk W;
        W.I = I;
        W.g = g;
        W.n = n;
        W.D = 3 * g - 3 + n;
        W.vars = vars;
        W.alpha = xcalloc(n + 1, sizeof(slong));
        W.exps = xcalloc(SCALAR_MAX_VARS, sizeof(ulong));
        scalar_terms_init(&W.terms);
        keymap_init(&W.memo);
        fmpq_init(W.c);
        int rc = volume_visit(&W, 0, W.D);
        if (rc == WK_OK)
            scalar_terms_add_to(r->num, &W.terms, &I->ring);
        scalar_terms_clear(&W.terms);
        fmpq_clear(W.c);
        keymap_clear(&W.memo);
        free(W.alpha);
        free(W.exps);
        if (rc != WK_OK) {
            integrate_report_engine(where, rc);
            value_release(r);
            r = NULL;
        } else {
            r->termwise = 1;
        }
    }
    free(vars);
    return r;
}

static value *volume_reference(interp *I, const node *where, slong g, slong n)
{
    if (!integrate_space_ok(I, where, g, n) || !volume_size_ok(I, where, g, n))
        return NULL;
    return volume_by_reduction(I, where, g, n);
}

value *integrate_volume(interp *I, const node *where, slong g, slong n)
{
    if (!integrate_space_ok(I, where, g, n) || !volume_size_ok(I, where, g, n))
        return NULL;
    int handled = 0;
    value *fast = n < SCALAR_MAX_VARS ? volume_by_engine(I, where, g, n, &handled) : NULL;
    if (handled || n > SCALAR_MAX_VARS - 1)
        return fast;
    return volume_reduction_verify(I, where, g, n, volume_by_reduction(I, where, g, n));
}

static value *volume_compare(interp *I, const node *where, value *slow, value *fast)
{
    if (!slow)
        return fast;
    int same = fmpq_mpoly_equal(slow->num, fast->num, I->ring.ctx);
    value_release(slow);
    if (same) {
        verify_checked(I, VERIFY_VALUE, 1);
        return fast;
    }
    diag_error(&where->loc, "verification failed: the volume engine and the pushforward reduction disagree "
                            "(please report this input)");
    value_release(fast);
    return NULL;
}
