#include "diag.h"

#include <stdarg.h>

static FILE *diag_stream;

void diag_set_stream(FILE *f)
{
    diag_stream = f;
}

static void diag_vprint(const char *kind, const srcloc *loc, const char *fmt, va_list ap)
{
    FILE *out = diag_stream ? diag_stream : stderr;
    fflush(stdout);
    if (loc && loc->src)
        fprintf(out, "%s:%d:%d: ", loc->src->name, loc->first_line, loc->first_column);
    else
        fputs("psikappa: ", out);
    fprintf(out, "%s: ", kind);
    vfprintf(out, fmt, ap);
    fputc('\n', out);
    if (loc && loc->src)
        source_print_caret(out, loc);
    fflush(out);
}

void diag_error(const srcloc *loc, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    diag_vprint("error", loc, fmt, ap);
    va_end(ap);
}

void diag_warning(const srcloc *loc, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    diag_vprint("warning", loc, fmt, ap);
    va_end(ap);
}

void diag_note(const srcloc *loc, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    diag_vprint("note", loc, fmt, ap);
    va_end(ap);
}

