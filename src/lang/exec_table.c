/* The statements that shape output: table_{...} E (a grid over index ranges)
   and output FORMAT [digits] (how values print from then on). */
#include <stdlib.h>
#include <string.h>

#include "diag.h"
#include "output.h"
#include "interp.h"
#include "strbuf.h"
#include "util.h"
#include "exec.h"
#include "eval.h"
#include "failure.h"

/* Tables larger than this would not be read by anyone. */
#define TABLE_MAX_CELLS 1000000

int exec_output(interp *I, scope *s, const node *n)
{
    out_format f;
    if (!out_format_parse(&f, n->text)) {
        diag_error(&n->loc, "unknown output format '%s' (exact, decimal, latex, csv or json)", n->text);
        return 0;
    }
    slong digits = I->style.digits;
    if (n->a && !eval_slong(I, s, n->a, "number of digits", 1, &digits))
        return 0;
    if (digits > OUT_MAX_DIGITS) {
        diag_error(&n->a->loc, "at most %d digits", OUT_MAX_DIGITS);
        return 0;
    }
    I->style.fmt = f;
    I->style.digits = digits;
    return 1;
}

int exec_precision(interp *I, scope *s, const node *n)
{
    slong digits;
    if (!eval_slong(I, s, n->a, "number of digits", 1, &digits))
        return 0;
    if (digits > REAL_MAX_DIGITS) {
        diag_error(&n->a->loc, "at most %d digits", REAL_MAX_DIGITS);
        return 0;
    }
    I->real_digits = digits;
    return 1;
}

typedef struct {
    slong nranges;
    const char **names;
    slong *lo, *size;
    slong nrows, ncols;
} table_shape;

/* Evaluates the ranges; the last one gives the columns, the others the rows. */
static int table_ranges(interp *I, scope *s, const node *n, table_shape *T)
{
    T->nranges = n->list->len;
    T->names = xcalloc(T->nranges, sizeof(char *));
    T->lo = xcalloc(T->nranges, sizeof(slong));
    T->size = xcalloc(T->nranges, sizeof(slong));
    double cells = 1;
    for (slong r = 0; r < T->nranges; r++) {
        const node *rg = n->list->items[r];
        slong hi;
        if (!eval_slong(I, s, rg->a, "range start", WORD_MIN / 2, &T->lo[r])
            || !eval_slong(I, s, rg->b, "range end", WORD_MIN / 2, &hi))
            return 0;
        T->names[r] = rg->text;
        T->size[r] = hi >= T->lo[r] ? hi - T->lo[r] + 1 : 0;
        cells *= (double)T->size[r];
    }
    if (cells > TABLE_MAX_CELLS) {
        diag_error(&n->loc, "this table would have %.3g cells, more than the %d a table may have "
                            "(split it into smaller tables)", cells, TABLE_MAX_CELLS);
        return 0;
    }
    T->ncols = T->size[T->nranges - 1];
    T->nrows = T->nranges == 1 ? 1 : (slong)(cells / (double)(T->ncols ? T->ncols : 1));
    if (T->ncols == 0)
        T->nrows = 0;
    return 1;
}

/* Index values of row r, innermost range last. */
static void table_row_indices(const table_shape *T, slong r, slong *idx)
{
    for (slong k = T->nranges - 2; k >= 0; k--) {
        idx[k] = T->lo[k] + r % T->size[k];
        r /= T->size[k];
    }
}

static value *table_row_label(interp *I, const table_shape *T, const slong *idx)
{
    if (T->nranges == 2)
        return value_new_si(&I->ring, idx[0]);
    strbuf b;
    strbuf_init(&b);
    for (slong k = 0; k < T->nranges - 1; k++)
        strbuf_printf(&b, "%s%ld", k ? ", " : "", (long)idx[k]);
    return value_new_str(strbuf_take(&b), &I->ring);
}

static char *table_row_name(const table_shape *T)
{
    strbuf b;
    strbuf_init(&b);
    for (slong k = 0; k < T->nranges - 1; k++)
        strbuf_printf(&b, "%s%s", k ? ", " : "", T->names[k]);
    if (T->nranges == 1)
        strbuf_puts(&b, "");
    return strbuf_take(&b);
}

/* One cell in a scope binding every index; a string "" stands for a blank. */
static value *table_cell(interp *I, scope *s, const node *e, const table_shape *T, const slong *idx)
{
    scope *inner = scope_new(s);
    for (slong k = 0; k < T->nranges; k++)
        scope_bind_value(inner, T->names[k], value_new_si(&I->ring, idx[k]));
    value *v = eval_expr(I, inner, e);
    scope_free(inner);
    return v;
}

static void table_free_values(value **v, slong len)
{
    for (slong i = 0; i < len; i++)
        value_release(v[i]);
    free(v);
}

static int table_fill(interp *I, scope *s, const node *n, const table_shape *T, value **rows, value **cols,
                      value **cells)
{
    slong *idx = xcalloc(T->nranges + 1, sizeof(slong));
    int ok = 1;
    for (slong c = 0; c < T->ncols; c++)
        cols[c] = value_new_si(&I->ring, T->lo[T->nranges - 1] + c);
    for (slong r = 0; r < T->nrows && ok; r++) {
        table_row_indices(T, r, idx);
        rows[r] = T->nranges == 1 ? value_new_str(xstrdup(""), &I->ring) : table_row_label(I, T, idx);
        for (slong c = 0; c < T->ncols && ok; c++) {
            idx[T->nranges - 1] = T->lo[T->nranges - 1] + c;
            value *v = table_cell(I, s, n->a, T, idx);
            ok = v != NULL && !failure_cancelled(n);
            if (v && v->kind == V_STR && v->str[0] == '\0') {
                value_release(v);
                v = NULL;
            }
            cells[r * T->ncols + c] = v;
        }
    }
    free(idx);
    return ok;
}

int exec_table(interp *I, scope *s, const node *n)
{
    table_shape T;
    memset(&T, 0, sizeof T);
    int ok = table_ranges(I, s, n, &T);
    if (ok) {
        value **rows = xcalloc(T.nrows + 1, sizeof(value *));
        value **cols = xcalloc(T.ncols + 1, sizeof(value *));
        value **cells = xcalloc(T.nrows * T.ncols + 1, sizeof(value *));
        ok = table_fill(I, s, n, &T, rows, cols, cells);
        char *err = NULL, *row_name = table_row_name(&T);
        if (ok && !out_grid(I->out, row_name, T.names[T.nranges - 1], rows, T.nrows, cols, T.ncols, cells,
                            &I->ring, &I->style, &err)) {
            diag_error(&n->loc, "%s", err ? err : "this table cannot be printed in this format");
            ok = 0;
        }
        free(err);
        free(row_name);
        table_free_values(rows, T.nrows);
        table_free_values(cols, T.ncols);
        table_free_values(cells, T.nrows * T.ncols);
    }
    free(T.names);
    free(T.lo);
    free(T.size);
    return ok;
}
