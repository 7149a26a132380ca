/* Names, items of lists and subscripted names: x, xs[i], L_{i} (a member of
   a family of variables), V_{g,n} (the volume polynomial) and VTheta_{g,n}
   (the super volume polynomial). Every function
   returns a new reference, or NULL after reporting at the node responsible. */
#include <stdlib.h>
#include <string.h>

#include "diag.h"
#include "hodge_lang.h"
#include "interp.h"
#include "theta_lang.h"
#include "strata_class.h"
#include "strata_lang.h"
#include "unavailable.h"
#include "util.h"
#include "integrate.h"
#include "eval.h"
#include "builtins.h"

/* Genus and number of points of V_{g,n} stay below this (as for every space
   that the volume routes accept). */
#define NAMES_MAX_VOLUME_INDEX 1000000

static value *names_fail(const node *n, char *msg)
{
    diag_error(&n->loc, "%s", msg);
    free(msg);
    return NULL;
}

/* Reports a reserved class name (lambda_1, Theta, ...); 1 when name is one. */
int names_check_reserved(const srcloc *at, const char *name)
{
    if (!unavailable_class(name))
        return 0;
    char buf[320];
    unavailable_message(name, buf, sizeof buf);
    diag_error(at, "%s", buf);
    return 1;
}

value *eval_name(interp *I, scope *s, const node *n)
{
    binding *b = scope_lookup(s, n->text);
    value *hodge;
    if (b && b->kind == B_VALUE)
        return value_ref(b->val);
    if (!b && hodge_lang_name(I, n, &hodge))
        return hodge;
    if (!b && strata_class_name(I, n, &hodge))
        return hodge;
    if (!b && names_check_reserved(&n->loc, n->text))
        return NULL;
    if (!b)
        return names_fail(n, xasprintf("undefined name '%s' (formal variables are declared with 'var %s')",
                                       n->text, n->text));
    if (b->kind == B_FUNCTION)
        return names_fail(n, xasprintf("'%s' is a function: call it as %s(...)", n->text, n->text));
    return names_fail(n, xasprintf("'%s' is a family of variables: its members are %s_%ld, ..., or %s_{i} for a "
                                   "computed index", n->text, n->text, (long)b->lo, n->text));
}

/* Item i of the list v (index expression at n->a): 1-based, like the mathematics it
   transcribes. */
static value *names_list_item(interp *I, scope *s, const node *n, const value *v)
{
    slong i;
    if (!eval_slong(I, s, n->a, "list index", 1, &i))
        return NULL;
    if (i > v->len)
        return names_fail(n->a, xasprintf("index %ld is past the end of a list of length %ld", (long)i,
                                          (long)v->len));
    return value_ref(v->items[i - 1]);
}

/* expr[i] where expr is not a bare name: a call, a parenthesised expression, another item. */
static value *names_item_of_value(interp *I, scope *s, const node *n)
{
    value *base = eval_expr(I, s, n->b), *r;
    if (!base)
        return NULL;
    if (base->kind == V_LIST)
        r = names_list_item(I, s, n, base);
    else
        r = names_fail(n->b, xstrdup("this is not a list (square brackets take the items of a list)"));
    value_release(base);
    return r;
}

/* xs[i] for a list: 1-based, like the mathematics it transcribes. */
value *eval_indexed(interp *I, scope *s, const node *n)
{
    if (n->b)
        return names_item_of_value(I, s, n);
    binding *b = scope_lookup(s, n->text);
    if (b && b->kind == B_VALUE && b->val->kind == V_LIST)
        return names_list_item(I, s, n, b->val);
    if (b && b->kind == B_FAMILY)
        return names_fail(n, xasprintf("'%s' is a family of variables: a member is written %s_{i}, not %s[i] "
                                       "(square brackets take the items of a list)", n->text, n->text, n->text));
    if (b && b->kind == B_FUNCTION)
        return names_fail(n, xasprintf("'%s' is a function: call it as %s(...)", n->text, n->text));
    if (!b)
        return names_fail(n, xasprintf("undefined name '%s'", n->text));
    return names_fail(n, xasprintf("'%s' is not a list (square brackets take the items of a list)", n->text));
}

/* L_{i}: the member L_i of the family L declared by var L_{a..b}. */
static value *names_family_member(interp *I, scope *s, const node *n, const binding *b)
{
    if (n->list->len != 1)
        return names_fail(n, xasprintf("a member of the family %s has one index: %s_{i}", n->text, n->text));
    slong i, lo = b->lo, hi = b->hi;
    if (!eval_slong(I, s, n->list->items[0], "index", WORD_MIN / 2, &i))
        return NULL;
    if (i < lo || i > hi)
        return names_fail(n->list->items[0], xasprintf("index %ld is outside the declared range %s_{%ld..%ld}",
                                                       (long)i, n->text, (long)lo, (long)hi));
    char *name = xasprintf("%s_%ld", n->text, (long)i);
    binding *m = scope_lookup(s, name);
    free(name);
    if (m && m->kind == B_VALUE)
        return value_ref(m->val);
    return names_fail(n, xasprintf("the family member %s_%ld is no longer bound", n->text, (long)i));
}

