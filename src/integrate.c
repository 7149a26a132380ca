/* The bridge from the language to the intersection engine: int_{g,n} of a
   class expression, correlators, and the printed psi-only reduction. Sizes
   are estimated before any work starts, so absurd requests are refused. */
#include <stdlib.h>
#include <string.h>

#include "classes/cpoly.h"
#include "classes/cxsize.h"
#include "correlators/kappashift.h"
#include "correlators/pushforward.h"
#include "correlators/wk_kdv.h"
#include "cancel.h"
#include "class_expand.h"
#include "diag.h"
#include "hodge_lang.h"
#include "progress.h"
#include "format/print.h"
#include "interp.h"
#include "strbuf.h"
#include "theta_lang.h"
#include "util.h"
#include "verify_account.h"
#include "reduction_cost.h"

/* Reports an unstable or oversized space; returns 1 when (g, n) is usable. */
static int integrate_space_ok(interp *I, const node *where, slong g, slong n)
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
static double integrate_table_estimate(slong g, slong n, slong points, double terms)
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

static int integrate_table_ok(interp *I, const node *where, slong g, slong n)
{
    double est = wk_estimate_entries(g, n);
    return integrate_table_ok_est(I, where, g, n, est) && reduction_seconds_ok(I, where, est, 0);
}

/* Returned by the integration callbacks when a stop was requested. */
#define INTEGRATE_CANCELLED (-1)

