/* test_source.c - unit tests for reading scripts (source_read_script in src/syntax/source.h).
 *
 * The size cap is checked here rather than in tests/hostile because a script over the cap would
 * be a 16 MiB file in the repository: the test makes a sparse file of that length (no disk used)
 * and a pipe that never ends. The kinds of file (folder, device) have hostile cases too
 * (file_load_*, file_arg_*); here they are checked without the interpreter, with a loop of
 * symbolic links, the search for a bare carriage return and the bracket count of the session.
 */
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include "source.h"
#include "unit.h"

static unit_report rep;
static char dir[] = "/tmp/pk-test-source-XXXXXX";

/* Reads path and checks that it is refused with exactly `want`. */
static void check_refused(const char *path, int regular_only, const char *want)
{
    char *why = NULL;
    source *s = source_read_script(path, regular_only, &why);
    UNIT_CHECK(&rep, s == NULL && why && strcmp(why, want) == 0, "%s: got '%s', want '%s'", path,
               why ? why : "(read)", want);
    source_free(s);
    free(why);
}

/* A sparse file one byte over the cap is refused from its size, unread. */
static void test_size_cap(void)
{
    char path[512];
    snprintf(path, sizeof path, "%s/big.pk", dir);
    FILE *f = fopen(path, "wb");
    int made = f && ftruncate(fileno(f), (off_t)SOURCE_MAX_BYTES + 1) == 0;
    if (f)
        fclose(f);
    UNIT_CHECK(&rep, made, "could not make %s", path);
    check_refused(path, 1, "it has 16777217 bytes, more than the limit of 16777216 bytes (16 MiB) for a script");
    remove(path);
}

/* A script of exactly the cap is read, and a leading byte-order mark is dropped. */
static void test_at_cap_and_bom(void)
{
    char path[512];
    snprintf(path, sizeof path, "%s/bom.pk", dir);
    FILE *f = fopen(path, "wb");
    if (f) {
        fputs("\xEF\xBB\xBFprint 1\n", f);
        fclose(f);
    }
    char *why = NULL;
    source *s = source_read_script(path, 1, &why);
    UNIT_CHECK(&rep, s && s->len == 8 && memcmp(s->text, "print 1\n", 8) == 0, "BOM not skipped (%s)",
               why ? why : "read");
    source_free(s);
    free(why);
    f = fopen(path, "wb");
    int made = f && ftruncate(fileno(f), (off_t)SOURCE_MAX_BYTES) == 0;
    if (f)
        fclose(f);
    why = NULL;
    s = made ? source_read_script(path, 1, &why) : NULL;
    UNIT_CHECK(&rep, s && s->len == SOURCE_MAX_BYTES, "a script of exactly the cap was refused (%s)",
               why ? why : "not made");
    source_free(s);
    free(why);
    remove(path);
}

/* A pipe has no size beforehand: reading stops one byte past the cap. */
static void test_endless_pipe(void)
{
    int fd[2];
    if (pipe(fd) != 0) {
        UNIT_CHECK(&rep, 0, "pipe failed");
        return;
    }
    pid_t child = fork();
    if (child == 0) {
        close(fd[0]);
        char buf[65536];
        memset(buf, ' ', sizeof buf);
        while (write(fd[1], buf, sizeof buf) > 0)
            ;
        _exit(0);
    }
    close(fd[1]);
    char path[64];
    snprintf(path, sizeof path, "/dev/fd/%d", fd[0]);
    check_refused(path, 0, "it has more than the limit of 16777216 bytes (16 MiB) for a script");
    check_refused(path, 1, "it is not a regular file (a pipe or a socket)");
    close(fd[0]);
    kill(child, SIGTERM);
    waitpid(child, NULL, 0);
}

static void test_kinds(void)
{
    check_refused(dir, 1, "it is a folder, not a script file");
    check_refused(dir, 0, "it is a folder, not a script file");
    check_refused("/dev/null", 0, "it is a device, not a script file");
    char path[512];
    snprintf(path, sizeof path, "%s/none.pk", dir);
    check_refused(path, 1, "No such file or directory");
}

/* A symbolic-link loop is refused in words, not with the C library's phrase. */
static void test_symlink_loop(void)
{
    char a[512], b[512];
    snprintf(a, sizeof a, "%s/loop_a.pk", dir);
    snprintf(b, sizeof b, "%s/loop_b.pk", dir);
    if (symlink(b, a) != 0 || symlink(a, b) != 0) {
        UNIT_CHECK(&rep, 0, "could not make the symbolic links %s, %s", a, b);
        return;
    }
    check_refused(a, 0, "it is a loop of symbolic links");
    unlink(a);
    unlink(b);
}

/* Checks source_find_bare_cr on text: found (1/0) and, if found, line:column. */
static void check_bare_cr(const char *text, int found, int line, int column)
{
    source *s = source_new("t", text, strlen(text));
    srcloc at = {0};
    int got = source_find_bare_cr(s, &at);
    UNIT_CHECK(&rep, got == found && (!found || (at.first_line == line && at.first_column == column)),
               "bare CR in %d bytes: got %d at %d:%d, want %d at %d:%d", (int)strlen(text), got, at.first_line,
               at.first_column, found, line, column);
    source_free(s);
}

/* A carriage return is an error only when it does not end a line (CRLF) or the text. */
static void test_bare_cr(void)
{
    check_bare_cr("print 1\r\nprint 2\r\n", 0, 0, 0);
    check_bare_cr("print 1\nprint 2\r", 0, 0, 0);
    check_bare_cr("print 1\nprint 2\rprint 3\n", 1, 2, 8);
    check_bare_cr("\r\r\n", 1, 1, 1);
    check_bare_cr("a\nb\nc\nd\r\ne\rf", 1, 5, 2);
}

/* Open brackets counted across pieces, skipping strings and comments. */
static void test_open_brackets(void)
{
    static const struct {
        const char *text;
        long start, want;
    } cases[] = {
        {"f(1,", 0, 1},
        {"  2)", 1, 0},
        {"for i in 1..3 { print \"{[(\"", 0, 1},
        {"x # ( [ {", 0, 0},
        {"print \"a\\\"(\" , [", 0, 1},
        {")))", 0, 0},
        {"[1, (2", 2, 4},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        long got = source_open_brackets(cases[i].text, strlen(cases[i].text), cases[i].start);
        UNIT_CHECK(&rep, got == cases[i].want, "open brackets after '%s' from %ld: got %ld, want %ld",
                   cases[i].text, cases[i].start, got, cases[i].want);
    }
}

int main(void)
{
    if (!mkdtemp(dir)) {
        perror("mkdtemp");
        return 1;
    }
    test_size_cap();
    test_at_cap_and_bom();
    test_endless_pipe();
    test_kinds();
    test_symlink_loop();
    test_bare_cr();
    test_open_brackets();
    rmdir(dir);
    return unit_finish("test_source", &rep);
}
