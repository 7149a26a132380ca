/* Theta numbers and super volumes for the language: the tables of the session, <Theta | ...>_g
   with --verify comparing the Virasoro and KdV routes, supervolume(g, n) and VTheta_{g,n},
   Theta integrals through the results store, and the evaluation of FTheta_{g} with ... */
#include <stdlib.h>
#include <string.h>

#include "builtins.h"
#include "cancel.h"
#include "diag.h"
#include "series/spec.h"
#include "theta_lang.h"
#include "verify_account.h"
#include "util.h"
#include "integrate.h"
#include "integrand_check.h"
#include "eval.h"
#include "failure.h"

int theta_is_class_name(const char *name)
{
    return strcmp(name, "Theta") == 0;
}

value *theta_class_value(interp *I, const node *n)
{
    return value_new_class(cx_theta(I->ring.ctx, n), &I->ring);
}

theta_table *theta_lang_table(interp *I, int route)
{
    theta_table **slot = route == THETA_ROUTE_KDV ? &I->theta_kdv : &I->theta_vir;
    if (*slot == NULL) {
        *slot = theta_table_new(route);
        if (*slot == NULL)
            return NULL;
        theta_table_set_cancel(*slot, &cancel_flag);
        theta_table_set_limit(*slot, I->lim.max_table > 1e15 ? (slong)1e15 : (slong)I->lim.max_table);
    }
    return *slot;
}

void theta_lang_clear(interp *I)
{
    theta_table_free(I->theta_vir);
    theta_table_free(I->theta_kdv);
    I->theta_vir = I->theta_kdv = NULL;
}

void theta_lang_report(interp *I, const node *where, int rc)
{
    (void)I;
    static const failure_words words[] = {
        {WK_LIMIT, "the Theta table reached its size limit (raise it with --max-table N), or the reduction has "
                   "more than --max-terms correlator terms"},
        {THETA_INEXACT, "verification failed: the KdV route for Theta numbers met an inexact division (please "
                        "report this input)"},
        {0, NULL},
    };
    failure_report(where, "the Theta engine", rc, WK_CANCELLED, words);
}

int theta_genus_ok(interp *I, const node *where, slong g)
{
    if (g > THETA_MAX_GENUS) {
        diag_error(&where->loc, "Theta numbers are computed up to genus %d, not %ld", THETA_MAX_GENUS, (long)g);
        return 0;
    }
    double est = theta_estimate_entries(g);
    if (est > I->lim.max_table) {
        diag_error(&where->loc, "Theta numbers of genus %ld need about %.3g table entries, above the limit of "
                                "%.3g (raise it with --max-table N)", (long)g, est, I->lim.max_table);
        return 0;
    }
    return 1;
}

/* With --verify, the KdV route recomputes a Theta-psi number; 0 after reporting a difference. */
static int theta_verify_number(interp *I, const node *where, slong g, const slong *d, slong n, const fmpq_t first)
{
    theta_table *K = theta_lang_table(I, THETA_ROUTE_KDV);
    fmpq_t r;
    fmpq_init(r);
    int rc = K ? theta_correlator(r, K, g, d, n) : WK_LIMIT, ok = 1;
    if (rc == WK_LIMIT) {
        ok = verify_unchecked(I, where, VERIFY_VALUE, 1, "the Theta KdV route's table reached its limit");
    } else if (rc != WK_OK) {
        theta_lang_report(I, where, rc);
        ok = 0;
    } else if (fmpq_equal(r, first)) {
        verify_checked(I, VERIFY_VALUE, 1);
    } else {
        diag_error(&where->loc, "verification failed: the Virasoro and KdV routes disagree on this Theta "
                                "number (please report this input)");
        ok = 0;
    }
    fmpq_clear(r);
    return ok;
}

value *theta_correlator_value(interp *I, const node *where, slong g, const slong *d, slong n)
{
    if (!theta_is_class_name(where->text)) {
        diag_error(&where->loc, "'%s' is not a class of a correlator: the form is <Theta | tau_...>_g", where->text);
        return NULL;
    }
    if (2 * g - 2 + n <= 0) {
        diag_error(&where->loc, "Mbar_{%ld,%ld} is not a stable moduli space (needs 2g-2+n > 0)", (long)g, (long)n);
        return NULL;
    }
    if (g == 0) {
        if (integrand_first_warning(I, where))
            diag_warning(&where->loc, "Theta is zero on Mbar_{0,%ld} (Theta_{0,n} = 0): the correlator is 0", (long)n);
        return value_new_num(&I->ring);
    }
    slong sum = integrate_exponent_sum(d, n);
    if (sum != g - 1) {   /* Theta has degree 2g-2+n, which leaves g-1 for the psi classes */
        integrand_warn_correlator(I, where, g, n, sum, g - 1, "Theta correlator");
        return value_new_num(&I->ring);
    }
    if (!theta_genus_ok(I, where, g))
        return NULL;
    theta_table *T = theta_lang_table(I, THETA_ROUTE_VIRASORO);
    fmpq_t r;
    fmpq_init(r);
    int rc = T ? theta_correlator(r, T, g, d, n) : WK_LIMIT;
    value *v = NULL;
    if (rc != WK_OK)
        theta_lang_report(I, where, rc);
    else if (!I->verify || theta_verify_number(I, where, g, d, n, r))
        v = value_new_fmpq(&I->ring, r);
    fmpq_clear(r);
    return v;
}