static void integrate_report_engine(const node *where, int rc)
{
    if (rc == INTEGRATE_CANCELLED || rc == WK_CANCELLED || cancel_flag)
        eval_cancelled(where);
    else if (rc == WK_LIMIT)
        diag_error(&where->loc, "the correlator table reached its size limit (raise it with --max-table N)");
    else if (rc == WK_TOO_DEEP)
        diag_error(&where->loc, "evaluation nested too deeply for the stack to compute this here "
                                "(call it from less deeply nested code)");
    else
        diag_error(&where->loc, "the intersection engine rejected this request (code %d)", rc);
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
static int integrate_compute_kdv(interp *I, fmpq_t res, slong g, const slong *d, slong n, const char **why)
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

/* A degree mismatch is 0 however large the space; one-point and genus-0 correlators have
   closed forms; the rest come from the DVV table, within the size estimates. */
value *integrate_correlator(interp *I, const node *where, slong g, const slong *d, slong n)
{
    fmpq_t r;
    fmpq_init(r);
    int closed = wk_closed_form_kind(g, d, n), ok = 0;
    if (closed == WK_CLOSED_ZERO) {
        ok = 1;
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

/* Expands integrand on Mbar_{g,n}, reporting errors at the responsible node. */
static int integrate_expand(cpoly *P, const node *where, const value *integrand)
{
    if (integrand->kind != V_NUM && integrand->kind != V_CLASS) {
        diag_error(&where->loc, "int_{g,n} integrates a class expression or a number, not a %s",
                   value_kind_name(integrand));
        return 0;
    }
    cx *c = value_to_class(integrand);
    int ok = class_expand_reported(P, where, c);
    cx_release(c);
    return ok;
}

typedef struct {
    interp *I;
    slong g;
    double terms;
    slong points;
    int table;     /* some monomial needs the correlator table (no closed form) */
} integrate_estimate;

/* What the monomial callback needs besides the interpreter: progress counting. */
typedef struct {
    interp *I;
    progress bar;
    double done;
} integrate_run;

/* Adds one monomial's reduction terms and points to the estimate; monomials with a closed form
   need neither, so they are not counted. */
static int integrate_estimate_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                                   const fmpq_mpoly_t coeff)
{
    (void)coeff;
    integrate_estimate *e = data;
    if (kmax == 0 ? wk_closed_form_kind(e->g, psi, n) != WK_CLOSED_NONE : pf_all_closed(e->g, psi, n, kmult, kmax))
        return 0;   /* answered by closed forms, without the table */
    e->table = 1;
    e->terms += pf_estimate_terms(kmult, kmax);
    slong pts = n;
    for (slong j = 1; j <= kmax; j++)
        pts += kmult[j];
    if (pts > e->points)
        e->points = pts;
    return 0;
}

/* Whether the reduction of P is within --max-terms, --max-table and --max-seconds: NULL if so,
   else the reason (a VERIFY_WHY_* text), with the message for an error written to msg. */
static const char *integrate_cost_refusal(interp *I, const cpoly *P, char *msg, size_t len)
{
    integrate_estimate e = {I, P->g, 0.0, P->n, 0};
    cpoly_foreach_top(P, integrate_estimate_term, &e);
    double entries = integrate_table_estimate(P->g, P->n, e.points, e.terms);
    double secs = pf_estimate_seconds(P->g, e.terms);
    if (!e.table)
        return NULL;
    if (e.terms > I->lim.max_terms) {
        snprintf(msg, len, "this integral reduces to about %.3g correlator terms, above the limit of %.3g "
                 "(raise it with --max-terms N)", e.terms, I->lim.max_terms);
        return VERIFY_WHY_REDUCTION_TERMS;
    }
    if (entries > I->lim.max_table) {
        snprintf(msg, len, "correlators of genus %ld with %ld point%s need about %.3g table entries, above the "
                 "limit of %.3g (raise it with --max-table N)", (long)P->g, (long)e.points,
                 e.points == 1 ? "" : "s", entries, I->lim.max_table);
        return VERIFY_WHY_REDUCTION_TABLE;
    }
    if (secs > I->lim.max_seconds) {
        snprintf(msg, len, "the reduction of this integral (%.3g correlator terms in genus %ld) needs about "
                 "%.3g s, above the limit of %.3g s (raise it with --max-seconds S)", e.terms, (long)P->g,
                 secs, I->lim.max_seconds);
        return VERIFY_WHY_REDUCTION_TIME;
    }
    return NULL;
}

/* Refuses, before any work, an integral whose reduction is too large or too long. */
static int integrate_cost_ok(interp *I, const node *where, const cpoly *P)
{
    char msg[320];
    if (!integrate_cost_refusal(I, P, msg, sizeof msg))
        return 1;
    diag_error(&where->loc, "%s", msg);
    return 0;
}

/* Memoised integral of one monomial; psi is sorted so that symmetric
   monomials share an entry. */
static int integrate_monomial(fmpq_t res, void *data, slong g, const slong *psi, slong n, const slong *kmult,
                              slong kmax)
{
    integrate_run *run = data;
    interp *I = run->I;
    progress_update(&run->bar, ++run->done);
    if (cancel_flag)
        return INTEGRATE_CANCELLED;
    slong len = 2 + n + kmax;
    slong *key = xmalloc((len + 1) * sizeof(slong));
    key[0] = g;
    key[1] = n;
    memcpy(key + 2, psi, n * sizeof(slong));
    for (slong i = 2; i < 2 + n; i++)   /* insertion sort: n is small */
        for (slong j = i; j > 2 && key[j - 1] < key[j]; j--) {
            slong t = key[j];
            key[j] = key[j - 1];
            key[j - 1] = t;
        }
    memcpy(key + 2 + n, kmult + 1, kmax * sizeof(slong));
    const fmpq *hit = keymap_get(&I->integrals, key, len);
    int rc = WK_OK;
    if (hit) {
        fmpq_set(res, hit);
    } else {
        rc = pf_integral(res, I->wk, g, key + 2, n, kmult, kmax);
        if (rc == WK_OK)
            keymap_set(&I->integrals, key, len, res);
    }
    free(key);
    return rc;
}

/* The first route for one monomial: a closed form for psi-only monomials that have one (they were
   left out of the estimate), else the memoised reduction of integrate_monomial. */
static int integrate_compute_first(fmpq_t res, void *data, slong g, const slong *psi, slong n,
                                   const slong *kmult, slong kmax)
{
    integrate_run *run = data;
    if (kmax == 0 && wk_closed_form(res, g, psi, n) != WK_CLOSED_NONE) {
        progress_update(&run->bar, ++run->done);
        return cancel_flag ? INTEGRATE_CANCELLED : WK_OK;
    }
    return integrate_monomial(res, data, g, psi, n, kmult, kmax);
}

/* Data of the second route of --verify: the progress of the first route's callback (its fallback)
   and how many monomials went by a second route or could not (their reasons go to the account). */
typedef struct {
    integrate_run run;
    double checked, unchecked;
} integrate_second;

/* Whether the time shift for this kappa monomial is within --max-terms, --max-table and
   --max-seconds, estimated as for the first route: NULL if so, else the reason.  Its correlators
   have at most n plus the kappa degree points, and are the pushforward's (with other
   coefficients), so none needs the table when all of those have closed forms. */
static const char *integrate_shift_refusal(interp *I, slong g, const slong *psi, slong n, const slong *kmult,
                                           slong kmax)
{
    double work = ks_estimate_work(kmult, kmax);
    slong K = ks_kappa_degree(kmult, kmax);
    if (K < 0 || work > I->lim.max_terms)
        return VERIFY_WHY_SHIFT_TERMS;
    if (pf_all_closed(g, psi, n, kmult, kmax))
        return NULL;
    if (integrate_table_estimate(g, n, n + K, work) > I->lim.max_table)
        return VERIFY_WHY_SHIFT_TABLE;
    return pf_estimate_seconds(g, work) > I->lim.max_seconds ? VERIFY_WHY_SHIFT_TIME : NULL;
}

/* One monomial by its second route: the time shift when it holds kappa classes, the KdV recursion
   when it is psi only; out of reach (estimate or table limit), the first route's value. */
static int integrate_compute_second(fmpq_t res, void *data, slong g, const slong *psi, slong n,
                                     const slong *kmult, slong kmax)
{
    integrate_second *s = data;
    interp *I = s->run.I;
    if (cancel_flag)
        return INTEGRATE_CANCELLED;
    int rc = WK_LIMIT;
    const char *why = kmax > 0 ? integrate_shift_refusal(I, g, psi, n, kmult, kmax) : NULL;
    if (kmax > 0 && !why) {
        rc = ks_integral(res, I->wk, g, psi, n, kmult, kmax, &cancel_flag);
        why = VERIFY_WHY_SHIFT_LIMIT;
    } else if (kmax == 0) {
        rc = integrate_compute_kdv(I, res, g, psi, n, &why);
    }
    if (rc == WK_OK) {
        s->checked++;
        verify_checked(I, VERIFY_MONOMIAL, 1);
        progress_update(&s->run.bar, ++s->run.done);
        return WK_OK;
    }
    if (rc == WK_CANCELLED || cancel_flag)
        return INTEGRATE_CANCELLED;
    s->unchecked++;
    verify_unchecked(I, NULL, VERIFY_MONOMIAL, 1, why);
    return integrate_compute_first(res, &s->run, g, psi, n, kmult, kmax);
}

/* With --verify, the integral r of the expanded class P is recomputed monomial by monomial by the
   second routes and compared.  Takes ownership of r; returns it, or NULL after reporting. */
static value *integrate_verify_reduction(interp *I, const node *where, const cpoly *P, value *r)
{
    integrate_second s;
    s.run.I = I;
    s.run.done = 0;
    s.checked = 0;
    s.unchecked = 0;
    char what[64];
    snprintf(what, sizeof what, "int_{%ld,%ld}: second route", (long)P->g, (long)P->n);
    progress_start(&s.run.bar, what, (double)P->len);
    fmpq_mpoly_t second;
    fmpq_mpoly_init(second, I->ring.ctx);
    int rc = cpoly_integrate(second, P, integrate_compute_second, &s);
    progress_end(&s.run.bar);
    if (rc != WK_OK) {
        integrate_report_engine(where, rc);
        value_release(r);
        r = NULL;
    } else if (s.checked > 0 && !fmpq_mpoly_equal(second, r->num, I->ring.ctx)) {
        diag_error(&where->loc, "verification failed: the pushforward reduction and the second route (time "
                                "shift for kappa classes, KdV recursion for psi classes) disagree (please "
                                "report this input)");
        value_release(r);
        r = NULL;
    } else if (s.unchecked > 0) {
        r = verify_unchecked_value(I, where, r, VERIFY_WHY_MONOMIALS);
    } else {
        verify_checked(I, VERIFY_VALUE, 1);
    }
    fmpq_mpoly_clear(second, I->ring.ctx);
    return r;
}

/* The reference route: expand the class, reduce each monomial to correlators.  As the second route
   of --verify (refused not NULL), a reduction beyond the limits is no error: *refused says why. */
static value *integrate_by_reduction(interp *I, const node *where, slong g, slong n, const value *integrand,
                                     const char **refused)
{
    cpoly P;
    cpoly_init(&P, g, n, I->lim.max_class_terms, I->ring.ctx);
    value *r = NULL;
    char msg[320];
    int expanded = integrate_expand(&P, where, integrand);
    if (expanded && refused)
        *refused = integrate_cost_refusal(I, &P, msg, sizeof msg);
    if (expanded && (refused ? !*refused : integrate_cost_ok(I, where, &P))) {
        r = value_new_num(&I->ring);
        integrate_run run;
        run.I = I;
        run.done = 0;
        char what[64];
        snprintf(what, sizeof what, "int_{%ld,%ld}: monomials", (long)g, (long)n);
        progress_start(&run.bar, what, (double)P.len);
        int rc = cpoly_integrate(r->num, &P, integrate_compute_first, &run);
        progress_end(&run.bar);
        if (rc == WK_LIMIT && refused && !cancel_flag) {
            *refused = VERIFY_WHY_REDUCTION_LIMIT;   /* the estimate was too low: no error, unchecked */
        } else if (rc != WK_OK) {
            integrate_report_engine(where, rc);
        } else if (I->verify && !refused) {
            r = integrate_verify_reduction(I, where, &P, r);
        }
        if (rc != WK_OK) {
            value_release(r);
            r = NULL;
        }
    }
    cpoly_clear(&P);
    return r;
}

value *integrate_compare_routes(interp *I, const node *where, value *slow, value *fast)
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

/* With --verify, a result of the volume engine is recomputed by the reduction (when that is within
   the same limits as when it is the first route) and any difference is reported. */
static value *integrate_verify(interp *I, const node *where, slong g, slong n, const value *integrand, value *fast)
{
    const char *refused = NULL;
    verify_second_begin(I);
    value *slow = integrate_by_reduction(I, where, g, n, integrand, &refused);
    verify_second_end(I);
    if (refused || !slow)
        return verify_unchecked_value(I, where, fast, refused ? refused : VERIFY_WHY_REDUCTION_FAILED);
    return integrate_compare_routes(I, where, slow, fast);
}

/* The volume engine when it recognises the integrand (checked by the reduction with --verify),
   else the reduction (checked monomial by monomial by the second routes with --verify). */
static value *integrate_compute(interp *I, const node *where, slong g, slong n, const value *integrand)
{
    int handled;
    if (hodge_lang_applies(integrand))
        return hodge_lang_integrate(I, where, g, n, integrand);
    value *fast = fastvol_try(I, where, g, n, integrand, &handled);
    if (handled)
        return fast && I->verify ? integrate_verify(I, where, g, n, integrand, fast) : fast;
    return integrate_by_reduction(I, where, g, n, integrand, NULL);
}

/* Nodes of an integrand unfolded into a tree beyond which it is refused: a
   class built by repeated squaring (c = c*c) is a small graph standing for a
   tree of 2^k nodes, which no walker could visit. */
#define INTEGRATE_MAX_TREE 1e8

/* Refuses, before any walk over it, an integrand whose tree is too large. */
static int integrate_tree_ok(const node *where, const value *integrand)
{
    if (integrand->kind != V_CLASS || cx_tree_size(integrand->cls, INTEGRATE_MAX_TREE) < INTEGRATE_MAX_TREE)
        return 1;
    diag_error(&where->loc, "this class expression shares its parts so often that written out it has more than "
                            "%.0e nodes (it was built by repeated squaring or the like); expand it in smaller steps",
               INTEGRATE_MAX_TREE);
    return 0;
}

value *integrate_value(interp *I, const node *where, slong g, slong n, const value *integrand)
{
    if (!integrate_tree_ok(where, integrand))
        return NULL;
    if (theta_in_value(integrand))
        return theta_integrate_stored(I, where, g, n, integrand);
    if (integrand_is_zero(I, where, g, n, integrand)) {
        if (I->verify)
            verify_no_check_needed(I);
        return value_new_num(&I->ring);
    }
    if (!integrate_space_ok(I, where, g, n))
        return NULL;
    if (I->verify || integrand->kind != V_CLASS)
        return integrate_compute(I, where, g, n, integrand);
    results_question q;
    if (!results_question_integral(I, g, n, integrand->cls, &q))
        return integrate_compute(I, where, g, n, integrand);
    value *r = value_new_num(&I->ring);
    if (!results_lookup(I, &q, r->num)) {
        value_release(r);
        double t0 = results_clock();
        r = integrate_compute(I, where, g, n, integrand);
        if (r)
            results_save(I, &q, r->num, results_clock() - t0);
    }
    results_question_clear(&q);
    return r;
}

/* The psi-only reduction as a list of (correlator, coefficient). */
typedef struct {
    interp *I;
    slong g;
    slong len, cap;
    slong **keys;                 /* keys[i][0] = n, then the sorted multi-index */
    fmpq_mpoly_struct *coeffs;
    int rc;
} reduction;

static void reduction_add(reduction *R, const slong *d, slong n, const fmpz_t c, const fmpq_mpoly_t coeff)
{
    slong i;
    for (i = 0; i < R->len; i++)
        if (R->keys[i][0] == n && memcmp(R->keys[i] + 1, d, n * sizeof(slong)) == 0)
            break;
    if (i == R->len) {
        if (R->len == R->cap) {
            R->cap = R->cap ? 2 * R->cap : 16;
            R->keys = xrealloc(R->keys, R->cap * sizeof(slong *));
            R->coeffs = xrealloc(R->coeffs, R->cap * sizeof(fmpq_mpoly_struct));
        }
        R->keys[i] = xmalloc((n + 1) * sizeof(slong));
        R->keys[i][0] = n;
        memcpy(R->keys[i] + 1, d, n * sizeof(slong));
        fmpq_mpoly_init(R->coeffs + i, R->I->ring.ctx);
        R->len++;
    }
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, R->I->ring.ctx);
    fmpq_mpoly_scalar_mul_fmpz(t, coeff, c, R->I->ring.ctx);
    fmpq_mpoly_add(R->coeffs + i, R->coeffs + i, t, R->I->ring.ctx);
    fmpq_mpoly_clear(t, R->I->ring.ctx);
}

static int reduction_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                          const fmpq_mpoly_t coeff)
{
    reduction *R = data;
    pf_expansion E;
    pf_expansion_init(&E);
    int rc = pf_expand(&E, R->g, psi, n, kmult, kmax, 0);
    for (slong i = 0; rc == WK_OK && i < E.len; i++)
        reduction_add(R, E.terms[i].d, E.terms[i].n, E.terms[i].coeff, coeff);
    pf_expansion_clear(&E);
    return rc;
}

