/* explain int_{g,n} ...: the integral written as the correlators (or, for Hodge and Theta
   integrands, the numbers of their engines) it reduces to, before its value. */
#include <stdlib.h>
#include <string.h>

#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "diag.h"
#include "hodge_lang.h"
#include "integrate.h"
#include "print.h"
#include "route.h"
#include "route_reduction.h"
#include "strata_class.h"
#include "strbuf.h"
#include "theta_lang.h"
#include "util.h"

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

/* The route's refusal, reported; 1 when it would run. */
static int explain_cost_ok(integral *q, const route *r)
{
    route_cost c = {0.0, NULL, ""};
    r->estimate(q, &c);
    if (c.refusal && q->expanded != -1)
        diag_error(&q->where->loc, "%s", c.msg);
    return !c.refusal;
}

/* The psi-kappa integral q as the correlators its reduction reaches. */
static int explain_reduction(integral *q)
{
    interp *I = q->I;
    reduction R = {I, q->g, 0, 0, NULL, NULL, WK_OK};
    int rc = cpoly_foreach_top(integral_expansion(q), reduction_term, &R);
    if (rc == WK_OK)
        reduction_print(I->out, &R, q->where);
    else
        integrate_report_engine(q->where, rc);
    reduction_clear(&R);
    return rc == WK_OK;
}

int integrate_explain(interp *I, const node *where, slong g, slong n, const value *integrand)
{
    if (!integrate_tree_ok(where, integrand))
        return 0;
    if (theta_in_value(integrand) && !strata_class_in_value(integrand))
        return theta_explain(I, where, g, n, integrand);
    if (!integrate_space_ok(I, where, g, n))
        return 0;
    integral q;
    integral_init(&q, I, where, g, n, integrand);
    int ok;
    if (q.family == INTEGRAND_STRATA)
        ok = explain_cost_ok(&q, &route_strata) && strata_route_explain(&q);
    else if (q.family == INTEGRAND_HODGE)
        ok = explain_cost_ok(&q, &route_hodge_operator) && hodge_lang_explain(I, where, integral_expansion(&q));
    else
        ok = explain_cost_ok(&q, &route_reduction) && explain_reduction(&q);
    integral_clear(&q);
    return ok;
}
