/* version.c - the release number of the library a program runs with. */
#include "base/version.h"

const char *sr_version(void)
{
    return SR_VERSION;
}