static void reduction_print(FILE *out, const reduction *R, const node *where)
{
    strbuf b;
    strbuf_init(&b);
    const char *line;
    size_t len = source_line(where->loc.src, where->loc.first_line, &line);
    if (where->loc.last_line == where->loc.first_line && (size_t)where->loc.last_column <= len + 1)
        strbuf_printf(&b, "%.*s\n", where->loc.last_column - where->loc.first_column,
                      line + where->loc.first_column - 1);
    strbuf_puts(&b, "  = ");
    int first = 1;
    for (slong i = 0; i < R->len; i++) {
        if (fmpq_mpoly_is_zero(R->coeffs + i, R->I->ring.ctx))
            continue;
        print_signed_coeff(&b, R->coeffs + i, first, &R->I->ring);
        print_correlator(&b, R->g, R->keys[i] + 1, R->keys[i][0]);
        first = 0;
    }
    if (first)
        strbuf_putc(&b, '0');
    fprintf(out, "%s\n", b.data);
    strbuf_clear(&b);
}

static void reduction_clear(reduction *R)
{
    for (slong i = 0; i < R->len; i++) {
        free(R->keys[i]);
        fmpq_mpoly_clear(R->coeffs + i, R->I->ring.ctx);
    }
    free(R->keys);
    free(R->coeffs);
}

