/* Correlators <tau_d>_g with the limits and messages of integrals, and the checks that every
   route of int_{g,n} shares: the space, the correlator table's size, engine failures in words. */
#include <stdlib.h>
#include <string.h>

#include "correlators/wk.h"
#include "correlators/wk_kdv.h"
#include "cancel.h"
#include "diag.h"
#include "eval.h"
#include "integrate.h"
#include "integrand_check.h"
#include "util.h"
#include "verify_account.h"
#include "failure.h"

/* Reports an unstable or oversized space; returns 1 when (g, n) is usable. */
int integrate_space_ok(interp *I, const node *where, slong g, slong n)
{
    if (2 * g - 2 + n <= 0) {
        diag_error(&where->loc, "Mbar_{%ld,%ld} is not a stable moduli space (needs 2g-2+n > 0)", (long)g,
                   (long)n);
        return 0;
    }
    if (3 * g - 3 + n > I->lim.max_dim) {
        diag_error(&where->loc, "Mbar_{%ld,%ld} has dimension %ld, beyond the limit of %ld", (long)g, (long)n,
                   (long)(3 * g - 3 + n), (long)I->lim.max_dim);
        return 0;
    }
    return 1;
}

/* Memo entries an integral needs: the engine's proven bound for correlators
   with this many points, or, when kappa classes merge into fewer points, about
   twenty entries per correlator term of the reduction (measured: 4 to 5 for
   kappa_1^{3g-3}, g <= 12), whichever is smaller. The table's own limit stops
   the computation should the estimate be too low. */
double integrate_table_estimate(slong g, slong n, slong points, double terms)
{
    double bound = wk_estimate_entries(g, points);
    double by_terms = 20.0 * terms + wk_estimate_entries(g, n);
    return bound < by_terms ? bound : by_terms;
}

static int integrate_table_ok_est(interp *I, const node *where, slong g, slong n, double est)
{
    if (est <= I->lim.max_table)
        return 1;
    diag_error(&where->loc,
               "correlators of genus %ld with %ld point%s need about %.3g table entries, above the limit "
               "of %.3g (raise it with --max-table N)",
               (long)g, (long)n, n == 1 ? "" : "s", est, I->lim.max_table);
    return 0;
}

int integrate_table_ok(interp *I, const node *where, slong g, slong n)
{
    double est = wk_estimate_entries(g, n);
    if (!integrate_table_ok_est(I, where, g, n, est))
        return 0;
    double sec = wk_estimate_seconds(est);
    if (sec <= I->lim.max_seconds)
        return 1;
    diag_error(&where->loc, "this computation needs about %.3g s (%.3g correlator table entries), above the limit "
                            "of %g s (raise it with --max-seconds S)", sec, est, I->lim.max_seconds);
    return 0;
}

static const failure_words integrate_words[] = {
    {WK_LIMIT, "the correlator table reached its size limit (raise it with --max-table N)"},
    {WK_TOO_DEEP, "evaluation nested too deeply for the stack to compute this here (call it from less deeply "
                  "nested code)"},
    {0, NULL},
};

void integrate_report_engine(const node *where, int rc)
{
    failure_report(where, "the intersection engine", rc == INTEGRATE_CANCELLED ? WK_CANCELLED : rc, WK_CANCELLED,
                   integrate_words);
}

/* The memo of the second correlator route, created on first use with the table limit.
   Returns NULL when memory is exhausted; the interpreter owns the table. */
static wk_kdv_table *integrate_get_kdv_table(interp *I)
{
    if (I->wk_kdv == NULL) {
        I->wk_kdv = wk_kdv_table_new();
        if (I->wk_kdv == NULL)
            return NULL;
        wk_kdv_table_set_cancel(I->wk_kdv, &cancel_flag);
        wk_kdv_table_set_limit(I->wk_kdv, I->lim.max_table > 1e15 ? (slong)1e15 : (slong)I->lim.max_table);
    }
    return I->wk_kdv;
}

