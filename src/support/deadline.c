#include "deadline.h"

#include <time.h>

static double deadline_end;   /* CLOCK_MONOTONIC seconds; 0: no deadline */

static double deadline_now(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

void deadline_start(double seconds)
{
    deadline_end = seconds > 0 ? deadline_now() + seconds : 0;
}

double deadline_left(void)
{
    if (deadline_end <= 0)
        return -1;
    double left = deadline_end - deadline_now();
    return left > 0 ? left : 0;
}

int deadline_cap_ms(int cap_ms)
{
    if (deadline_end <= 0)
        return cap_ms;
    double left = (deadline_end - deadline_now()) * 1000.0;
    if (left <= 0)
        return 0;
    return left < cap_ms ? (int)left + 1 : cap_ms;
}
