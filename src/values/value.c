#include "value.h"

#include <stdlib.h>

#include "strbuf.h"
#include "util.h"

static value *value_alloc(value_kind kind, const scalar_ring *R)
{
    value *v = xcalloc(1, sizeof(value));
    v->kind = kind;
    v->refs = 1;
    v->ctx = R->ctx;
    return v;
}

/* Not inlined: GCC 12 otherwise misreads the size of the new object and
   warns (wrongly) that FLINT writes past it. */
__attribute__((noinline)) value *value_new_num(const scalar_ring *R)
{
    value *v = value_alloc(V_NUM, R);
    fmpq_mpoly_init(v->num, R->ctx);
    return v;
}

value *value_new_si(const scalar_ring *R, slong c)
{
    value *v = value_new_num(R);
    fmpq_mpoly_set_si(v->num, c, R->ctx);
    return v;
}

value *value_new_fmpq(const scalar_ring *R, const fmpq_t c)
{
    value *v = value_new_num(R);
    fmpq_mpoly_set_fmpq(v->num, c, R->ctx);
    return v;
}

value *value_new_class(cx *c, const scalar_ring *R)
{
    value *v = value_alloc(V_CLASS, R);
    v->cls = c;
    return v;
}

value *value_new_str(char *s, const scalar_ring *R)
{
    value *v = value_alloc(V_STR, R);
    v->str = s;
    return v;
}

value *value_new_series(slong var, slong order, const scalar_ring *R)
{
    value *v = value_alloc(V_SERIES, R);
    v->ser = xmalloc(sizeof(tseries));
    tseries_init(v->ser, var, order, R->ctx);
    return v;
}

value *value_new_list(slong len, const scalar_ring *R)
{
    value *v = value_alloc(V_LIST, R);
    v->items = xcalloc(len + 1, sizeof(value *));
    v->len = len;
    return v;
}

value *value_new_real(const scalar_ring *R)
{
    value *v = value_alloc(V_REAL, R);
    v->re = xmalloc(sizeof(arb_struct));
    arb_init(v->re);
    return v;
}

value *value_ref(value *v)
{
    v->refs++;
    return v;
}

/* Lists whose items are left for later because the C stack was nearly full
   (chained through items[0] of a one-slot array), and the outermost release. */
static _Thread_local value *value_deferred;
static _Thread_local int value_releasing, value_draining;

/* Releases the lists put aside by deep releases, from a shallow stack. */
static void value_release_deferred(void)
{
    value_draining = 1;
    while (value_deferred) {
        value *v = value_deferred;
        value_deferred = v->len > 0 ? v->items[v->len - 1] : NULL;   /* the link, see value_release */
        v->len--;
        for (slong i = 0; i < v->len; i++)
            value_release(v->items[i]);
        free(v->items);
        free(v);
    }
    value_draining = 0;
}

/* Frees v's parts; the items of a list are released recursively, and once the
   stack is nearly full the list is put aside for the outermost call, so that
   lists nested by deep recursion cannot exhaust the stack. */
void value_release(value *v)
{
    if (!v || --v->refs > 0)
        return;
    value_releasing++;
    if (v->kind == V_NUM)
        fmpq_mpoly_clear(v->num, v->ctx);
    cx_release(v->cls);
    free(v->str);
    if (v->re) {
        arb_clear(v->re);
        free(v->re);
    }
    if (v->ser) {
        tseries_clear(v->ser, v->ctx);
        free(v->ser);
    }
    if (v->len > 0 && util_stack_exhausted()) {
        v->items = xrealloc(v->items, (size_t)(v->len + 1) * sizeof(value *));
        v->items[v->len++] = value_deferred;   /* the link to the next deferred list */
        value_deferred = v;
    } else {
        for (slong i = 0; i < v->len; i++)
            value_release(v->items[i]);
        free(v->items);
        free(v);
    }
    if (--value_releasing == 0 && !value_draining && value_deferred)
        value_release_deferred();
}

cx *value_to_class(const value *v)
{
    if (v->kind == V_CLASS)
        return cx_ref(v->cls);
    return cx_scalar(v->num, v->ctx);
}

const char *value_kind_name(const value *v)
{
    static const char *names[] = {"number", "class", "string", "series", "list", "real"};
    return names[v->kind];
}
