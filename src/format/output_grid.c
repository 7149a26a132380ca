/* Grids of table_{...}: text, LaTeX, CSV and JSON (out_grid, output.h). */
#include "output.h"

#include <stdlib.h>
#include <string.h>

#include "output_internal.h"
#include "value_str.h"
#include "print.h"
#include "strbuf.h"
#include "util.h"

#include <stdio.h>

typedef struct out_table {
    slong nrows, ncols;
    char **rows, **cols, **cells; /* formatted texts, owned; NULL cell = blank */
} out_table;

/* Frees every formatted text of t (NULL entries allowed).
   Safe after a partial out_table_init. */
static void out_table_clear(out_table *t)
{
    for (slong i = 0; i < t->nrows; i++)
        free(t->rows[i]);
    for (slong j = 0; j < t->ncols; j++)
        free(t->cols[j]);
    for (slong k = 0; k < t->nrows * t->ncols; k++)
        free(t->cells[k]);
    free(t->rows);
    free(t->cols);
    free(t->cells);
}

/* Formats n labels; labels stay exact even in a decimal table because they
   name parameters (g = 2), not results. Returns 0 with *err on failure. */
static int out_table_labels(char **dst, value **src, slong n, const scalar_ring *R, const out_style *st,
                            const char *what, char **err)
{
    out_style ls = *st;
    if (ls.fmt == OUT_DECIMAL)
        ls.fmt = OUT_EXACT;
    for (slong i = 0; i < n; i++) {
        char *e = NULL;
        if (!(dst[i] = out_value(src[i], R, &ls, &e))) {
            *err = xasprintf("%s label %ld: %s", what, (long)i + 1, e);
            free(e);
            return 0;
        }
    }
    return 1;
}

/* Formats every label and cell into t (which the caller clears).
   Returns 0 with *err naming the first cell that cannot be shown. */
static int out_table_init(out_table *t, value **rl, slong nr, value **cl, slong nc, value **cells,
                          const scalar_ring *R, const out_style *st, char **err)
{
    t->nrows = nr;
    t->ncols = nc;
    t->rows = xcalloc((size_t)nr + 1, sizeof(char *));
    t->cols = xcalloc((size_t)nc + 1, sizeof(char *));
    t->cells = xcalloc((size_t)(nr * nc) + 1, sizeof(char *));
    if (!out_table_labels(t->rows, rl, nr, R, st, "row", err) || !out_table_labels(t->cols, cl, nc, R, st, "column", err))
        return 0;
    for (slong k = 0; k < nr * nc; k++) {
        char *e = NULL;
        if (cells[k] && !(t->cells[k] = out_value(cells[k], R, st, &e))) {
            char *rs = value_get_str(rl[k / nc], R), *cs = value_get_str(cl[k % nc], R);
            *err = xasprintf("cell in row %s, column %s: %s", rs, cs, e);
            free(rs);
            free(cs);
            free(e);
            return 0;
        }
    }
    return 1;
}

/* Display width of UTF-8 text: code points, not bytes. */
static size_t out_width(const char *s)
{
    size_t w = 0;
    for (; s && *s; s++)
        w += ((unsigned char)*s & 0xC0) != 0x80;
    return w;
}

/* Prints s right-aligned in a field of width w (plus a two-space gap). */
static void out_put_padded(FILE *out, const char *s, size_t w, int gap)
{
    for (size_t k = out_width(s); k < w; k++)
        fputc(' ', out);
    fprintf(out, "%s%s", s ? s : "", gap ? "  " : "");
}

/* Aligned plain text: a header of column labels, then one line per row. */
static void out_grid_text(FILE *out, const char *corner, const out_table *t)
{
    size_t *w = xcalloc((size_t)t->ncols + 1, sizeof(size_t));
    size_t w0 = out_width(corner);
    for (slong i = 0; i < t->nrows; i++)
        w0 = out_width(t->rows[i]) > w0 ? out_width(t->rows[i]) : w0;
    for (slong j = 0; j < t->ncols; j++) {
        w[j] = out_width(t->cols[j]);
        for (slong i = 0; i < t->nrows; i++)
            w[j] = out_width(t->cells[i * t->ncols + j]) > w[j] ? out_width(t->cells[i * t->ncols + j]) : w[j];
    }
    out_put_padded(out, corner, w0, t->ncols > 0);
    for (slong j = 0; j < t->ncols; j++)
        out_put_padded(out, t->cols[j], w[j], j + 1 < t->ncols);
    fputc('\n', out);
    for (slong i = 0; i < t->nrows; i++) {
        out_put_padded(out, t->rows[i], w0, t->ncols > 0);
        for (slong j = 0; j < t->ncols; j++)
            out_put_padded(out, t->cells[i * t->ncols + j], w[j], j + 1 < t->ncols);
        fputc('\n', out);
    }
    free(w);
}