int integrate_explain(interp *I, const node *where, slong g, slong n, const value *integrand)
{
    if (!integrate_tree_ok(where, integrand))
        return 0;
    if (theta_in_value(integrand))
        return theta_explain(I, where, g, n, integrand);
    if (!integrate_space_ok(I, where, g, n))
        return 0;
    if (hodge_lang_applies(integrand))
        return hodge_lang_explain(I, where, g, n, integrand);
    cpoly P;
    cpoly_init(&P, g, n, I->lim.max_class_terms, I->ring.ctx);
    int ok = integrate_expand(&P, where, integrand) && integrate_cost_ok(I, where, &P);
    if (ok) {
        reduction R = {I, g, 0, 0, NULL, NULL, WK_OK};
        int rc = cpoly_foreach_top(&P, reduction_term, &R);
        if (rc == WK_OK)
            reduction_print(I->out, &R, where);
        else
            integrate_report_engine(where, rc);
        ok = rc == WK_OK;
        reduction_clear(&R);
    }
    cpoly_clear(&P);
    return ok;
}

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
        integrate_run run;
        run.I = I;
        run.done = 0;
        progress_start(&run.bar, "V_{g,n}: coefficients", 0);
        run.bar.enabled = 0;   /* one monomial at a time: the caller's loop is what takes long */
        rc = integrate_monomial(c, &run, g, key, n, kmult, D - m > 0 ? 1 : 0);
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
    fmpq_mpoly_struct *res;
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
        fmpq_mpoly_set_coeff_fmpq_ui(W->res, W->c, W->exps, W->I->ring.ctx);
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

