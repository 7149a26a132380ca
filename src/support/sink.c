#include "sink.h"

#include <errno.h>
#include <fcntl.h>
#include <stdlib.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cancel.h"

/* A closed standard descriptor would be reused by the next file opened (a
   picture, a script), and records meant for the output would land in it:
   /dev/null holds its place. Returns 0 when fd was closed. */
static int sink_guard_fd(int fd)
{
    if (fcntl(fd, F_GETFD) != -1 || errno != EBADF)
        return 1;
    int null = open("/dev/null", O_RDWR);
    if (null >= 0 && null != fd) {
        dup2(null, fd);
        close(null);
    }
    return 0;
}

int sink_init(sink *k, int fd)
{
    if (fd == STDOUT_FILENO) {
        sink_guard_fd(STDIN_FILENO);
        sink_guard_fd(STDERR_FILENO);
        /* writing to a closed output is an error, reported at the first record */
        if (!sink_guard_fd(fd))
            fd = -1;
    }
    k->fd = fd;
    k->buf = NULL;
    k->len = 0;
    k->err = 0;
    k->rec = open_memstream(&k->buf, &k->len);
    if (!k->rec)
        k->err = ENOMEM;
    return k->rec != NULL;
}

void sink_clear(sink *k)
{
    if (k->rec)
        fclose(k->rec);
    free(k->buf);
    k->rec = NULL;
    k->buf = NULL;
    k->len = 0;
}

FILE *sink_stream(sink *k)
{
    return k->rec;
}

/* Empties the record; the memory stream's size follows its position. */
static void sink_rewind(sink *k)
{
    if (k->rec) {
        rewind(k->rec);
        fflush(k->rec);
    }
}

/* Where a record starts in a regular file, -1 for anything else (a pipe or
   terminal cannot take back what it was given). */
static off_t sink_record_start(int fd)
{
    struct stat sb;
    if (fstat(fd, &sb) != 0 || !S_ISREG(sb.st_mode))
        return -1;
    return lseek(fd, 0, SEEK_CUR);
}

/* After a failed write into a regular file, cuts off the part of the record
   that did get in (a full disk or a file-size limit stops a write half-way),
   unless something else has written to the file since. */
static void sink_take_back(int fd, off_t start, size_t done)
{
    struct stat sb;
    if (start < 0 || done == 0 || fstat(fd, &sb) != 0 || sb.st_size != start + (off_t)done)
        return;
    if (ftruncate(fd, start) == 0)
        lseek(fd, start, SEEK_SET);
}

/* Writes len bytes to fd, resuming after interrupts and short writes.
   Terminating signals wait until the last byte is out. Returns 0 or errno. */
static int sink_write_all(int fd, const char *p, size_t len)
{
    int err = 0;
    size_t done = 0;
    off_t start = sink_record_start(fd);
    cancel_writing = 1;
    while (len > 0) {
        ssize_t w = write(fd, p, len);
        if (w < 0 && errno == EINTR)
            continue;
        if (w <= 0) {
            err = w < 0 ? errno : EIO;
            break;
        }
        p += w;
        len -= (size_t)w;
        done += (size_t)w;
    }
    if (err)
        sink_take_back(fd, start, done);
    cancel_writing = 0;
    cancel_after_write();
    return err;
}

int sink_commit(sink *k)
{
    if (!k->rec)
        return 0;
    if (fflush(k->rec) != 0 && !k->err)
        k->err = ENOMEM;
    if (k->len > 0 && !k->err) {
        /* text the interactive session printed through stdio comes first */
        if (fflush(stdout) != 0)
            k->err = errno ? errno : EIO;
        else
            k->err = sink_write_all(k->fd, k->buf, k->len);
    }
    sink_rewind(k);
    return k->err == 0;
}

void sink_discard(sink *k)
{
    sink_rewind(k);
}

int sink_finish(sink *k)
{
    int ok = sink_commit(k);
    if (ok && (fflush(stdout) != 0 || ferror(stdout))) {
        k->err = errno ? errno : EIO;
        ok = 0;
    }
    /* errors of delayed writes (network file systems) show up at close */
    if (k->fd >= 0 && close(k->fd) != 0 && ok) {
        k->err = errno;
        ok = 0;
    }
    k->fd = -1;
    return ok;
}
