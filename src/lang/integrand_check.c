/* Integrands that integrate to 0 for a reason the user may not intend: no
   term of the dimension of the space, or a formal variable added to a class
   (a number of degree 0, not a class). The answer stays 0; a warning says
   why, once per integral of the script. */
#include <stdlib.h>
#include <string.h>

#include "classes/cxdegree.h"
#include "diag.h"
#include "interp.h"
#include "strbuf.h"
#include "util.h"
#include "value_str.h"
#include "integrand_check.h"

/* Work allowed for finding the degrees of one integrand (steps). */
#define CHECK_DEGREE_BUDGET 2e7
/* Degree sets are only built up to this size; beyond it the bound alone is used. */
#define CHECK_MAX_CAP 1000000
/* Degrees listed in a warning before the list is shortened. */
#define CHECK_MAX_LISTED 6

int integrand_first_warning(interp *I, const node *where)
{
    for (int i = 0; i < I->nwarned; i++)
        if (I->warned[i] == where)
            return 0;
    I->warned = xrealloc(I->warned, (I->nwarned + 1) * sizeof(const node *));
    I->warned[I->nwarned++] = where;
    return 1;
}

/* Appends "degree 2" or "degrees 0, 1 and above 3" for the set has[0..cap]
   (has[cap]: degrees of cap and more, named "above D" when cap = D + 1). */
static void check_list_degrees(strbuf *b, const unsigned char *has, slong cap, slong D)
{
    slong items[CHECK_MAX_LISTED + 2], count = 0, total = 0;
    for (slong d = 0; d <= cap; d++)
        if (has[d]) {
            if (count < CHECK_MAX_LISTED + 1)
                items[count++] = d;
            else
                items[CHECK_MAX_LISTED] = d;
            total++;
        }
    strbuf_puts(b, total == 1 ? "degree " : "degrees ");
    for (slong i = 0; i < count; i++) {
        const char *sep = i == 0 ? "" : i == count - 1 ? " and " : ", ";
        if (i == CHECK_MAX_LISTED && total > count)
            sep = ", ... and ";
        if (items[i] == cap && cap == D + 1)
            strbuf_printf(b, "%sabove %ld", sep, (long)D);
        else
            strbuf_printf(b, "%s%ld", sep, (long)items[i]);
    }
}

static void check_warn_degrees(interp *I, const node *where, slong g, slong n, const unsigned char *has,
                               slong cap, slong maxdeg)
{
    if (!integrand_first_warning(I, where))
        return;
    strbuf b;
    strbuf_init(&b);
    slong D = 3 * g - 3 + n;
    if (has)
        check_list_degrees(&b, has, cap, D);
    else
        strbuf_printf(&b, "degree at most %ld", (long)maxdeg);
    diag_warning(&where->loc, "no term of this integrand has degree %ld, the dimension of Mbar_{%ld,%ld} (its "
                              "terms have %s): the integral is 0", (long)D, (long)g, (long)n, b.data);
    strbuf_clear(&b);
}

void integrand_warn_correlator(interp *I, const node *where, slong g, slong n, slong sum, slong want,
                               const char *what)
{
    if (!integrand_first_warning(I, where))
        return;
    diag_warning(&where->loc, "the exponents of this %s add up to %ld, but on Mbar_{%ld,%ld} they must add up "
                              "to %ld: the correlator is 0", what, (long)sum, (long)g, (long)n, (long)want);
}

/* A number integrated over a space of positive dimension: 0, said once. */
static void check_warn_number(interp *I, const node *where, slong g, slong n, const value *v)
{
    if (fmpq_mpoly_is_zero(v->num, I->ring.ctx) || !integrand_first_warning(I, where))
        return;
    slong D = 3 * g - 3 + n;
    if (scalar_is_pi_only(v->num, &I->ring)) {
        diag_warning(&where->loc, "the integrand is a number (degree 0) but Mbar_{%ld,%ld} has dimension %ld: "
                                  "the integral is 0", (long)g, (long)n, (long)D);
        return;
    }
    char *t = value_get_str(v, &I->ring);
    diag_warning(&where->loc, "%s holds a formal variable: a number of degree 0, not a class, so its integral "
                              "over Mbar_{%ld,%ld} (dimension %ld) is 0", strlen(t) <= 30 ? t : "this integrand",
                 (long)g, (long)n, (long)D);
    free(t);
}

/* A summand of the top-level sum of e that is a scalar holding a formal variable. */
static const cx *check_variable_summand(interp *I, const cx *e, int depth)
{
    if (depth > 200)
        return NULL;
    if (e->kind == CX_SCALAR)
        return scalar_is_pi_only(e->scalar, &I->ring) ? NULL : e;
    if (e->kind != CX_ADD)
        return NULL;
    const cx *r = check_variable_summand(I, e->a, depth + 1);
    return r ? r : check_variable_summand(I, e->b, depth + 1);
}

static void check_warn_variable(interp *I, const node *where, slong g, slong n, const cx *term)
{
    if (!integrand_first_warning(I, where))
        return;
    char *t = scalar_get_str(term->scalar, &I->ring);
    diag_warning(&where->loc, "the term %s of this integrand is a formal variable (degree 0), not a class: it "
                              "contributes 0 over Mbar_{%ld,%ld}, of dimension %ld",
                 strlen(t) <= 30 ? t : "(a polynomial)", (long)g, (long)n, (long)(3 * g - 3 + n));
    free(t);
}

/* For a class: 1 (after warning) when no term can have degree D. */
static int check_class(interp *I, const node *where, slong g, slong n, const cx *c)
{
    slong D = 3 * g - 3 + n, maxdeg = cx_max_degree(c);
    if (cx_max_psi(c) > n || (maxdeg >= D && D > I->lim.max_dim))
        return 0;   /* reported by the expansion, or by the check of the space */
    slong cap = (maxdeg < D ? maxdeg : D) + 1;
    unsigned char *has = cap <= CHECK_MAX_CAP ? calloc((size_t)cap + 1, 1) : NULL;
    int known = has && cx_degree_set(c, cap, has, CHECK_DEGREE_BUDGET);
    int empty = 1;
    for (slong d = 0; known && d <= cap; d++)
        empty &= !has[d];
    int zero = known ? !empty && (cap <= D || !has[D]) : maxdeg < D;
    if (zero)
        check_warn_degrees(I, where, g, n, known ? has : NULL, cap, maxdeg);
    free(has);
    const cx *term = !zero && D > 0 ? check_variable_summand(I, c, 0) : NULL;
    if (term)
        check_warn_variable(I, where, g, n, term);
    return zero || (known && empty);
}

int integrand_is_zero(interp *I, const node *where, slong g, slong n, const value *integrand)
{
    if (2 * g - 2 + n <= 0 || g > WORD_MAX / 8 || n > WORD_MAX / 8)
        return 0;
    if (integrand->kind == V_NUM) {
        if (3 * g - 3 + n == 0)
            return 0;
        check_warn_number(I, where, g, n, integrand);
        return 1;
    }
    return integrand->kind == V_CLASS && check_class(I, where, g, n, integrand->cls);
}
