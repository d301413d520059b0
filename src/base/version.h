/* version.h - the release number, shown by --version and in every output. */
#ifndef SR_VERSION_H
#define SR_VERSION_H
#include "sinkrate/base.h"
#define SR_VERSION SR_VERSION_STRING
#endif
