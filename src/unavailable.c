#include "unavailable.h"

#include <stdio.h>
#include <string.h>

typedef struct {
    const char *name;   /* the stem */
    int prefix;         /* 1: every name that begins with the stem (lambda_1, lambda_g); 0: the stem alone */
    const char *what;
} unavailable_entry;

/* One line per class family; deleting a line makes its names free again. */
static const unavailable_entry unavailable_table[] = {
    {"lambda_", 1, "the Hodge class lambda_k (a Chern class of the Hodge bundle)"},
    {"ch_", 1, "the Chern character ch_k of the Hodge bundle"},
    {"delta", 0, "the boundary divisor delta"},
    {"delta_", 1, "a boundary class delta_..."},
    {"Theta_", 1, "the class Theta_{g,n}"},
    {"DR_", 1, "the double ramification cycle DR_g(a)"},
};

const char *unavailable_class(const char *name)
{
    for (size_t i = 0; i < sizeof unavailable_table / sizeof unavailable_table[0]; i++) {
        const unavailable_entry *e = &unavailable_table[i];
        size_t len = strlen(e->name);
        if (e->prefix ? strncmp(name, e->name, len) == 0 : strcmp(name, e->name) == 0)
            return e->what;
    }
    return NULL;
}

void unavailable_message(const char *name, char *buf, unsigned long size)
{
    const char *what = unavailable_class(name);
    size_t len = strlen(name);
    int sub = len > 0 && name[len - 1] == '_';
    snprintf(buf, size, "%s%s is %s, which is not available in psikappa yet (the name is reserved for it, "
                        "so it cannot be a variable)",
             name, sub ? "{...}" : "", what ? what : "a class");
}
