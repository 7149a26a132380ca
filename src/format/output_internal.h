/* What the writers of output.c, output_latex.c and output_grid.c share. */
#ifndef PSIKAPPA_OUTPUT_INTERNAL_H
#define PSIKAPPA_OUTPUT_INTERNAL_H

#include "classes/classexpr.h"
#include "output.h"
#include "strbuf.h"

/* Appends text escaped for LaTeX text mode inside \mbox{...} (control bytes become spaces). */
void out_latex_put_text(strbuf *b, const char *s);
/* Appends a variable or label name in math mode: L_1 -> L_{1}, pi -> \pi; free text goes
   through \mbox. */
void out_latex_put_name(strbuf *b, const char *name);
/* Appends the LaTeX of a class expression tree (mirrors print_class). */
void out_latex_class_rec(strbuf *b, const cx *e, const scalar_ring *R);
/* s as one RFC 4180 field (quoted, quotes doubled, when it holds a comma, quote or line
   break); the caller frees it. */
char *out_csv_field(const char *s);
/* Appends str as a JSON string literal; invalid UTF-8 becomes U+FFFD. */
void out_json_put_string(strbuf *b, const char *str);

#endif
