#include "value.h"

#include <stdlib.h>

#include "format/print.h"
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

value *value_ref(value *v)
{
    v->refs++;
    return v;
}

void value_release(value *v)
{
    if (!v || --v->refs > 0)
        return;
    if (v->kind == V_NUM)
        fmpq_mpoly_clear(v->num, v->ctx);
    cx_release(v->cls);
    free(v->str);
    free(v);
}

cx *value_to_class(const value *v)
{
    if (v->kind == V_CLASS)
        return cx_ref(v->cls);
    return cx_scalar(v->num, v->ctx);
}

char *value_get_str(const value *v, const scalar_ring *R)
{
    switch (v->kind) {
    case V_NUM:
        return scalar_get_str(v->num, R);
    case V_CLASS:
        return print_class(v->cls, R);
    case V_STR:
        return xstrdup(v->str);
    }
    return xstrdup("?");
}

const char *value_kind_name(const value *v)
{
    static const char *names[] = {"number", "class", "string"};
    return names[v->kind];
}
