/* The text of a value as the language prints it inside messages and lists. */
#include "value_str.h"

#include <stdlib.h>

#include "print.h"
#include "strbuf.h"
#include "util.h"

char *value_get_str(const value *v, const scalar_ring *R)
{
    if (util_stack_exhausted()) {   /* lists nested by very deep recursion; out_value refuses them */
        print_mark_too_deep();
        return xstrdup("...");
    }
    switch (v->kind) {
    case V_NUM:
        return v->termwise ? scalar_get_str_termwise(v->num, R) : scalar_get_str(v->num, R);
    case V_SERIES:
        return print_series(v->ser, R);
    case V_REAL:
        return print_real(v->re);
    case V_CLASS:
        return print_class(v->cls, R);
    case V_STR:
        return xstrdup(v->str);
    case V_LIST: {
        strbuf b;
        strbuf_init(&b);
        strbuf_putc(&b, '[');
        for (slong i = 0; i < v->len; i++) {
            char *s = value_get_str(v->items[i], R);
            strbuf_printf(&b, "%s%s", i ? ", " : "", s);
            free(s);
        }
        strbuf_putc(&b, ']');
        return strbuf_take(&b);
    }
    }
    return xstrdup("?");
}
