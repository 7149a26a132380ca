/* Source text and locations: byte offsets to line:column, and caret rendering
   for diagnostics. */
#ifndef PSIKAPPA_SOURCE_H
#define PSIKAPPA_SOURCE_H

#include <stddef.h>
#include <stdio.h>

typedef struct source {
    char *name;          /* display name: a path, or "<-e>" for command-line code */
    char *text;          /* the contents, NUL-terminated (embedded NULs are kept in len) */
    size_t len;
    size_t *line_starts; /* byte offset of the start of each line, 0-based */
    int nlines;
} source;

/* A span of source text; lines and columns are 1-based, columns count bytes.
   The field names are the ones Bison's location machinery expects. */
typedef struct srcloc {
    const source *src;
    int first_line, first_column;
    int last_line, last_column;
} srcloc;

/* Copies name and text into a new source; the caller owns the result
   and frees it with source_free. */
source *source_new(const char *name, const char *text, size_t len);
void source_free(source *s);

/* Scripts longer than this are refused before they are read. */
#define SOURCE_MAX_BYTES (16u << 20)

/* Reads a whole script (or stdin for "-") into a new source, refusing
   folders, devices, files over SOURCE_MAX_BYTES and, with regular_only,
   pipes and sockets. The caller owns the result; on failure NULL, with *why
   the reason (a clause such as "it is a folder, ...") that the caller frees. */
source *source_read_script(const char *path, int regular_only, char **why);

/* Brackets ( [ { still open after text[0..len), starting from `open`: strings
   (which end on their line) and comments are skipped, an unmatched closing
   bracket is left for the parser to report. One pass, so that callers that
   feed text piece by piece (the interactive session) stay linear. */
long source_open_brackets(const char *text, size_t len, long open);

/* Finds the first carriage return that is not part of a \r\n line end (a
   bare \r, which some old editors write as a line end and terminals show as
   a return to the start of the line: two lines would silently become one).
   Returns 1 and sets *at to its location, else 0. */
int source_find_bare_cr(const source *s, srcloc *at);

/* Points *start at line `line` (1-based) and returns its length without the
   newline; returns 0 with *start = "" when the line does not exist. */
size_t source_line(const source *s, int line, const char **start);

/* Prints the line of loc and a caret line under the span (clang style). */
void source_print_caret(FILE *out, const srcloc *loc);

#endif
