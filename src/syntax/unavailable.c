#include "unavailable.h"

#include <stdio.h>
#include <string.h>

typedef struct {
    const char *name;   /* the stem */
    int prefix;         /* 1: every name that begins with the stem (lambda_1, lambda_g); 0: the stem alone */
    const char *what;
    int available;      /* 1: psikappa has the class; the name is still reserved for it */
} unavailable_entry;

/* One line per class family: a family not provided yet, or one provided whose
   names must not become variables; deleting a line makes its names free again. */
static const unavailable_entry unavailable_table[] = {
    {"lambda_", 1, "the Hodge class lambda_k (a Chern class of the Hodge bundle)", 1},
    {"ch_", 1, "the Chern character ch_k of the Hodge bundle", 1},
    {"delta", 0, "the total boundary divisor delta (the sum of delta_{irr} and the delta_{h,S})", 0},
    {"delta_", 1, "a boundary divisor, delta_{irr} or delta_{h,S}", 1},
    {"stratum_", 1, "the stratum class stratum_{g,n,k} of a stable graph", 1},
    {"Theta_", 1, "the class Theta_{g,n}", 0},
    {"DR_", 1, "the double ramification cycle DR_g(a)", 0},
};

static const unavailable_entry *unavailable_find(const char *name)
{
    for (size_t i = 0; i < sizeof unavailable_table / sizeof unavailable_table[0]; i++) {
        const unavailable_entry *e = &unavailable_table[i];
        size_t len = strlen(e->name);
        if (e->prefix ? strncmp(name, e->name, len) == 0 : strcmp(name, e->name) == 0)
            return e;
    }
    return NULL;
}

const char *unavailable_class(const char *name)
{
    const unavailable_entry *e = unavailable_find(name);
    return e ? e->what : NULL;
}

void unavailable_message(const char *name, char *buf, unsigned long size)
{
    const unavailable_entry *e = unavailable_find(name);
    const char *what = e ? e->what : NULL;
    size_t len = strlen(name);
    int sub = len > 0 && name[len - 1] == '_';
    if (e && e->available) {
        snprintf(buf, size, "%s%s is %s: the name is reserved for the class, so it cannot be a variable",
                 name, sub ? "{...}" : "", what);
        return;
    }
    snprintf(buf, size, "%s%s is %s, which is not available in psikappa yet (the name is reserved for it, "
                        "so it cannot be a variable)",
             name, sub ? "{...}" : "", what ? what : "a class");
}
