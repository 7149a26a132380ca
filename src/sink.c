#include "sink.h"

#include <errno.h>
#include <stdlib.h>
#include <unistd.h>

#include "cancel.h"

int sink_init(sink *k, int fd)
{
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

/* Writes len bytes to fd, resuming after interrupts and short writes.
   Terminating signals wait until the last byte is out. Returns 0 or errno. */
static int sink_write_all(int fd, const char *p, size_t len)
{
    int err = 0;
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
    }
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