value *integrate_volume(interp *I, const node *where, slong g, slong n)
{
    if (!integrate_space_ok(I, where, g, n))
        return NULL;
    slong D = 3 * g - 3 + n;
    fmpz_t terms;
    fmpz_init(terms);
    fmpz_bin_uiui(terms, (ulong)(D + n), (ulong)n);
    int small = fmpz_cmp_si(terms, I->lim.max_class_terms) <= 0;
    if (!small)
        diag_error(&where->loc, "V_{%ld,%ld}(L) has about %.3g terms, above the limit of %ld (raise it with --max-terms N)",
                   (long)g, (long)n, fmpz_get_d(terms), (long)I->lim.max_class_terms);
    fmpz_clear(terms);
    int handled = 0;
    value *fast = small && n < SCALAR_MAX_VARS ? fastvol_try_polynomial(I, where, g, n, &handled) : NULL;
    if (handled || !small || n > SCALAR_MAX_VARS - 1 || !integrate_table_ok(I, where, g, n + D))
        return fast;
    int *vars = xmalloc((n + 1) * sizeof(int));
    value *r = NULL;
    if (integrate_declare_lengths(I, where, n, vars)) {
        r = value_new_num(&I->ring);
        volume_walk W;
        W.I = I;
        W.g = g;
        W.n = n;
        W.D = D;
        W.vars = vars;
        W.alpha = xcalloc(n + 1, sizeof(slong));
        W.exps = xcalloc(SCALAR_MAX_VARS, sizeof(ulong));
        W.res = r->num;
        keymap_init(&W.memo);
        fmpq_init(W.c);
        int rc = volume_visit(&W, 0, D);
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
            if (I->verify)
                r = verify_unchecked_value(I, where, r, VERIFY_WHY_NO_ROUTE_VOLUME);
        }
    }
    free(vars);
    return r;
}
