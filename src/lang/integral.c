/* The description of one integral that the router makes once and every route reads: the class
   family, the volume form, and the expansion into monomials made on first request. */
#include "class_expand.h"
#include "diag.h"
#include "hodge_lang.h"
#include "route.h"
#include "strata_class.h"
#include "theta_lang.h"

void integral_init(integral *q, interp *I, const node *where, slong g, slong n, const value *integrand)
{
    q->I = I;
    q->where = where;
    q->g = g;
    q->n = n;
    q->integrand = integrand;
    q->family = strata_class_in_value(integrand) ? INTEGRAND_STRATA
                : theta_in_value(integrand)      ? INTEGRAND_THETA
                : hodge_lang_applies(integrand) ? INTEGRAND_HODGE
                                                : INTEGRAND_PSI_KAPPA;
    q->expanded = 0;
    q->theta_why = 0;
    volume_form_match(q);
}

void integral_clear(integral *q)
{
    if (q->expanded == 1)
        cpoly_clear(&q->P);
    volume_form_clear(q);
}

const cpoly *integral_expansion(integral *q)
{
    if (q->expanded)
        return q->expanded == 1 ? &q->P : NULL;
    const value *v = q->integrand;
    if (v->kind != V_NUM && v->kind != V_CLASS) {
        diag_error(&q->where->loc, "int_{g,n} integrates a class expression or a number, not a %s",
                   value_kind_name(v));
        q->expanded = -1;
        return NULL;
    }
    interp *I = q->I;
    if (q->family == INTEGRAND_HODGE)
        cpoly_init_hodge(&q->P, q->g, q->n, I->lim.max_class_terms, I->ring.ctx);
    else
        cpoly_init(&q->P, q->g, q->n, I->lim.max_class_terms, I->ring.ctx);
    cx *c = value_to_class(v);
    int ok = class_expand_reported(&q->P, q->where, c);
    cx_release(c);
    if (!ok)
        cpoly_clear(&q->P);
    q->expanded = ok ? 1 : -1;
    return ok ? &q->P : NULL;
}