/* res = <tau_d>_g by the KdV recursion when its estimate is within --max-table.
   Returns WK_OK, WK_LIMIT when out of reach (nothing to compare; *why says why), or WK_CANCELLED. */
int integrate_compute_kdv(interp *I, fmpq_t res, slong g, const slong *d, slong n, const char **why)
{
    int deep = 2 * g - 2 + n > WK_KDV_MAX_EULER, big = !deep && wk_kdv_estimate_entries(g, n) > I->lim.max_table;
    *why = deep ? VERIFY_WHY_KDV_DEPTH : big ? VERIFY_WHY_KDV_TABLE : VERIFY_WHY_KDV_LIMIT;
    if (deep || big)
        return WK_LIMIT;
    wk_kdv_table *K = integrate_get_kdv_table(I);
    int rc = K ? wk_kdv_correlator(res, K, g, d, n) : WK_LIMIT;
    return rc == WK_CANCELLED || cancel_flag ? WK_CANCELLED : rc == WK_OK ? WK_OK : WK_LIMIT;
}

/* With --verify, a correlator value by the first route is recomputed by the KdV recursion and
   compared; out of reach, nothing is compared.  Returns 0 after reporting an error, else 1. */
static int integrate_verify_correlator(interp *I, const node *where, slong g, const slong *d, slong n,
                                       const fmpq_t first, const char *route)
{
    fmpq_t r;
    fmpq_init(r);
    const char *why;
    int rc = integrate_compute_kdv(I, r, g, d, n, &why), ok = 1;
    if (rc == WK_OK && fmpq_equal(first, r)) {
        verify_checked(I, VERIFY_VALUE, 1);
    } else if (rc == WK_LIMIT) {
        ok = verify_unchecked(I, where, VERIFY_VALUE, 1, why);
    } else if (rc == WK_OK) {
        diag_error(&where->loc, "verification failed: %s and the KdV recursion disagree on this correlator "
                                "(please report this input)", route);
        ok = 0;
    } else if (rc == WK_CANCELLED) {
        integrate_report_engine(where, rc);
        ok = 0;
    }
    fmpq_clear(r);
    return ok;
}

/* d_1 + ... + d_n, saturated so that huge exponents cannot overflow. */
slong integrate_exponent_sum(const slong *d, slong n)
{
    slong sum = 0;
    for (slong i = 0; i < n; i++)
        sum = d[i] >= WORD_MAX / 2 - sum ? WORD_MAX / 2 : sum + d[i];
    return sum;
}

/* A degree mismatch is 0 however large the space; one-point and genus-0 correlators have
   closed forms; the rest come from the DVV table, within the size estimates. */
value *integrate_correlator(interp *I, const node *where, slong g, const slong *d, slong n)
{
    fmpq_t r;
    fmpq_init(r);
    int closed = wk_closed_form_kind(g, d, n), ok = 0;
    if (closed == WK_CLOSED_ZERO) {
        ok = 1;
        integrand_warn_correlator(I, where, g, n, integrate_exponent_sum(d, n), 3 * g - 3 + n, "correlator");
        if (I->verify)
            verify_no_check_needed(I);
    } else if (integrate_space_ok(I, where, g, n)) {
        if (closed == WK_CLOSED_VALUE) {
            wk_closed_form(r, g, d, n);
            ok = 1;
        } else if (integrate_table_ok(I, where, g, n)) {
            int rc = wk_table_correlator(r, I->wk, g, d, n);
            ok = rc == WK_OK;
            if (!ok)
                integrate_report_engine(where, rc);
        }
        if (ok && I->verify)
            ok = integrate_verify_correlator(I, where, g, d, n, r,
                                             closed == WK_CLOSED_VALUE ? "the closed formula" : "the DVV recursion");
    }
    value *v = ok ? value_new_fmpq(&I->ring, r) : NULL;
    fmpq_clear(r);
    return v;
}
