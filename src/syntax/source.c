#include "source.h"

#include <errno.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

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

/* Why a script cannot be read from a file of this status (NULL when it can),
   as a clause about "it"; regular_only also refuses pipes and sockets. The
   caller frees it. */
static char *source_check_kind(const struct stat *st, int regular_only)
{
    if (S_ISDIR(st->st_mode))
        return xstrdup("it is a folder, not a script file");
    if (S_ISCHR(st->st_mode) || S_ISBLK(st->st_mode))
        return xstrdup("it is a device, not a script file");
    if (!S_ISREG(st->st_mode) && regular_only)
        return xstrdup("it is not a regular file (a pipe or a socket)");
    if (S_ISREG(st->st_mode) && (unsigned long long)st->st_size > SOURCE_MAX_BYTES)
        return xasprintf("it has %llu bytes, more than the limit of %u bytes (%u MiB) for a script",
                         (unsigned long long)st->st_size, SOURCE_MAX_BYTES, SOURCE_MAX_BYTES >> 20);
    return NULL;
}

/* Why a file cannot be opened, in words for the common cases (caller frees). */
static char *source_open_error(int err)
{
    if (err == ELOOP)
        return xstrdup("it is a loop of symbolic links");
    if (err == EACCES)
        return xstrdup("it is not readable (permission denied)");
    return xstrdup(strerror(err));
}

/* Opens path for reading after checking what it is (before opening, since
   opening a pipe or some devices blocks); NULL with *why set otherwise.
   *size is the length of a regular file, else 0. */
static FILE *source_open(const char *path, int regular_only, size_t *size, char **why)
{
    struct stat st;
    *size = 0;
    if (stat(path, &st) != 0) {
        *why = source_open_error(errno);
        return NULL;
    }
    if ((*why = source_check_kind(&st, regular_only)))
        return NULL;
    FILE *f = fopen(path, "rb");
    if (!f)
        *why = source_open_error(errno);
    /* checked again on the open file: the name may now stand for another */
    else if (fstat(fileno(f), &st) != 0 || (*why = source_check_kind(&st, regular_only))) {
        if (!*why)
            *why = source_open_error(errno);
        fclose(f);
        return NULL;
    } else if (S_ISREG(st.st_mode))
        *size = (size_t)st.st_size;
    return f;
}

/* Reads f to its end, at most SOURCE_MAX_BYTES (pipes and files that grow
   have no size beforehand). Returns the bytes (caller frees) and their count,
   or NULL with *why set. */
static char *source_slurp(FILE *f, size_t hint, size_t *len, char **why)
{
    size_t cap = hint + 1 > 4096 ? hint + 1 : 4096, got;
    char *buf = xmalloc(cap);
    *len = 0;
    while ((got = fread(buf + *len, 1, cap - *len, f)) > 0) {
        *len += got;
        if (*len > SOURCE_MAX_BYTES) {
            *why = xasprintf("it has more than the limit of %u bytes (%u MiB) for a script", SOURCE_MAX_BYTES,
                             SOURCE_MAX_BYTES >> 20);
            break;
        }
        if (*len == cap) {
            cap = cap * 2 > SOURCE_MAX_BYTES + 1 ? SOURCE_MAX_BYTES + 1 : cap * 2;
            buf = xrealloc(buf, cap);
        }
    }
    if (!*why && ferror(f))
        *why = xstrdup(strerror(errno ? errno : EIO));
    if (*why) {
        free(buf);
        return NULL;
    }
    return buf;
}

source *source_read_script(const char *path, int regular_only, char **why)
{
    int is_stdin = strcmp(path, "-") == 0;
    size_t size = 0, len;
    *why = NULL;
    /* standard input may be a terminal or a pipe: only its length is capped */
    FILE *f = is_stdin ? stdin : source_open(path, regular_only, &size, why);
    if (!f)
        return NULL;
    char *buf = source_slurp(f, size, &len, why);
    if (!is_stdin)
        fclose(f);
    if (!buf)
        return NULL;
    /* A UTF-8 byte-order mark, which some editors write first, is no part
       of the script: skipping it keeps the columns of line 1 right. */
    size_t skip = len >= 3 && memcmp(buf, "\xEF\xBB\xBF", 3) == 0 ? 3 : 0;
    source *s = source_new(is_stdin ? "<stdin>" : path, buf + skip, len - skip);
    free(buf);
    return s;
}

long source_open_brackets(const char *text, size_t len, long open)
{
    int in_string = 0;
    for (size_t i = 0; i < len; i++) {
        char c = text[i];
        if (c == '\n') {
            in_string = 0;   /* strings end on their line */
        } else if (in_string) {
            if (c == '\\' && i + 1 < len && text[i + 1] != '\n')
                i++;
            else if (c == '"')
                in_string = 0;
        } else if (c == '#') {
            while (i + 1 < len && text[i + 1] != '\n')
                i++;
        } else if (c == '"') {
            in_string = 1;
        } else if (c == '(' || c == '[' || c == '{') {
            open++;
        } else if ((c == ')' || c == ']' || c == '}') && open > 0) {
            open--;
        }
    }
    return open;
}

int source_find_bare_cr(const source *s, srcloc *at)
{
    const char *p = s->len ? memchr(s->text, '\r', s->len) : NULL;
    for (; p; p = memchr(p + 1, '\r', s->len - (size_t)(p + 1 - s->text))) {
        size_t off = (size_t)(p - s->text);
        if (off + 1 == s->len || p[1] == '\n')
            continue;   /* \r\n, or a last line cut before its \n */
        int line = 1;   /* the line holding off: binary search of line_starts */
        for (int lo = 0, hi = s->nlines - 1; lo <= hi;) {
            int mid = (lo + hi) / 2;
            if (s->line_starts[mid] <= off) {
                line = mid + 1;
                lo = mid + 1;
            } else {
                hi = mid - 1;
            }
        }
        at->src = s;
        at->first_line = at->last_line = line;
        at->first_column = (int)(off - s->line_starts[line - 1]) + 1;
        at->last_column = at->first_column + 1;
        return 1;
    }
    return 0;
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
    while (from > 0 && ((unsigned char)line[from] & 0xC0) == 0x80)
        from--;   /* the window holds whole UTF-8 characters */
    while (to < len && ((unsigned char)line[to] & 0xC0) == 0x80)
        to++;
    fprintf(out, "%5d | %s", loc->first_line, from > 0 ? "..." : "");
    print_visible(out, line + from, to - from);
    fprintf(out, "%s\n      | %s", to < len ? "..." : "", from > 0 ? "   " : "");
    size_t c0 = loc->first_column > 0 ? (size_t)loc->first_column - 1 : 0;
    size_t c1 = loc->last_line == loc->first_line && loc->last_column > loc->first_column
                    ? (size_t)loc->last_column - 1 : c0 + 1;
    /* columns count bytes; the caret line counts characters, so the bytes
       that continue a UTF-8 character (10xxxxxx) take no place of their own */
    for (size_t i = from; i < c0 && i < to; i++)
        if (((unsigned char)line[i] & 0xC0) != 0x80)
            fputc(line[i] == '\t' ? '\t' : ' ', out);
    fputc('^', out);
    for (size_t i = c0 + 1; i < c1 && i < to; i++)
        if (((unsigned char)line[i] & 0xC0) != 0x80)
            fputc('~', out);
    fputc('\n', out);
}
