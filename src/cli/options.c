#include "options.h"

#include <errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "interp.h"
#include "output.h"
#include "util.h"

/* Ranges of the numeric options. The upper ends are where the program's own
   counters stop being meaningful (slong tables, the call-depth counter, the
   decimal printer, the interval timer), so that nothing is capped silently. */
static const option_range options_ranges[] = {
    {"--max-terms", OPTION_WHOLE, 1, 1e15, NULL},
    {"--max-table", OPTION_WHOLE, 1, 1e15, NULL},
    {"--max-depth", OPTION_WHOLE, 1, 1e6, NULL},
    {"--digits", OPTION_WHOLE, 1, OUT_MAX_DIGITS, NULL},
    {"--precision", OPTION_WHOLE, 1, REAL_MAX_DIGITS, NULL},   /* as the precision statement */
    {"--max-memory", OPTION_REAL, 0.001, 1048576, "gibibytes"},
    {"--max-seconds", OPTION_REAL, 0.001, 1e9, "seconds"},
    /* below a millisecond the timer would fire before the first statement;
       below a microsecond setitimer would even read the value as "no timer" */
    {"--time-limit", OPTION_REAL, 0.001, 1e8, "seconds"},
};

const option_range *options_find_range(const char *name)
{
    for (size_t i = 0; i < sizeof options_ranges / sizeof options_ranges[0]; i++)
        if (strcmp(name, options_ranges[i].name) == 0)
            return &options_ranges[i];
    return NULL;
}

void options_refuse(FILE *err, const char *opt, const char *what, const char *arg)
{
    if (arg)
        fprintf(err, "psikappa: %s expects %s, got '%s'\n", opt, what, arg);
    else
        fprintf(err, "psikappa: %s expects %s, got nothing\n", opt, what);
}

/* A range end as a person writes it: 1000000, 0.001, 1e15 (no "e+"). */
static void options_format_bound(char *buf, size_t len, double x)
{
    if (x >= 1e7 && x == floor(x)) {
        int e = (int)floor(log10(x) + 1e-9);
        double m = x / pow(10, e);
        if (fabs(m - floor(m + 0.5)) < 1e-9)
            snprintf(buf, len, "%.0fe%d", floor(m + 0.5), e);
        else
            snprintf(buf, len, "%.6g", x);
    } else {
        snprintf(buf, len, "%.15g", x);
    }
}

/* "a whole number from 1 to 1000000", "a number of seconds from 0.001 to 1e8". */
static char *options_expectation(const option_range *r)
{
    char lo[32], hi[32];
    options_format_bound(lo, sizeof lo, r->lo);
    options_format_bound(hi, sizeof hi, r->hi);
    if (r->kind == OPTION_WHOLE)
        return xasprintf("a whole number from %s to %s", lo, hi);
    return xasprintf("a number of %s from %s to %s", r->unit ? r->unit : "units", lo, hi);
}

int options_parse_number(const option_range *r, const char *arg, double *out, FILE *err)
{
    char *end = NULL;
    double v = 0;
    int ok = arg != NULL && *arg != '\0';
    if (ok) {
        errno = 0;
        v = strtod(arg, &end);
        ok = !errno && end != arg && *end == '\0' && isfinite(v) && v >= r->lo && v <= r->hi;
        ok = ok && (r->kind == OPTION_REAL || v == floor(v));
    }
    if (ok) {
        *out = v;
        return 1;
    }
    char *what = options_expectation(r);
    options_refuse(err, r->name, what, arg);
    free(what);
    return 0;
}
