#include "source.h"

#include <errno.h>
#include <stdlib.h>
#include <string.h>

#include "util.h"

static void source_index_lines(source *s)
{
    int cap = 16;
    s->line_starts = xmalloc(cap * sizeof(size_t));
    s->nlines = 0;
    s->line_starts[s->nlines++] = 0;
    for (size_t i = 0; i < s->len; i++) {
        if (s->text[i] != '\n')
            continue;
        if (s->nlines == cap) {
            cap *= 2;
            s->line_starts = xrealloc(s->line_starts, cap * sizeof(size_t));
        }
        s->line_starts[s->nlines++] = i + 1;
    }
}

source *source_new(const char *name, const char *text, size_t len)
{
    source *s = xmalloc(sizeof(source));
    s->name = xstrdup(name);
    s->text = xmalloc(len + 1);
    memcpy(s->text, text, len);
    s->text[len] = '\0';
    s->len = len;
    source_index_lines(s);
    return s;
}

void source_free(source *s)
{
    if (!s)
        return;
    free(s->name);
    free(s->text);
    free(s->line_starts);
    free(s);
}

source *source_read_file(const char *path)
{
    FILE *f = strcmp(path, "-") == 0 ? stdin : fopen(path, "rb");
    if (!f)
        return NULL;
    size_t cap = 4096, len = 0;
    char *buf = xmalloc(cap);
    size_t got;
    while ((got = fread(buf + len, 1, cap - len, f)) > 0) {
        len += got;
        if (len == cap) {
            cap *= 2;
            buf = xrealloc(buf, cap);
        }
    }
    int failed = ferror(f);
    if (f != stdin)
        fclose(f);
    if (failed) {
        free(buf);
        errno = EIO;
        return NULL;
    }
    source *s = source_new(strcmp(path, "-") == 0 ? "<stdin>" : path, buf, len);
    free(buf);
    return s;
}

size_t source_line(const source *s, int line, const char **start)
{
    if (!s || line < 1 || line > s->nlines) {
        *start = "";
        return 0;
    }
    size_t b = s->line_starts[line - 1];
    size_t e = line < s->nlines ? s->line_starts[line] - 1 : s->len;
    if (e > b && s->text[e - 1] == '\r')
        e--;
    *start = s->text + b;
    return e - b;
}

/* Lines longer than this are shown as a window around the caret, so that a
   megabyte-long line does not flood the terminal. */
#define CARET_WINDOW 160

static void caret_window(size_t len, int col, size_t *from, size_t *to)
{
    *from = 0;
    *to = len;
    if (len <= CARET_WINDOW)
        return;
    size_t c = col > 0 ? (size_t)col - 1 : 0;
    *from = c > CARET_WINDOW / 2 ? c - CARET_WINDOW / 2 : 0;
    *to = *from + CARET_WINDOW < len ? *from + CARET_WINDOW : len;
}

static void print_visible(FILE *out, const char *p, size_t n)
{
    for (size_t i = 0; i < n; i++) {
        unsigned char ch = (unsigned char)p[i];
        fputc(ch == '\t' || (ch >= 32 && ch != 127) ? ch : '?', out);
    }
}

void source_print_caret(FILE *out, const srcloc *loc)
{
    if (!loc || !loc->src || loc->first_line < 1)
        return;
    const char *line;
    size_t len = source_line(loc->src, loc->first_line, &line);
    size_t from, to;
    caret_window(len, loc->first_column, &from, &to);
    fprintf(out, "%5d | %s", loc->first_line, from > 0 ? "..." : "");
    print_visible(out, line + from, to - from);
    fprintf(out, "%s\n      | %s", to < len ? "..." : "", from > 0 ? "   " : "");
    size_t c0 = loc->first_column > 0 ? (size_t)loc->first_column - 1 : 0;
    size_t c1 = loc->last_line == loc->first_line && loc->last_column > loc->first_column
                    ? (size_t)loc->last_column - 1 : c0 + 1;
    for (size_t i = from; i < c0 && i < to; i++)
        fputc(line[i] == '\t' ? '\t' : ' ', out);
    fputc('^', out);
    for (size_t i = c0 + 1; i < c1 && i < to; i++)
        fputc('~', out);
    fputc('\n', out);
}