/* One subscript of V_{g,n} as an integer in 0..NAMES_MAX_VOLUME_INDEX. */
static int names_volume_index(interp *I, scope *s, const node *e, const char *what, slong *out)
{
    if (!eval_slong(I, s, e, what, 0, out))
        return 0;
    if (*out <= NAMES_MAX_VOLUME_INDEX)
        return 1;
    diag_error(&e->loc, "the %s of V_{g,n} or VTheta_{g,n} must be at most %d", what, NAMES_MAX_VOLUME_INDEX);
    return 0;
}

/* V_{g,n}: the volume polynomial V_{g,n}(L_1..L_n), binding L_1..L_n; VTheta_{g,n} (theta): the
   super volume polynomial V^Theta_{g,n}(L_1..L_n) of src/lang/theta_lang_values.c, the same way. */
static value *names_volume(interp *I, scope *s, const node *n, int theta)
{
    if (n->list->len != 2)
        return names_fail(n, xasprintf("%s_{g,n} takes two subscripts, the genus and the number of points "
                                       "(got %d)", n->text, n->list->len));
    slong g, npts;
    if (!names_volume_index(I, s, n->list->items[0], "genus", &g)
        || !names_volume_index(I, s, n->list->items[1], "number of points", &npts))
        return NULL;
    return theta ? theta_supervolume_value(I, n, g, npts) : volume_cached(I, n, g, npts);
}

/* The arguments of a call V_{g,n}(a_1, ..., a_n), evaluated into args[0..len); returns 0
   (those evaluated released) when one fails. */
static int names_call_args(interp *I, scope *s, const node *call, value **args)
{
    for (int i = 0; i < call->list->len; i++)
        if (!(args[i] = eval_expr(I, s, call->list->items[i]))) {
            while (i-- > 0)
                value_release(args[i]);
            return 0;
        }
    return 1;
}

/* V_{g,n}(a_1, ..., a_n), VTheta_{g,n}(...): the volume polynomial at L_i = a_i, all at once
   (subs_lengths). Any other subscripted name takes no arguments. */
static value *names_subscript_call(interp *I, scope *s, const node *n, const binding *b)
{
    const node *call = n->b;
    int volume = (strcmp(n->text, "V") == 0 || strcmp(n->text, "VTheta") == 0) && !(b && b->kind == B_FAMILY);
    if (!volume)
        return names_fail(call, xasprintf("%s_{...} is not a function: only the volume polynomials "
                                          "V_{g,n}(L_1, ..., L_n) and VTheta_{g,n}(...) take arguments", n->text));
    slong npts;
    value *p = names_volume(I, s, n, n->text[1] != '\0');
    if (!p || !names_volume_index(I, s, n->list->items[1], "number of points", &npts)) {
        value_release(p);
        return NULL;
    }
    if (call->list->len != npts) {
        value_release(p);
        return names_fail(call, xasprintf("%s_{g,n} with n = %ld takes %ld arguments, the lengths L_1..L_%ld "
                                          "(got %d)", n->text, (long)npts, (long)npts, (long)npts,
                                          call->list->len));
    }
    int *vars = xmalloc((size_t)(npts + 1) * sizeof(int));
    value **args = xmalloc((size_t)(npts + 1) * sizeof(value *));
    value *r = NULL;
    if (integrate_declare_lengths(I, n, npts, vars) && names_call_args(I, s, call, args)) {
        r = subs_lengths(I, call, p, vars, npts, args);
        for (slong i = 0; i < npts; i++)
            value_release(args[i]);
    }
    free(args);
    free(vars);
    value_release(p);
    return r;
}

value *eval_subscript(interp *I, scope *s, const node *n)
{
    binding *b = scope_lookup(s, n->text);
    if (n->b)
        return names_subscript_call(I, s, n, b);
    if (b && b->kind == B_FAMILY)
        return names_family_member(I, s, n, b);
    if (strcmp(n->text, "V") == 0 || strcmp(n->text, "VTheta") == 0)
        return names_volume(I, s, n, n->text[1] != '\0');
    value *hodge;
    if (!b && hodge_lang_subscript(I, s, n, &hodge))
        return hodge;
    if (!b && strata_lang_subscript(I, s, n, &hodge))
        return hodge;
    if (!b && strata_class_subscript(I, s, n, &hodge))
        return hodge;
    char *stem = xasprintf("%s_", n->text);
    int reserved = names_check_reserved(&n->loc, stem);
    free(stem);
    if (reserved)
        return NULL;
    if (b && b->kind == B_VALUE && b->val->kind == V_LIST)
        return names_fail(n, xasprintf("'%s' is a list: its items are %s[i]", n->text, n->text));
    return names_fail(n, xasprintf("'%s' is not a family of variables (declare one with var %s_{1..k})", n->text,
                                   n->text));
}
