/* Values of command-line options: each is checked against its range before
   any script runs, and a bad one is refused on the command line with the
   option's name, what it expects and the text that was given. */
#ifndef PSIKAPPA_OPTIONS_H
#define PSIKAPPA_OPTIONS_H

#include <stdio.h>

typedef enum { OPTION_WHOLE, OPTION_REAL } option_kind;

/* One numeric option: its name, kind, inclusive range and what it counts
   ("seconds", "gibibytes"; NULL for a plain count). */
typedef struct {
    const char *name;
    option_kind kind;
    double lo, hi;
    const char *unit;
} option_range;

/* The range of a numeric option by name (e.g. "--digits"), NULL for others. */
const option_range *options_find_range(const char *name);

/* Parses arg (NULL: the value is missing) as a value of the option; on
   success sets *out and returns 1, else writes the refusal to err and returns 0. */
int options_parse_number(const option_range *r, const char *arg, double *out, FILE *err);

/* Writes "psikappa: OPT expects WHAT, got 'ARG'" (or "got nothing" for a
   missing value) to err; the common form of every option refusal. */
void options_refuse(FILE *err, const char *opt, const char *what, const char *arg);

#endif
