/* Output formats for values and tables: exact text, decimals with a
   guaranteed number of correct digits, LaTeX, CSV (RFC 4180) and JSON.
   Ownership: every returned string and every *err message is new memory
   that the caller frees with free(); values and the ring are only read. */
#ifndef PSIKAPPA_OUTPUT_H
#define PSIKAPPA_OUTPUT_H

#include <stdio.h>

#include <flint/fmpq_mpoly.h>

#include "scalar.h"
#include "value.h"

typedef enum { OUT_EXACT, OUT_DECIMAL, OUT_LATEX, OUT_CSV, OUT_JSON } out_format;

typedef struct out_style {
    out_format fmt;
    slong digits;    /* correct significant digits for OUT_DECIMAL (1..OUT_MAX_DIGITS) */
    int show_radius; /* OUT_DECIMAL: print the error ball as [x +/- r] */
} out_style;

#define OUT_MAX_DIGITS 1000000
/* Initialiser for a plain exact style (a struct literal, nothing to clear). */
#define OUT_STYLE_EXACT {OUT_EXACT, 20, 0}

/* Sets *f from a name ("exact", "decimal", "latex", "csv", "json").
   Returns 1 on success, 0 (leaving *f alone) when the name is unknown. */
int out_format_parse(out_format *f, const char *name);

/* The name of f, as accepted by out_format_parse (static storage). */
const char *out_format_name(out_format f);

/* Decimal text of p (a polynomial in pi only) with `digits` correct
   significant digits; NULL when p involves a formal variable. Shared with the
   decimal() builtin so both round the same way. */
char *out_decimal(const fmpq_mpoly_t p, const scalar_ring *R, slong digits, int show_radius);

/* LaTeX (math mode, no $) of a scalar, e.g. \frac{L_{1}^{2} + 4 \pi^{2}}{48}. */
char *out_latex_scalar(const fmpq_mpoly_t p, const scalar_ring *R);

/* Text of one value in the style: OUT_EXACT the usual form, OUT_DECIMAL
   digits (series coefficient by coefficient, lists item by item; strings
   unchanged), OUT_LATEX math-mode text, OUT_CSV one quoted-if-needed field,
   OUT_JSON one JSON value (exact values as strings, lists as arrays).
   *err is set to NULL first. Returns NULL and sets *err when the value cannot
   be shown so (a decimal of a class, or of anything with a formal variable;
   digits outside 1..OUT_MAX_DIGITS). */
char *out_value(const value *v, const scalar_ring *R, const out_style *st, char **err);

/* Prints a table with row labels (named row_name), column labels (named
   col_name) and cells[r*ncols+c]; a NULL cell is a blank (JSON null).
   OUT_EXACT/OUT_DECIMAL: aligned text; OUT_LATEX: a tabular; OUT_CSV: CRLF
   records; OUT_JSON: {"row_name","col_name","rows","cols","cells"}.
   Every cell is formatted before anything is printed, so an error leaves
   `out` untouched. Returns 1 on success, 0 with *err set on failure. */
int out_grid(FILE *out, const char *row_name, const char *col_name, value **row_labels, slong nrows,
             value **col_labels, slong ncols, value **cells, const scalar_ring *R, const out_style *st,
             char **err);

#endif
