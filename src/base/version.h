/* version.h - the release number, shown by --version and in every output. */
#ifndef SR_VERSION_H
#define SR_VERSION_H
#define SR_VERSION "0.1.0"
#endif