typedef struct {
    interp *I;
    const node *where;
    keymap memo;             /* c_d by sorted d */
    slong g, n;
    const int *vars;         /* ring index of L_1..L_n */
    slong *d, *key;
    ulong *exps;
    scalar_terms terms;    /* the result, collected (one rescaling at the end) */
    fmpq_t c;
} theta_vwalk;

/* c_d = int Theta psi^d kappa_1^k / k! (theta_volume_coeff), memoised on the sorted d; with
   --verify also by the pushforward on the KdV table.  Returns a status of theta.h. */
static int theta_vwalk_coeff(theta_vwalk *W)
{
    memcpy(W->key, W->d, W->n * sizeof(slong));
    for (slong i = 1; i < W->n; i++)   /* insertion sort, descending: V^Theta is symmetric */
        for (slong j = i; j > 0 && W->key[j - 1] < W->key[j]; j--) {
            slong t = W->key[j];
            W->key[j] = W->key[j - 1];
            W->key[j - 1] = t;
        }
    const fmpq *hit = keymap_get(&W->memo, W->key, W->n);
    if (hit) {
        fmpq_set(W->c, hit);
        return WK_OK;
    }
    theta_table *T = theta_lang_table(W->I, THETA_ROUTE_VIRASORO);
    int rc = T ? theta_volume_coeff(W->c, T, W->g, W->key, W->n) : WK_LIMIT;
    if (rc == WK_OK && W->I->verify) {
        slong k = W->g - 1, kmult[2] = {0, 0};
        for (slong i = 0; i < W->n; i++)
            k -= W->key[i];
        kmult[1] = k;
        theta_table *K = theta_lang_table(W->I, THETA_ROUTE_KDV);
        fmpq_t p;
        fmpz_t f;
        fmpq_init(p);
        fmpz_init(f);
        rc = K ? theta_kappa_pushforward(p, K, W->g, W->key, W->n, kmult, 1, (slong)W->I->lim.max_terms) : WK_LIMIT;
        fmpz_fac_ui(f, (ulong)k);
        fmpq_div_fmpz(p, p, f);
        if (rc == WK_OK && !fmpq_equal(p, W->c))
            rc = THETA_INEXACT;
        else if (rc == WK_OK)
            verify_checked(W->I, VERIFY_MONOMIAL, 1);
        fmpq_clear(p);
        fmpz_clear(f);
    }
    if (rc == WK_OK)
        keymap_set(&W->memo, W->key, W->n, W->c);
    return rc;
}

/* Visits every d with |d| <= left in slots i..n-1 and adds c_d (2 pi^2)^k prod (L^2/2)^d/d! . */
static int theta_vwalk_visit(theta_vwalk *W, slong i, slong left)
{
    if (i == W->n) {
        int rc = theta_vwalk_coeff(W);
        if (rc != WK_OK || fmpq_is_zero(W->c))
            return rc;
        fmpz_t f;
        fmpz_init(f);
        slong m = W->g - 1 - left;
        fmpq_mul_2exp(W->c, W->c, (ulong)left);
        fmpq_div_2exp(W->c, W->c, (ulong)m);
        memset(W->exps, 0, SCALAR_MAX_VARS * sizeof(ulong));
        for (slong k = 0; k < W->n; k++) {
            fmpz_fac_ui(f, (ulong)W->d[k]);
            fmpq_div_fmpz(W->c, W->c, f);
            W->exps[W->vars[k]] = 2 * (ulong)W->d[k];
        }
        W->exps[SCALAR_PI] = 2 * (ulong)left;
        scalar_terms_push(&W->terms, W->c, W->exps);
        fmpz_clear(f);
        return WK_OK;
    }
    for (slong a = 0; a <= left; a++) {
        W->d[i] = a;
        int rc = theta_vwalk_visit(W, i + 1, left - a);
        if (rc != WK_OK)
            return rc;
    }
    return WK_OK;
}

/* Checks the space, the genus limit and the number of terms C(g-1+n, n) of V^Theta_{g,n}(L). */
static int theta_volume_ok(interp *I, const node *where, slong g, slong n)
{
    if (2 * g - 2 + n <= 0) {
        diag_error(&where->loc, "Mbar_{%ld,%ld} is not a stable moduli space (needs 2g-2+n > 0)", (long)g, (long)n);
        return 0;
    }
    if (n > SCALAR_MAX_VARS - 2) {
        diag_error(&where->loc, "not enough formal variables left for L_1..L_%ld", (long)n);
        return 0;
    }
    if (g == 0)
        return 1;
    fmpz_t t;
    fmpz_init(t);
    fmpz_bin_uiui(t, (ulong)(g - 1 + n), (ulong)n);
    int small = fmpz_cmp_si(t, I->lim.max_class_terms) <= 0;
    if (!small)
        diag_error(&where->loc, "V^Theta_{%ld,%ld}(L) has about %.3g terms, above the limit of %ld (raise it "
                                "with --max-terms N)", (long)g, (long)n, fmpz_get_d(t), (long)I->lim.max_class_terms);
    fmpz_clear(t);
    return small && theta_genus_ok(I, where, g);
}

