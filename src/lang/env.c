#include "env.h"

#include <stdlib.h>
#include <string.h>

#include "util.h"

scope *scope_new(scope *parent)
{
    scope *s = xcalloc(1, sizeof(scope));
    s->parent = parent;
    return s;
}

static void binding_clear(binding *b)
{
    free(b->name);
    value_release(b->val);
    memset(b, 0, sizeof(binding));
}

void scope_free(scope *s)
{
    if (!s)
        return;
    for (int i = 0; i < s->len; i++)
        binding_clear(&s->items[i]);
    free(s->items);
    free(s);
}

binding *scope_lookup(scope *s, const char *name)
{
    for (; s; s = s->parent)
        for (int i = s->len - 1; i >= 0; i--)
            if (strcmp(s->items[i].name, name) == 0)
                return &s->items[i];
    return NULL;
}

/* The slot for name in s itself, emptied if it was bound there before. */
static binding *scope_slot(scope *s, const char *name)
{
    for (int i = 0; i < s->len; i++)
        if (strcmp(s->items[i].name, name) == 0) {
            binding_clear(&s->items[i]);
            s->items[i].name = xstrdup(name);
            return &s->items[i];
        }
    if (s->len == s->cap) {
        s->cap = s->cap ? 2 * s->cap : 8;
        s->items = xrealloc(s->items, s->cap * sizeof(binding));
    }
    binding *b = &s->items[s->len++];
    memset(b, 0, sizeof(binding));
    b->name = xstrdup(name);
    return b;
}

void scope_bind_value(scope *s, const char *name, value *v)
{
    binding *b = scope_slot(s, name);
    b->kind = B_VALUE;
    b->val = v;
}

void scope_bind_function(scope *s, const char *name, const node *def)
{
    binding *b = scope_slot(s, name);
    b->kind = B_FUNCTION;
    b->def = def;
}

void scope_bind_family(scope *s, const char *name, slong lo, slong hi)
{
    binding *b = scope_slot(s, name);
    b->kind = B_FAMILY;
    b->lo = lo;
    b->hi = hi;
}