/* A LaTeX tabular (no packages needed): labels and cells in math mode. */
static void out_grid_latex(FILE *out, const char *row_name, const char *col_name, const out_table *t)
{
    strbuf c;
    strbuf_init(&c);
    out_latex_put_name(&c, row_name);
    strbuf_puts(&c, " \\backslash ");
    out_latex_put_name(&c, col_name);
    fputs("\\begin{tabular}{r|", out);
    for (slong j = 0; j < t->ncols; j++)
        fputc('r', out);
    fprintf(out, "}\n$%s$", c.data);
    for (slong j = 0; j < t->ncols; j++)
        fprintf(out, " & $%s$", t->cols[j]);
    fputs(" \\\\\n\\hline\n", out);
    for (slong i = 0; i < t->nrows; i++) {
        fprintf(out, "$%s$", t->rows[i]);
        for (slong j = 0; j < t->ncols; j++) {
            const char *s = t->cells[i * t->ncols + j];
            fprintf(out, s ? " & $%s$" : " &", s);
        }
        fputs(" \\\\\n", out);
    }
    fputs("\\end{tabular}\n", out);
    strbuf_clear(&c);
}

/* CSV: a header record (corner, column labels), then one record per row;
   CRLF line ends as RFC 4180 asks. Cells are already quoted fields. */
static void out_grid_csv(FILE *out, const char *corner, const out_table *t)
{
    char *f = out_csv_field(corner);
    fputs(f, out);
    free(f);
    for (slong j = 0; j < t->ncols; j++)
        fprintf(out, ",%s", t->cols[j]);
    fputs("\r\n", out);
    for (slong i = 0; i < t->nrows; i++) {
        fputs(t->rows[i], out);
        for (slong j = 0; j < t->ncols; j++) {
            const char *s = t->cells[i * t->ncols + j];
            fprintf(out, ",%s", s ? s : "");
        }
        fputs("\r\n", out);
    }
}

/* Prints a JSON array of already-encoded JSON values (NULL -> null). */
static void out_json_array(FILE *out, char **items, slong n)
{
    fputc('[', out);
    for (slong i = 0; i < n; i++)
        fprintf(out, "%s%s", i ? ", " : "", items[i] ? items[i] : "null");
    fputc(']', out);
}

/* JSON object with the names, labels and a row-major array of cell rows. */
static void out_grid_json(FILE *out, const char *row_name, const char *col_name, const out_table *t)
{
    strbuf b;
    strbuf_init(&b);
    out_json_put_string(&b, row_name);
    strbuf_puts(&b, ",\n  \"col_name\": ");
    out_json_put_string(&b, col_name);
    fprintf(out, "{\n  \"row_name\": %s,\n  \"rows\": ", b.data);
    strbuf_clear(&b);
    out_json_array(out, t->rows, t->nrows);
    fputs(",\n  \"cols\": ", out);
    out_json_array(out, t->cols, t->ncols);
    fputs(",\n  \"cells\": [", out);
    for (slong i = 0; i < t->nrows; i++) {
        fputs(i ? ",\n    " : "\n    ", out);
        out_json_array(out, t->cells + i * t->ncols, t->ncols);
    }
    fputs(t->nrows ? "\n  ]\n}\n" : "]\n}\n", out);
}

/* Formats everything first, then prints in the chosen layout.
   See output.h; write failures are reported like formatting failures. */
int out_grid(FILE *out, const char *row_name, const char *col_name, value **row_labels, slong nrows,
             value **col_labels, slong ncols, value **cells, const scalar_ring *R, const out_style *st,
             char **err)
{
    *err = NULL;
    if (nrows < 0 || ncols < 0 || (nrows > 0 && ncols > 0 && !cells)) {
        *err = xstrdup("malformed table");
        return 0;
    }
    row_name = row_name ? row_name : "";
    col_name = col_name ? col_name : "";
    out_table t;
    int ok = out_table_init(&t, row_labels, nrows, col_labels, ncols, cells, R, st, err);
    if (ok) {
        char *corner = xasprintf("%s\\%s", row_name, col_name);
        if (st->fmt == OUT_LATEX)
            out_grid_latex(out, row_name, col_name, &t);
        else if (st->fmt == OUT_CSV)
            out_grid_csv(out, corner, &t);
        else if (st->fmt == OUT_JSON)
            out_grid_json(out, row_name, col_name, &t);
        else
            out_grid_text(out, corner, &t);
        free(corner);
        if (fflush(out) != 0 || ferror(out)) {
            *err = xstrdup("cannot write the table");
            ok = 0;
        }
    }
    out_table_clear(&t);
    return ok;
}