/* Reports a failed coefficient: a difference between the routes (--verify) or an engine status. */
static void theta_volume_report(interp *I, const node *call, int rc)
{
    if (rc == THETA_INEXACT)
        diag_error(&call->loc, "verification failed: two routes disagree on a coefficient of this super "
                               "volume (please report this input)");
    else
        theta_lang_report(I, call, rc);
}

value *theta_builtin_supervolume(interp *I, const node *call, value **args)
{
    slong g, n;
    if (!builtin_get_slong(I, call, args, 0, 0, 1000000, &g) || !builtin_get_slong(I, call, args, 1, 0, 1000000, &n))
        return NULL;
    return theta_supervolume_value(I, call, g, n);
}

value *theta_supervolume_value(interp *I, const node *call, slong g, slong n)
{
    if (!theta_volume_ok(I, call, g, n))
        return NULL;
    int *vars = xmalloc((n + 1) * sizeof(int));
    value *r = NULL;
    if (integrate_declare_lengths(I, call, n, vars)) {
        r = value_new_num(&I->ring);
        theta_vwalk W;
        W.I = I;
        W.where = call;
        W.g = g;
        W.n = n;
        W.vars = vars;
        W.d = xcalloc(n + 1, sizeof(slong));
        W.key = xcalloc(n + 1, sizeof(slong));
        W.exps = xcalloc(SCALAR_MAX_VARS, sizeof(ulong));
        scalar_terms_init(&W.terms);
        keymap_init(&W.memo);
        fmpq_init(W.c);
        int rc = g == 0 ? WK_OK : theta_vwalk_visit(&W, 0, g - 1);   /* Theta vanishes in genus 0 */
        if (rc == WK_OK)
            scalar_terms_add_to(r->num, &W.terms, &I->ring);
        scalar_terms_clear(&W.terms);
        if (rc != WK_OK) {
            theta_volume_report(I, call, rc);
            value_release(r);
            r = NULL;
        } else if (I->verify && g > 0) {
            verify_checked(I, VERIFY_VALUE, 1);   /* every coefficient was compared, or rc says why not */
        }
        fmpq_clear(W.c);
        keymap_clear(&W.memo);
        free(W.d);
        free(W.key);
        free(W.exps);
    }
    free(vars);
    return r;
}

/* A Theta table and the last status its correlators returned (the planner only passes on
   that one failed). */
typedef struct {
    theta_table *T;
    int rc;
} theta_spec_leaf;

/* The correlator of a leaf of a Brezin-Gross-Witten plan from the Theta table at data. */
static int theta_spec_corr(void *data, fmpq_t res, slong g, const slong *d, slong n)
{
    theta_spec_leaf *L = data;
    L->rc = theta_correlator(res, L->T, g, d, n);
    return L->rc;
}

/* The plan's value on one route's table into res; reports at where and returns 0 on failure. */
static int theta_spec_route(interp *I, const node *where, tseries *res, const spec_plan *P, const tseries *t,
                            int route)
{
    theta_spec_leaf L = {theta_lang_table(I, route), WK_LIMIT};
    int rc = L.T ? spec_plan_evaluate_corr(res, P, theta_spec_corr, &L, t, I->ring.ctx) : SPEC_WK;
    if (rc == SPEC_OK)
        return 1;
    if (rc == SPEC_WK)
        theta_lang_report(I, where, L.rc);
    else
        diag_error(&where->loc, "the specialisation could not be evaluated (code %d)", rc);
    return 0;
}

int theta_spec_evaluate(interp *I, const node *where, tseries *res, const spec_plan *P, const tseries *t)
{
    if (!theta_spec_route(I, where, res, P, t, THETA_ROUTE_VIRASORO))
        return 0;
    if (!I->verify)
        return 1;
    tseries second;
    tseries_init(&second, res->var, res->order, I->ring.ctx);
    int ok = theta_spec_route(I, where, &second, P, t, THETA_ROUTE_KDV);
    if (ok && (res->order != second.order || !fmpq_mpoly_equal(res->p, second.p, I->ring.ctx))) {
        diag_error(&where->loc, "verification failed: the Virasoro and KdV routes disagree on this specialisation "
                                "(please report this input)");
        ok = 0;
    } else if (ok) {
        verify_checked(I, VERIFY_VALUE, 1);
    }
    tseries_clear(&second, I->ring.ctx);
    return ok;
}

