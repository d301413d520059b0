/* test_badinput.c - the bad-input catalogue: every row is a command line, the
 * files it reads, and what its one error line must say. Each must exit 2,
 * print exactly one line on stderr naming the file:line:column or the
 * option, print nothing on stdout, and leave no file behind (every row runs
 * with -o into an empty directory that must stay empty; rows with --plot or
 * --samples aim them there too, and nothing of the input directory may be
 * added either).
 *
 * Adding a row: give the arguments (placeholders below), the content of the
 * input files if any, the location the line must name and a phrase it must
 * hold. New commands append rows at the end of BAD; `SR_BADINPUT_SHOW=1
 * build/tests/test_badinput` prints every row's error line for review. */
#define _DEFAULT_SOURCE
#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli/commands.h"
#include "testutil.h"

/* Placeholders in args, where and file contents:
 *   @IN@    the first input file (content `in`; absent when in is NULL)
 *   @IN2@   a second input file next to it (content `in2`), named "second";
 *           also written as "second.yaml" for readers that go by the name
 *   @DIR@   an existing directory holding the inputs
 *   @OUT@   the output directory, which must stay empty
 *   @DATA@  a data directory whose canopies/ holds @IN@ as its only family
 * Unless a row gives -o itself, "-o @OUT@/result" is appended -- except for
 * `check`, whose report on the files it checked is its product even when a
 * file is invalid: check rows run without -o and may print that report. */
typedef enum gen {
    GEN_NONE = 0,
    GEN_BIG,        /* @IN@ is 1.5 MiB of valid-looking YAML */
    GEN_BINARY,     /* @IN@ is 256 bytes 0..255 */
    GEN_DEEP_BLOCK, /* @IN@ nests 40 block mappings */
    GEN_LAUGHS,     /* @IN@ multiplies one list through 9 levels of aliases */
    GEN_LONG_NUMBER, /* @IN@ is a mission whose mass has 300 digits */
    GEN_BINARY2,     /* @IN2@ is 256 bytes 0..255 (and @IN@ is `in`) */
    GEN_ANCHORS      /* @IN@ defines 58 000 anchors and uses each (0.9 MB) */
} gen;

typedef struct bad_case {
    const char *args[16];
    const char *in, *in2;
    gen gen;
    const char *where;  /* "@IN@:3:7" or "--mass": the location the line names */
    const char *expect; /* a phrase the line holds */
} bad_case;

/* A valid mission to vary: line 4 holds the section, 6-8 the stage. */
#define MISSION_HEAD "mission: m\nsite: {elevation: 100 m}\nsections:\n"
#define SECTION "  - {name: a, mass: 2 kg}\n"
#define STAGES "stages:\n  - name: main\n    family: conical\n    nominal-diameter: 1.5 m\n"
#define MISSION MISSION_HEAD SECTION STAGES
/* A valid family file to vary: id on line 1, class on 3, drag on 4. */
#define FAM_CD "drag-coefficient: {reference: nominal, low: 0.7, high: 0.8, source: s}\n"
#define FAM_REST                                                                                              \
    "projected-ratio: {low: 0.6, high: 0.7, source: s}\n"                                                     \
    "constructed-ratio: {low: 0.9, high: 1.0, source: s}\n"                                                   \
    "opening-factor: {low: 1.5, high: 1.8, source: s}\n"                                                      \
    "filling-constant: {value: 8, source: s}\n"                                                               \
    "oscillation: {low: 5 deg, high: 20 deg, source: s}\n"                                                    \
    "mach-limit: {value: 0.5, source: s}\n"
#define FAM_HEAD "id: test\nname: \"Test\"\nclass: solid\n"
#define FAM_BODY "name: \"Test\"\nclass: solid\n" FAM_CD FAM_REST
#define FAMILY FAM_HEAD FAM_CD FAM_REST
#define SOUNDING_HEAD "altitude [m],temperature [C],pressure [hPa]\n"

/* fit: flight logs */
#define LOGH "time [s],height [m]\n"
#define L20 "2,480\n3,470\n4,460\n5,450\n6,440\n7,430\n8,420\n9,410\n10,400\n11,390\n12,380\n13,370\n14,360\n15,350\n16,340\n17,330\n18,320\n19,310\n20,300\n21,290\n"
#define FIT "fit", "@IN@", "--mass", "2 kg"

/* Common command lines. */
#define SIZE_MISSION "size", "--mission", "@IN@", "--speed", "5 m/s"
#define RATE_MISSION "rate", "--mission", "@IN@"
#define RATE_CANOPY "rate", "--mass", "2 kg", "--canopy", "@IN@"
#define SIZE_OK "size", "--mass", "2 kg", "--speed", "5 m/s", "--family", "conical"
#define RATE_OK "rate", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "1.5 m"
#define AIR_SOUNDING "air", "--sounding", "@IN@"
#define CHECK "check", "@IN@"
/* the commands that came later */
#define START "start: {height: 1000 m}\n"
#define PMISSION MISSION START /* a mission profile and dispersion can run: line 9 is the start */
#define WIND_TABLE_MISSION "mission: m\nsite: {wind: {model: table, file: second}}\nsections:\n" SECTION STAGES START
#define CD_HEAD "Re,Cd\n"
#define SWEEP_OK "sweep", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "1.5 m"
#define PROFILE "profile", "@IN@"
#define LOADS_CANOPY "loads", "--mass", "5 kg", "--family", "conical", "--nominal-diameter", "1.5 m"
#define FREEFALL "freefall", "--mass", "1 kg", "--diameter", "10 cm"
#define DISPERSION "dispersion", "@IN@"
#define DESIGN "design", "@IN@"
/* a mission whose main deploys at a height (line 9), for the design's height ranges */
#define HMISSION MISSION_HEAD SECTION                                                                         \
    "stages:\n  - {name: drogue, family: cross, nominal-diameter: 0.5 m}\n"                                 \
    "  - {name: main, family: conical, nominal-diameter: 1.5 m, deploy: {height: 200 m}}\n" START
/* a mission that can run, with this inside its site block (line 2, from column 8) */
#define GEO_SITE(keys) "mission: m\nsite: {" keys "}\nsections:\n" SECTION STAGES START

static const bad_case BAD[] = {
    /* ---- options: values and units ---- */
    {{"size", "--mass", "-2 kg", "--speed", "5 m/s", "--family", "conical"}, NULL, NULL, 0, "--mass",
     "greater than zero"},
    {{"size", "--mass", "0", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass", "greater than zero"},
    {{"size", "--mass", "nan", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass", "not a number"},
    {{"size", "--mass", "inf kg", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass", "not a number"},
    {{"size", "--mass", "2 stone", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass",
     "unknown mass unit 'stone'"},
    {{"size", "--mass", "2 m", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass",
     "unknown mass unit 'm'"},
    {{"size", "--mass", "1e400 kg", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass",
     "out of the range"},
    {{"size", "--mass", "1e6 kg", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass",
     "beyond any payload"},
    {{"size", "--mass", "0x10", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass", "hexadecimal"},
    {{"size", "--mass", "2,5 kg", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass",
     "decimals with a point (2.5...)"},
    {{"size", "--mass", "", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass", "empty mass"},
    {{"size", "--mass", "2 kg", "--speed", "0 m/s", "--family", "conical"}, NULL, NULL, 0, "--speed",
     "greater than zero"},
    {{"size", "--mass", "2 kg", "--speed", "400 m/s", "--family", "conical"}, NULL, NULL, 0, "--speed",
     "not a descent speed"},
    {{"size", "--mass", "2 kg", "--speed", "5 kg", "--family", "conical"}, NULL, NULL, 0, "--speed",
     "unknown speed unit 'kg'"},
    {{"size", "--mass", "2 kg", "--family", "conical"}, NULL, NULL, 0, "--speed", "required"},
    {{"size", "--speed", "5", "--family", "conical"}, NULL, NULL, 0, "--mass", "required"},
    {{"size", "--mass", "2 kg", "--speed", "5", "--family", "conicle"}, NULL, NULL, 0, "--family",
     "did you mean 'conical'"},
    {{"size", "--mass", "2 kg", "--speed", "5", "--family", ""}, NULL, NULL, 0, "--family",
     "unknown canopy family"},
    {{"size", "--mass", "2 kg", "--speed", "5"}, NULL, NULL, 0, "--family", "required"},
    {{SIZE_OK, "--altitude", "90 km"}, NULL, NULL, 0, "--altitude", "outside"},
    {{SIZE_OK, "--altitude", "-2 km"}, NULL, NULL, 0, "--altitude", "outside"},
    {{SIZE_OK, "--body-drag-area", "-1 m2"}, NULL, NULL, 0, "--body-drag-area", "positive"},
    {{SIZE_OK, "--body-drag-area", "1 m"}, NULL, NULL, 0, "--body-drag-area", "unknown area unit 'm'"},
    {{"size", "--mass", "2 kg", "--speed", "5", "--familly", "conical"}, NULL, NULL, 0, "--familly",
     "did you mean '--family'"},
    {{SIZE_OK, "--nominal-diameter", "1 m"}, NULL, NULL, 0, "--nominal-diameter", "size finds the canopy size"},
    {{SIZE_OK, "--cluster", "0"}, NULL, NULL, 0, "--cluster", "whole number from 1 to 16"},
    {{SIZE_OK, "--cluster", "17"}, NULL, NULL, 0, "--cluster", "whole number from 1 to 16"},
    {{SIZE_OK, "--cluster", "2.5"}, NULL, NULL, 0, "--cluster", "whole number"},
    {{SIZE_OK, "--cluster", "99999999999999999999999"}, NULL, NULL, 0, "--cluster", "whole number"},
    {{SIZE_OK, "--cluster", "3", "--cluster-factor", "1.5"}, NULL, NULL, 0, "--cluster-factor", "outside 0.5 .. 1"},
    {{SIZE_OK, "--areal-mass", "5 kg/m2"}, NULL, NULL, 0, "--areal-mass", "heavier than any canopy cloth"},
    {{SIZE_OK, "--areal-mass", "40 g"}, NULL, NULL, 0, "--areal-mass", "unknown areal mass unit 'g'"},
    {{SIZE_OK, "--temp-offset", "15 C", "--surface-temp", "30 C"}, NULL, NULL, 0, "--temp-offset", "not both"},
    {{SIZE_OK, "--temp-offset", "200 K"}, NULL, NULL, 0, "--temp-offset", "outside -100 K .. +100 K"},
    {{SIZE_OK, "--surface-temp", "-300 C"}, NULL, NULL, 0, "--surface-temp", "below absolute zero"},
    {{SIZE_OK, "--surface-temp", "90 C"}, NULL, NULL, 0, "--surface-temp", "outside 173.15 K .. 343.15 K"},
    {{SIZE_OK, "--surface-pressure", "0 hPa"}, NULL, NULL, 0, "--surface-pressure", "greater than zero"},
    {{SIZE_OK, "--surface-pressure", "5000 hPa"}, NULL, NULL, 0, "--surface-pressure", "implausible"},
    {{SIZE_OK, "--site-elevation", "100 km"}, NULL, NULL, 0, "--site-elevation", "outside"},
    {{SIZE_OK, "--format", "xml"}, NULL, NULL, 0, "--format", "not one of text, csv, json"},
    {{SIZE_OK, "--units", "imperial"}, NULL, NULL, 0, "--units", "not one of si, us"},
    {{SIZE_OK, "--threads", "2"}, NULL, NULL, 0, "--threads", "unknown option"},
    {{SIZE_OK, "extra"}, NULL, NULL, 0, "'extra'", "unexpected argument"},
    {{"size", "-o", "@OUT@/result", "--mass", "2 kg", "--family", "conical", "--speed"}, NULL, NULL, 0, "--speed",
     "needs a value"},
    {{SIZE_OK, "-x"}, NULL, NULL, 0, "-x", "unknown option"},

    /* ---- rate: the canopy options ---- */
    {{"rate", "--mass", "2 kg", "--family", "conical"}, NULL, NULL, 0, "--nominal-diameter", "needs a size"},
    {{RATE_OK, "--projected-diameter", "1 m"}, NULL, NULL, 0, "--projected-diameter", "one size only"},
    {{RATE_OK, "--drag-coefficient", "1.5"}, NULL, NULL, 0, "--drag-reference", "go together"},
    {{RATE_OK, "--drag-coefficient", "1.5", "--drag-reference", "sideways"}, NULL, NULL, 0, "--drag-reference",
     "not one of nominal, projected, constructed"},
    {{RATE_OK, "--drag-coefficient", "-1", "--drag-reference", "nominal"}, NULL, NULL, 0, "--drag-coefficient",
     "greater than zero"},
    {{RATE_OK, "--drag-coefficient", "50", "--drag-reference", "nominal"}, NULL, NULL, 0, "--drag-coefficient",
     "outside 0 .. 3"},
    {{RATE_OK, "--drag-coefficient", "1.2 m", "--drag-reference", "nominal"}, NULL, NULL, 0, "--drag-coefficient",
     "takes no unit"},
    {{"rate", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "-1 m"}, NULL, NULL, 0,
     "--nominal-diameter", "greater than zero"},
    {{"rate", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "1000 m"}, NULL, NULL, 0,
     "--nominal-diameter", "beyond any canopy built"},
    {{"rate", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "1 mm"}, NULL, NULL, 0,
     "--nominal-diameter", "below any canopy built"},
    {{"rate", "--mass", "2 kg", "--family", "conical", "--nominal-area", "1e-9 m2"}, NULL, NULL, 0,
     "--nominal-area", "below any canopy built"},
    {{"rate", "--mass", "2 kg", "--family", "conical", "--flat-diameter", "3 kg"}, NULL, NULL, 0, "--flat-diameter",
     "unknown length unit 'kg'"},
    {{RATE_OK, "--altitude", "1 km,,x"}, NULL, NULL, 0, "--altitude", "'x' is not a number"},
    {{RATE_OK, "--altitude", "100 km"}, NULL, NULL, 0, "--altitude", "outside"},
    {{RATE_OK, "--altitude", ",,"}, NULL, NULL, 0, "--altitude", "empty list"},
    {{"rate", "--mass", "2 kg", "--canopy", "@IN@", "--family", "conical"}, "canopy: {family: conical}\n", NULL, 0,
     "--canopy", "drop the --family"},
    {{RATE_CANOPY}, NULL, NULL, 0, "--canopy: @IN@", "cannot open"},
    {{RATE_MISSION}, NULL, NULL, 0, "--mission: @IN@", "cannot open"},
    {{RATE_MISSION}, MISSION_HEAD SECTION "stages:\n  - name: main\n    family: conical\n", NULL, 0, "--mission",
     "stage 'main' has no size"},
    {{"rate", "--family", "conical", "--nominal-diameter", "1 m"}, NULL, NULL, 0, "--mass", "required"},

    /* ---- air ---- */
    {{"air", "--from", "0", "--to", "10km", "--step", "0"}, NULL, NULL, 0, "--step", "never gets"},
    {{"air", "--from", "0", "--to", "10km", "--step", "-1 km"}, NULL, NULL, 0, "--step", "never gets"},
    {{"air", "--from", "0", "--to", "86km", "--step", "1 m"}, NULL, NULL, 0, "--step", "more than 10000"},
    {{"air", "--from", "0", "--to", "90 km"}, NULL, NULL, 0, "--from/--to", "outside"},
    {{"air", "--altitude", "87 km"}, NULL, NULL, 0, "--altitude", "outside"},
    {{"air", "--altitude", "1 km", "--from", "0"}, NULL, NULL, 0, "--altitude", "not both"},
    {{"air", "--sounding", "@IN@", "--temp-offset", "10 C"}, SOUNDING_HEAD "0,15,1013\n1000,8,900\n", NULL, 0,
     "--sounding", "not both"},
    {{"air", "5"}, NULL, NULL, 0, "'5'", "unexpected argument"},

    /* ---- canopies, data directory, commands ---- */
    {{"canopies", "parasol"}, NULL, NULL, 0, "'parasol'", "unknown canopy family"},
    {{"canopies", "conical", "cross"}, NULL, NULL, 0, "canopies", "at most one family id"},
    {{"canopies", "--models", "conical"}, NULL, NULL, 0, "--models", "give no family id"},
    {{"canopies", "--data", "@DIR@"}, NULL, NULL, 0, "--data", "holds no canopies/"},
    {{"canopies", "--data", "@DATA@"}, "id: test\nname: \"Test\"\nclass: round\n" FAM_CD FAM_REST, NULL, 0, "@IN@:3:8",
     "class must be 'solid' or 'slotted'"},
    {{"canopies", "--data", "@DATA@"}, "id: Test Family\n" FAM_BODY, NULL, 0, "@IN@:1:5", "kebab-case"},
    {{"frobnicate"}, NULL, NULL, 0, "'frobnicate'", "unknown command"},
    {{"sizee"}, NULL, NULL, 0, "'sizee'", "did you mean 'size'"},
    {{"check"}, NULL, NULL, 0, "check", "one or more files"},

    /* ---- output paths: nothing written, nothing left ---- */
    {{"air", "-o", "@OUT@/no/such/dir/air.txt"}, NULL, NULL, 0, "-o: @OUT@/no/such/dir/air.txt", "cannot write"},
    {{"air", "-o", "@OUT@"}, NULL, NULL, 0, "-o: @OUT@", "is a directory"},
    {{"air", "-o", "@OUT@/"}, NULL, NULL, 0, "-o: @OUT@/", "directory name"},
    {{"air", "-o", ""}, NULL, NULL, 0, "-o", "empty output file name"},
    {{"air", "-o", "/proc/sinkrate-bad-input.txt"}, NULL, NULL, 0, "-o: /proc/sinkrate-bad-input.txt",
     "cannot write"},
    {{SIZE_OK, "--output", "@OUT@/missing/size.json", "--format", "json"}, NULL, NULL, 0,
     "-o: @OUT@/missing/size.json", "cannot write"},

    /* ---- YAML: malformed ---- */
    {{SIZE_MISSION}, "mission: x\nsections: [\n", NULL, 0, "@IN@:3:1", "malformed YAML"},
    {{CHECK}, "id: x\n\tname: y\n", NULL, 0, "@IN@:2:1", "a tab character: YAML indents with spaces"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n nominal-diameter: 1 m\n", NULL, 0, "@IN@:3:2", "malformed YAML"},
    {{SIZE_MISSION}, "mission: \"x\nsections: []\n", NULL, 0, "@IN@:3:1", "malformed YAML"},
    {{CHECK}, "canopy: {family: conical, nominal-diameter: 1 m\n", NULL, 0, "@IN@:2:1", "malformed YAML"},
    /* wrong types */
    {{SIZE_MISSION}, "mission: m\nsections: a\n" STAGES, NULL, 0, "@IN@:2:11", "sections must be a list"},
    {{SIZE_MISSION}, "mission: [m]\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:1:10", "expected a text value"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: [2, kg]}\n" STAGES, NULL, 0, "@IN@:4:21",
     "expected a mass with a unit here (e.g. \"1.5 kg\")"},
    {{SIZE_MISSION}, MISSION "    count: two\n", NULL, 0, "@IN@:9:12", "not a number"},
    {{CHECK}, FAM_HEAD "drag-coefficient: 0.8\n" FAM_REST, NULL, 0, "@IN@:4:19",
     "must be a mapping"},
    {{RATE_CANOPY}, "canopy: conical\n", NULL, 0, "@IN@:1:9", "canopy must be a mapping"},
    {{SIZE_MISSION}, "- mission\n- m\n", NULL, 0, "@IN@:1:1", "must be a mapping"},
    {{CHECK}, "- mission\n- m\n", NULL, 0, "@IN@:1:1", "not a sinkrate file"},
    {{SIZE_MISSION}, "mission: m\nsite: 100 m\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:7",
     "site must be a mapping"},
    {{SIZE_MISSION}, "mission: m\n? [a, b]\n: c\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:3",
     "keys must be plain words"},
    /* unknown keys, with a suggestion where one is close */
    {{SIZE_MISSION}, "mission: m\nsectons:\n" SECTION STAGES, NULL, 0, "@IN@:2:1", "did you mean 'sections'"},
    {{SIZE_MISSION}, "mission: m\nsite: {elevaton: 10 m}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:8",
     "did you mean 'elevation'"},
    {{SIZE_MISSION}, MISSION_HEAD SECTION "stages:\n  - name: main\n    family: conical\n    nominal-diamter: 1 m\n",
     NULL, 0, "@IN@:8:5", "did you mean 'nominal-diameter'"},
    {{CHECK}, "id: test\nname: \"Test\"\nclass: solid\ndrag-coeficient: {}\n", NULL, 0, "@IN@:4:1",
     "did you mean 'drag-coefficient'"},
    {{RATE_CANOPY}, "canopy:\n  famly: conical\n  nominal-diameter: 1 m\n", NULL, 0, "@IN@:2:3",
     "did you mean 'family'"},
    {{SIZE_MISSION}, MISSION "limits: {touchdown_speed: 5 m/s}\n", NULL, 0, "@IN@:9:10",
     "did you mean 'touchdown-speed'"},
    {{SIZE_MISSION}, MISSION "    deploy: {heigth: 300 m}\n", NULL, 0, "@IN@:9:14", "did you mean 'height'"},
    {{SIZE_MISSION}, MISSION "colour: red\n", NULL, 0, "@IN@:9:1", "unknown key 'colour'"},
    /* duplicate keys */
    {{SIZE_MISSION}, MISSION "mission: n\n", NULL, 0, "@IN@:9:1", "duplicate key 'mission'"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, name: b, mass: 2 kg}\n" STAGES, NULL, 0, "@IN@:4:15",
     "duplicate key 'name'"},
    {{CHECK}, FAMILY "id: other\n", NULL, 0, "@IN@:11:1", "duplicate key 'id'"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-diameter: 1 m\n  nominal-diameter: 2 m\n", NULL, 0,
     "@IN@:4:3", "duplicate key 'nominal-diameter'"},
    /* a unit is required in files */
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: 2}\n" STAGES, NULL, 0, "@IN@:4:21", "needs a unit"},
    {{SIZE_MISSION}, "mission: m\nsite: {elevation: 100}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:19",
     "needs a unit"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-diameter: 1.5\n", NULL, 0, "@IN@:3:21", "needs a unit"},
    {{SIZE_MISSION}, MISSION "start: {height: 3000}\n", NULL, 0, "@IN@:9:17", "needs a unit"},
    {{SIZE_MISSION}, MISSION "limits: {touchdown-speed: 6}\n", NULL, 0, "@IN@:9:27", "needs a unit"},
    {{CHECK}, "id: test\nname: \"Test\"\nclass: solid\n"
              "drag-coefficient: {reference: nominal, low: 0.7, high: 0.8, source: s}\n"
              "projected-ratio: {low: 0.6, high: 0.7, source: s}\n"
              "constructed-ratio: {low: 0.9, high: 1.0, source: s}\n"
              "opening-factor: {low: 1.5, high: 1.8, source: s}\n"
              "filling-constant: {value: 8, source: s}\n"
              "oscillation: {low: 5, high: 20 deg, source: s}\n"
              "mach-limit: {value: 0.5, source: s}\n",
     NULL, 0, "@IN@:9:20", "needs a unit"},
    /* unknown units */
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: 2 stone}\n" STAGES, NULL, 0, "@IN@:4:21",
     "unknown mass unit 'stone'"},
    {{SIZE_MISSION}, "mission: m\nsite: {elevation: 100 furlongs}\nsections:\n" SECTION STAGES, NULL, 0,
     "@IN@:2:19", "unknown length unit 'furlongs'"},
    {{SIZE_MISSION}, "mission: m\nsite: {temperature: 30 Celsius}\nsections:\n" SECTION STAGES, NULL, 0,
     "@IN@:2:21", "unknown temperature unit 'Celsius'"},
    {{SIZE_MISSION}, "mission: m\nsite: {pressure: 760 mmHg}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:18",
     "unknown pressure unit 'mmHg'"},
    /* NaN, inf, negative, zero where physical */
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: nan kg}\n" STAGES, NULL, 0, "@IN@:4:21", "not a number"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: .inf kg}\n" STAGES, NULL, 0, "@IN@:4:21", "not a number"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: -2 kg}\n" STAGES, NULL, 0, "@IN@:4:21", "above 0"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: 0 kg}\n" STAGES, NULL, 0, "@IN@:4:21", "above 0"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-diameter: 0 m\n", NULL, 0, "@IN@:3:21",
     "must be a positive number"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-diameter: -1 m\n", NULL, 0, "@IN@:3:21",
     "must be a positive number"},
    {{SIZE_MISSION}, MISSION "    count: 0\n", NULL, 0, "@IN@:9:12", "whole number from 1 to 16"},
    {{SIZE_MISSION}, MISSION "    count: 1.5\n", NULL, 0, "@IN@:9:12", "whole number from 1 to 16"},
    {{SIZE_MISSION}, MISSION "    count: 222222222222222222222222222222222220\n", NULL, 0, "@IN@:9:12",
     "whole number from 1 to 16"},
    {{SIZE_MISSION}, MISSION "    count: 2\n    cluster-factor: 0\n", NULL, 0, "@IN@:10:21", "outside 0.5 .. 1"},
    {{SIZE_MISSION}, "mission: m\nsite: {temperature: -300 C}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:21",
     "below absolute zero"},
    {{SIZE_MISSION}, "mission: m\nsite: {pressure: 0 hPa}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:18",
     "implausible"},
    /* the site model names the key it refuses (the error's key), so the place is the pressure's */
    {{SIZE_MISSION}, "mission: m\nsite: {temperature: 30 C, pressure: 100 hPa}\nsections:\n" SECTION STAGES, NULL, 0,
     "@IN@:2:37", "implausible"},
    {{SIZE_MISSION}, MISSION "start: {height: 1000 m, speed: -5 m/s}\n", NULL, 0, "@IN@:9:32",
     "between 0 and 2000 m/s"},
    {{SIZE_MISSION}, MISSION "    deploy: {height: 0 m}\n", NULL, 0, "@IN@:9:22", "above ground"},
    {{SIZE_MISSION}, MISSION "    deploy: {delay: -1 s}\n", NULL, 0, "@IN@:9:21", "between 0 s and 1 h"},
    {{SIZE_MISSION}, MISSION "limits: {touchdown-speed: 0 m/s}\n", NULL, 0, "@IN@:9:27", "must be positive"},
    /* outside the models' ranges */
    {{SIZE_MISSION}, "mission: m\nsite: {elevation: 90 km}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:19",
     "outside -1000 m .. 20000 m"},
    {{SIZE_MISSION}, MISSION "start: {height: 90 km}\n", NULL, 0, "@IN@:9:17", "within the atmosphere model"},
    {{SIZE_MISSION}, MISSION "start: {height: 1 km, path-angle: 120 deg}\n", NULL, 0, "@IN@:9:35",
     "within -90 deg .. 90 deg"},
    {{CHECK}, "id: test\nname: \"Test\"\nclass: solid\n"
              "drag-coefficient: {reference: nominal, low: 0.7, high: 5, source: s}\n" FAM_REST,
     NULL, 0, "@IN@:4:56", "plausible range"},
    {{CHECK}, "id: test\nname: \"Test\"\nclass: solid\n"
              "drag-coefficient: {reference: nominal, low: 0.9, high: 0.7, source: s}\n" FAM_REST,
     NULL, 0, "@IN@:4:19", "low <= typical <= high"},
    {{CHECK}, "id: test\nname: \"Test\"\nclass: solid\n"
              "drag-coefficient: {reference: projected, low: 0.7, high: 0.8, source: s}\n" FAM_REST,
     NULL, 0, "@IN@:4:31", "on nominal area"},
    {{CHECK}, "id: test\nname: \"Test\"\nclass: solid\n"
              "drag-coefficient: {reference: nominal, low: 0.7, high: 0.8}\n" FAM_REST,
     NULL, 0, "@IN@:4:19", "missing the required key 'source'"},
    {{SIZE_MISSION}, MISSION "  - {name: second, family: cross, nominal-diameter: 1 m, deploy: sometime}\n", NULL, 0,
     "@IN@:9:66", "deploy must be 'apogee'"},
    {{SIZE_MISSION}, MISSION "    deploy: {height: 300 m}\n  - {name: b, family: cross, nominal-diameter: 1 m, "
                             "deploy: {height: 500 m}}\n",
     NULL, 0, "@IN@:10:70", "not below the earlier stage"},
    {{SIZE_MISSION}, MISSION "    deploy: {height: 3000 m}\nstart: {height: 1000 m}\n", NULL, 0, "@IN@:9:22",
     "not below the start"},
    {{SIZE_MISSION}, MISSION "  - {name: b, family: cross, nominal-diameter: 1 m}\n", NULL, 0, "@IN@:9:5",
     "needs a deploy event"},
    /* absurd sizes */
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: 1e9 kg}\n" STAGES, NULL, 0, "@IN@:4:21",
     "at most 10000 kg"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-diameter: 1e6 m\n", NULL, 0, "@IN@:3:21",
     "beyond any canopy built"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-diameter: 1 um\n", NULL, 0, "@IN@:3:21",
     "unknown length unit 'um'"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-area: 0.5 cm2\n", NULL, 0, "@IN@:3:17",
     "below any canopy built"},
    {{SIZE_MISSION}, "mission: m\nsections: [{name: a, mass: 1 kg}, {name: b, mass: 1 kg}, {name: c, mass: 1 kg}, "
                     "{name: d, mass: 1 kg}, {name: e, mass: 1 kg}, {name: f, mass: 1 kg}, {name: g, mass: 1 kg}, "
                     "{name: h, mass: 1 kg}, {name: i, mass: 1 kg}]\n" STAGES,
     NULL, 0, "@IN@:2:11", "1 to 8 items"},
    {{SIZE_MISSION}, "mission: m\nsections: []\n" STAGES, NULL, 0, "@IN@:2:11", "1 to 8 items"},
    {{SIZE_MISSION}, "mission: " "mmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmm"
                     "mmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmm\nsections:\n" SECTION
                     STAGES,
     NULL, 0, "@IN@:1:10", "text longer than"},
    {{SIZE_MISSION}, MISSION_HEAD SECTION "  - {name: a, mass: 1 kg}\n" STAGES, NULL, 0, "@IN@:5:5",
     "two sections are named 'a'"},
    /* empty, binary, nested, huge */
    {{SIZE_MISSION}, "", NULL, 0, "@IN@:1:1", "the file is empty"},
    {{CHECK}, "# only a comment\n", NULL, 0, "@IN@:1:1", "no YAML document"},
    {{SIZE_MISSION}, NULL, NULL, GEN_BINARY, "@IN@:1:1", "binary data"},
    {{CHECK}, "id: \xff\xfe\x80\x81\n", NULL, 0, "@IN@:1:5", "malformed YAML"},
    {{CHECK}, "id: [[[[[[[[[[[[[[[[[[x]]]]]]]]]]]]]]]]]]\n", NULL, 0, "@IN@:1:20", "nested more than 16 levels"},
    {{SIZE_MISSION}, NULL, NULL, GEN_ANCHORS, "@IN@:1001:8", "more than 1000 anchors"},
    /* an anchored value is judged, and reported, where it is used */
    {{SIZE_MISSION}, "mission: m\nsite: {elevation: &e 100 m}\nsections:\n  - {name: a, mass: *e}\n" STAGES, NULL, 0,
     "@IN@:4:21", "unknown mass unit 'm'"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: *nope}\n" STAGES, NULL, 0, "@IN@:4:21",
     "the alias *nope names no anchor"},
    /* a NUL character written as a YAML escape, in a value and in a key */
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: \"2 kg\\0 garbage\"}\n" STAGES, NULL, 0, "@IN@:4:21",
     "a NUL character"},
    {{SIZE_MISSION}, "\"mission\\0junk\": m\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:1:1", "a NUL character"},
    {{SIZE_MISSION}, MISSION_HEAD SECTION "stages:\n  - name: main\n    family: \"conical\\0x\"\n"
     "    nominal-diameter: 1.5 m\n", NULL, 0, "@IN@:7:13", "a NUL character"},
    /* control characters in names: refused, never written to a report */
    {{SIZE_MISSION}, "mission: \"m\\e[31mred\"\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:1:10",
     "a control character (an escape (ESC), U+001B)"},
    {{SIZE_MISSION}, "mission: \"\\e]0;title\\a\"\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:1:10",
     "a control character"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: \"a\\nb\", mass: 2 kg}\n" STAGES, NULL, 0, "@IN@:4:12",
     "a control character (a line break, U+000A)"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: \"a\\rb\", mass: 2 kg}\n" STAGES, NULL, 0, "@IN@:4:12",
     "a control character (a carriage return"},
    {{SIZE_MISSION}, MISSION_HEAD SECTION "stages:\n  - name: \"m\\bx\"\n    family: conical\n"
     "    nominal-diameter: 1.5 m\n", NULL, 0, "@IN@:6:11", "a control character (a backspace"},
    {{SIZE_MISSION}, MISSION_HEAD SECTION "stages:\n  - name: \"m\\x9bx\"\n    family: conical\n"
     "    nominal-diameter: 1.5 m\n", NULL, 0, "@IN@:6:11", "a control character (U+009B)"},
    {{SIZE_MISSION}, NULL, NULL, GEN_DEEP_BLOCK, "@IN@:18:33", "too deeply nested"},
    {{SIZE_MISSION}, NULL, NULL, GEN_LAUGHS, "@IN@:", "too large or too deeply nested"},
    {{SIZE_MISSION}, NULL, NULL, GEN_BIG, "@IN@", "larger than 1 MiB"},
    {{SIZE_MISSION}, MISSION_HEAD "  - {name: a, mass: 1e400 kg}\n" STAGES, NULL, 0, "@IN@:4:21", "out of the range"},
    {{SIZE_MISSION}, NULL, NULL, GEN_LONG_NUMBER, "@IN@:4:21", "too long for a number"},
    {{SIZE_MISSION}, MISSION "---\n" MISSION, NULL, 0, "@IN@:9:1", "more than one YAML document"},
    /* missing files, directories given as files, referenced files */
    {{SIZE_MISSION}, NULL, NULL, 0, "--mission: @IN@", "cannot open"},
    {{"size", "--mission", "@DIR@", "--speed", "5"}, NULL, NULL, 0, "--mission: @DIR@", "is a directory"},
    {{"check", "@DIR@"}, NULL, NULL, 0, "@DIR@", "is a directory"},
    {{CHECK}, NULL, NULL, 0, "@IN@", "cannot open"},
    {{CHECK}, "hello: world\n", NULL, 0, "@IN@:1:1", "not a sinkrate file"},
    {{SIZE_MISSION}, MISSION_HEAD SECTION "stages:\n  - {name: main, canopy: second}\n", NULL, 0, "@IN@:6:26",
     "cannot open"},
    {{SIZE_MISSION}, MISSION_HEAD SECTION "stages:\n  - {name: main, canopy: second}\n",
     "canopy:\n  family: conical\n  nominal-diameter: 2\n", 0, "@IN2@:3:21", "needs a unit"},
    {{SIZE_MISSION}, MISSION_HEAD SECTION "stages:\n  - {name: main, canopy: second, family: cross}\n",
     "canopy: {family: conical, nominal-diameter: 2 m}\n", 0, "@IN@:6:26", "not both"},
    {{SIZE_MISSION}, "mission: m\nsite: {sounding: second}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:18",
     "cannot open"},
    {{SIZE_MISSION}, "mission: m\nsite: {sounding: second}\nsections:\n" SECTION STAGES,
     SOUNDING_HEAD "0,15,1013\n1000,8,abc\n", 0, "@IN2@:3:8", "not a number"},
    {{SIZE_MISSION}, "mission: m\nsite: {sounding: second, elevation: 5 km}\nsections:\n" SECTION STAGES,
     SOUNDING_HEAD "0,15,1013\n1000,8,900\n", 0, "@IN@:2:37", "outside the sounding"},
    {{SIZE_MISSION}, "mission: m\nsite: {sounding: second, temperature: 20 C}\nsections:\n" SECTION STAGES,
     SOUNDING_HEAD "0,15,1013\n1000,8,900\n", 0, "@IN@:2:18", "not both"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-diameter: 1 m\n  drag-coefficient: {value: 9, "
                    "reference: nominal, source: s}\n",
     NULL, 0, "@IN@:4:29", "outside 0 .. 3"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-diameter: 1 m\n  drag-coefficient: {value: 0.9, "
                    "reference: inflated, source: s}\n",
     NULL, 0, "@IN@:4:45", "nominal, projected or constructed"},
    {{RATE_CANOPY}, "canopy:\n  nominal-diameter: 1 m\n", NULL, 0, "@IN@:2:3", "needs a 'family'"},

    /* ---- CSV soundings ---- */
    {{AIR_SOUNDING}, "altitude,temperature,pressure\n0,15,1013\n1000,8,900\n", NULL, 0, "@IN@:1:1",
     "needs a unit in brackets"},
    {{AIR_SOUNDING}, "altitude [furlong],temperature [C],pressure [hPa]\n0,15,1013\n1000,8,900\n", NULL, 0,
     "@IN@:1:1", "unknown length unit 'furlong'"},
    {{AIR_SOUNDING}, "altitude [m],temp [C],pressure [hPa]\n0,15,1013\n1000,8,900\n", NULL, 0, "@IN@:1:14",
     "unknown column 'temp'"},
    {{AIR_SOUNDING}, "altitude [m],pressure [hPa]\n0,1013\n1000,900\n", NULL, 0, "@IN@:1:1",
     "no 'temperature' column"},
    {{AIR_SOUNDING}, "altitude [m],temperature [C],pressure [hPa],altitude [m]\n0,15,1013,0\n", NULL, 0,
     "@IN@:1:45", "appears twice"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n1000,abc,900\n", NULL, 0, "@IN@:3:6", "not a number"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n1000,nan,900\n", NULL, 0, "@IN@:3:6", "not a number"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n1000,8\n", NULL, 0, "@IN@:3:", "row has 2 of the header's 3 cells"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n1000,8,900,7\n", NULL, 0, "@IN@:3:12", "more cells than the header"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n0,8,900\n", NULL, 0, "@IN@:3:1", "must increase"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n1000,8,1100\n", NULL, 0, "@IN@:3:1", "pressure must fall"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n1000,300,900\n", NULL, 0, "@IN@:3:1", "outside 100 K .. 400 K"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n", NULL, 0, "@IN@:2:1", "at least two rows"},
    {{AIR_SOUNDING}, "", NULL, 0, "@IN@:1:1", "empty table"},
    {{AIR_SOUNDING}, SOUNDING_HEAD, NULL, 0, "@IN@:1:1", "no data rows"},
    {{AIR_SOUNDING}, NULL, NULL, GEN_BINARY, "@IN@:1:1", "binary data"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n1000,8,\"900\n", NULL, 0, "@IN@:3:", "quoted cell"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n100000,8,900\n", NULL, 0, "@IN@:3:1", "outside -1000 m .. 86000 m"},
    {{AIR_SOUNDING}, "altitude [m,temperature [C],pressure [hPa]\n0,15,1013\n", NULL, 0, "@IN@:1:1",
     "malformed unit"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013\n1000,8,1e999\n", NULL, 0, "@IN@:3:8", "out of the range"},
    {{AIR_SOUNDING}, NULL, NULL, 0, "--sounding: @IN@", "cannot open"},
    {{"air", "--sounding", "@DIR@"}, NULL, NULL, 0, "--sounding: @DIR@", "is a directory"},
    /* ---- sweep ---- */
    {{SWEEP_OK, "--from", "0", "--to", "1 km", "--step", "0"}, NULL, NULL, 0, "--step", "must not be zero"},
    {{SWEEP_OK, "--from", "0", "--to", "1 km", "--step", "-100 m"}, NULL, NULL, 0, "--step",
     "give it the sign of to - from"},
    {{SWEEP_OK, "--from", "0", "--to", "80 km", "--step", "0.1 m"}, NULL, NULL, 0, "--step", "the most is 100000"},
    {{SWEEP_OK, "--from", "0", "--to", "90 km", "--step", "1 km"}, NULL, NULL, 0, "--to",
     "outside the standard atmosphere model"},
    {{SWEEP_OK, "--values", "0,90 km"}, NULL, NULL, 0, "--values", "outside the standard atmosphere model"},
    {{SWEEP_OK, "--from", "0", "--to", "1 km"}, NULL, NULL, 0, "--from", "go together"},
    {{SWEEP_OK, "--values", "0", "--from", "0"}, NULL, NULL, 0, "--values", "not both"},
    {{"sweep", "--family", "conical", "--nominal-diameter", "1.5 m", "--vary", "mass", "--values", "1 kg,-2 kg"}, NULL,
     NULL, 0, "--values", "must be greater than zero"},
    {{SWEEP_OK, "--values", "0", "--by", "temp-offset"}, NULL, NULL, 0, "--by", "is not VAR=LIST"},
    {{SWEEP_OK, "--values", "0", "--by", "colour=1,2"}, NULL, NULL, 0, "--by",
     "'colour' is not one of altitude, mass"},
    {{SWEEP_OK, "--values", "0", "--by", "mass=1 kg,xx"}, NULL, NULL, 0, "--by", "'xx' is not a number"},
    {{SWEEP_OK, "--values", "0", "--by", "altitude=0,1 km"}, NULL, NULL, 0, "--by", "already the swept variable"},
    {{SWEEP_OK, "--values", "0", "--by", "temp-offset=1C,2C,3C,4C,5C,6C,7C,8C,9C"}, NULL, NULL, 0, "--by",
     "more than 8 values"},
    {{"sweep", "--nominal-diameter", "1.5 m", "--family", "conical", "--mass", "2 kg", "--values", "0"}, NULL, NULL,
     0, "--nominal-diameter", "give it after the --family"},
    {{SWEEP_OK, "--nominal-diameter", "2 m", "--values", "0"}, NULL, NULL, 0, "--nominal-diameter", "given twice"},
    {{"sweep", "--mass", "2 kg", "--values", "0"}, NULL, NULL, 0, "--family", "at least one canopy"},
    {{SWEEP_OK, "--vary", "altitud", "--values", "0"}, NULL, NULL, 0, "--vary", "'altitud' is not one of"},
    {{SWEEP_OK, "--vary", "speed", "--values", "5 m/s"}, NULL, NULL, 0, "--vary speed", "drop its size option"},
    {{SWEEP_OK, "--vary", "mass", "--values", "1 kg"}, NULL, NULL, 0, "--mass", "the sweep sets the mass"},
    {{SWEEP_OK, "--values", "0", "--figure", "pie"}, NULL, NULL, 0, "--figure", "not one of rate, time, both"},
    {{"sweep", "--family", "conical", "--nominal-diameter", "1.5 m", "--vary", "mass", "--values", "1 kg",
      "--figure", "rate"},
     NULL, NULL, 0, "--figure", "only altitude sweeps"},
    {{SWEEP_OK, "--values", "0", "--mark-speed", "5 kg"}, NULL, NULL, 0, "--mark-speed", "unknown speed unit 'kg'"},
    {{SWEEP_OK, "--values", "0", "--body-drag-area", "-1 m2"}, NULL, NULL, 0, "--body-drag-area",
     "zero or positive"},
    {{SWEEP_OK, "--values", "0", "--plot-format", "gif"}, NULL, NULL, 0, "--plot-format", "not one of png, svg"},
    {{SWEEP_OK, "--values", "0", "--plot-size", "10x10"}, NULL, NULL, 0, "--plot-size", "WIDTHxHEIGHT"},
    {{SWEEP_OK, "--values", "0", "--plot", "@OUT@/"}, NULL, NULL, 0, "--plot", "names a directory"},
    {{SWEEP_OK, "--values", "0", "--plot", "/proc/sinkrate-bad-input"}, NULL, NULL, 0,
     "--plot: /proc/sinkrate-bad-input.dat", "cannot write"},
    {{SWEEP_OK, "--values", "0,90 km", "--plot", "@OUT@/fig"}, NULL, NULL, 0, "--values", "outside"},
    {{SWEEP_OK, "--values", "0", "--plot", "@OUT@/new/fig", "-o", "@OUT@/no/such/dir/sweep.txt"}, NULL, NULL, 0,
     "-o: @OUT@/no/such/dir/sweep.txt", "cannot write"},
    {{"sweep", "--mission", "@IN@"}, NULL, NULL, 0, "--mission: @IN@", "cannot open"},

    /* ---- profile: the mission file ---- */
    {{"profile", "@IN@"}, NULL, NULL, 0, "@IN@", "cannot open"},
    {{"profile", "@DIR@"}, NULL, NULL, 0, "@DIR@", "is a directory"},
    {{"profile"}, NULL, NULL, 0, "profile", "give a mission file"},
    {{"profile", "@IN@", "@IN@"}, PMISSION, NULL, 0, "'@IN@'", "takes one mission file"},
    {{PROFILE}, "mission: m\nsections: [\n", NULL, 0, "@IN@:3:1", "malformed YAML"},
    {{PROFILE}, MISSION, NULL, 0, "@IN@", "no start: block"},
    {{PROFILE}, "mission: m\nsite: {wind: {model: power-law, speed: 5 m/s, form: 250 deg}}\nsections:\n" SECTION
                    STAGES START,
     NULL, 0, "@IN@:2:47", "did you mean 'from'"},
    {{PROFILE}, "mission: m\nsite: {wind: {model: gale}}\nsections:\n" SECTION STAGES START, NULL, 0, "@IN@:2:22",
     "unknown wind model 'gale'"},
    {{PROFILE}, "mission: m\nsite: {wind: {speed: 5, from: 250 deg}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:22", "needs a unit"},
    {{PROFILE}, "mission: m\nsite: {wind: {speed: -5 m/s, from: 250 deg}}\nsections:\n" SECTION STAGES START, NULL,
     0, "@IN@:2:22", "outside 0 .. 100 m/s"},
    {{PROFILE}, "mission: m\nsite: {wind: {speed: 5 m/s, from: 250 m}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:35", "unknown angle unit 'm'"},
    {{PROFILE}, "mission: m\nsite: {wind: {model: power-law, speed: 5 m/s, from: 250 deg, exponent: 3}}\nsections:\n"
                    SECTION STAGES START,
     NULL, 0, "@IN@:2:72", "outside 0.05 .. 0.8"},
    {{PROFILE}, "mission: m\nsite: {wind: {model: sounding}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:22", "the site has no sounding"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shap: sphere, diameter: 10 cm}}\n" STAGES START, NULL,
     0, "@IN@:4:34", "did you mean 'shape'"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: cube, diameter: 10 cm}}\n" STAGES START, NULL,
     0, "@IN@:4:41", "shape must be sphere"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: sphere}}\n" STAGES START, NULL, 0, "@IN@:4:33",
     "missing the required key 'diameter'"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: sphere, diameter: 10 kg}}\n" STAGES START,
     NULL, 0, "@IN@:4:59", "unknown length unit 'kg'"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: sphere, diameter: 10 cm, length: 1 m}}\n"
                    STAGES START,
     NULL, 0, "@IN@:4:74", "only a cylinder body takes a length"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: sphere, diameter: 10 cm}, drag-area: 0.1 m2}\n"
                    STAGES START,
     NULL, 0, "@IN@:4:27", "not both"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {cd-table: second, diameter: 10 cm}}\n" STAGES START,
     "Re,Cd\n1e3,0.5\n1e2,1.0\n", 0, "@IN2@:3:1", "strictly increasing"},
    {{PROFILE}, PMISSION "failure-cases:\n  - no-canopies\n", NULL, 0, "@IN@:11:5", "'no-canopy'"},
    {{PROFILE}, PMISSION "failure-cases:\n  - {only: mian}\n", NULL, 0, "@IN@:11:12", "did you mean 'main'"},
    {{PROFILE}, PMISSION "failure-cases:\n  - {onyl: main}\n", NULL, 0, "@IN@:11:6", "did you mean 'only'"},
    {{PROFILE}, MISSION "start: {heigt: 1000 m}\n", NULL, 0, "@IN@:9:9", "did you mean 'height'"},
    {{PROFILE}, MISSION "start: {height: 1000 m, sped: 3 m/s}\n", NULL, 0, "@IN@:9:25", "did you mean 'speed'"},
    {{PROFILE}, PMISSION "limits: {drift: 5 m/s}\n", NULL, 0, "@IN@:10:17", "unknown length unit 'm/s'"},
    {{PROFILE}, PMISSION "limits: {landing-energy: 5 N}\n", NULL, 0, "@IN@:10:26", "unknown energy unit 'N'"},
    {{PROFILE}, PMISSION "limits: {desent-time: 5 s}\n", NULL, 0, "@IN@:10:10", "did you mean 'descent-time'"},
    {{PROFILE}, MISSION "    deploy: {height: 300 m}\n  - {name: b, family: cross, nominal-diameter: 1 m, "
                        "deploy: {height: 500 m}}\n" START,
     NULL, 0, "@IN@:10:70", "falling order"},
    {{PROFILE}, MISSION "    deploy: {height: 3000 m}\n" START, NULL, 0, "@IN@:9:22", "not below the start"},
    {{PROFILE, "--fail", "mian"}, PMISSION, NULL, 0, "--fail", "did you mean 'main'"},
    {{PROFILE, "--fail", ","}, PMISSION, NULL, 0, "--fail", "give stage names or 'all'"},
    {{PROFILE, "--plot", "@OUT@/fig"}, MISSION "start: {height: 1000 m, speed: -5 m/s}\n", NULL, 0, "@IN@:9:32",
     "between 0 and 2000 m/s"},
    {{PROFILE, "--plot", "/proc/sinkrate-bad-input"}, PMISSION, NULL, 0, "--plot: /proc/sinkrate-bad-input.dat",
     "cannot write"},
    /* the wind table a mission names */
    {{PROFILE}, WIND_TABLE_MISSION, NULL, 0, "@IN@:2:35", "cannot open"},
    {{PROFILE}, WIND_TABLE_MISSION, "height [m],speed [m/s],from [deg]\n0,3,240\n500,7,250\n", 0, "@IN@:9:17",
     "above the top of the wind table"},
    {{PROFILE}, WIND_TABLE_MISSION, "height [m],speed [m/s],frm [deg]\n0,3,240\n2000,7,250\n", 0, "@IN2@:1:24",
     "unknown column 'frm'"},
    {{PROFILE}, WIND_TABLE_MISSION, "height [m],speed [m/s],from [deg]\n0,3,240\n2000,-7,250\n", 0, "@IN2@:3:1",
     "outside 0 .. 100 m/s"},
    {{PROFILE}, WIND_TABLE_MISSION, "height [m],speed [m/s],from [deg]\n0,3,240\n0,7,250\n", 0, "@IN2@:3:1",
     "does not increase"},
    {{PROFILE}, WIND_TABLE_MISSION, "height [m],speed [kg],from [deg]\n0,3,240\n2000,7,250\n", 0, "@IN2@:1:12",
     "unknown speed unit 'kg'"},
    {{PROFILE}, WIND_TABLE_MISSION, "height [m],altitude [m],speed [m/s],from [deg]\n0,100,3,240\n2000,2100,7,250\n",
     0, "@IN2@:1:1", "exactly one of the columns"},
    {{PROFILE}, WIND_TABLE_MISSION, "height [m],speed [m/s]\n0,3\n2000,7\n", 0, "@IN2@:1:1", "no 'from' column"},
    {{PROFILE}, WIND_TABLE_MISSION, "height [m],speed [m/s],from [deg]\n0,3,240\n2000,7,x\n", 0, "@IN2@:3:8",
     "not a number"},
    {{PROFILE}, WIND_TABLE_MISSION, NULL, GEN_BINARY2, "@IN2@:1:1", "binary data"},

    /* ---- loads ---- */
    {{LOADS_CANOPY, "--speed", "30 m/s", "--filling-constant", "0"}, NULL, NULL, 0, "--filling-constant",
     "greater than zero"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--filling-constant", "1e6"}, NULL, NULL, 0, "--filling-constant",
     "0.5 .. 50"},
    {{LOADS_CANOPY, "--speed", "-5 m/s"}, NULL, NULL, 0, "--speed", "greater than zero"},
    {{LOADS_CANOPY, "--speed", "400 m/s"}, NULL, NULL, 0, "--speed", "subsonic deployment only"},
    {{LOADS_CANOPY, "--speed", "30 kg"}, NULL, NULL, 0, "--speed", "unknown speed unit 'kg'"},
    {{LOADS_CANOPY}, NULL, NULL, 0, "--speed", "is required"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--design-factor", "0.5"}, NULL, NULL, 0, "--design-factor", "at least 1"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--design-factor", "1e308"}, NULL, NULL, 0, "--design-factor", "1 .. 10"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--design-factor", "x"}, NULL, NULL, 0, "--design-factor",
     "'x' is not a number"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--cluster-allowance", "1e9"}, NULL, NULL, 0, "--cluster-allowance",
     "1 .. 10"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--opening-factor", "50"}, NULL, NULL, 0, "--opening-factor", "(0, 5]"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--growth-exponent", "20"}, NULL, NULL, 0, "--growth-exponent", "(0, 10]"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--path-angle", "120 deg"}, NULL, NULL, 0, "--path-angle",
     "outside -90..90"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--altitude", "100 km"}, NULL, NULL, 0, "--altitude", "outside"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--stage", "main"}, NULL, NULL, 0, "--stage", "needs --mission"},
    {{"loads", "--mission", "@IN@", "--stage", "mian"}, PMISSION, NULL, 0, "--stage", "did you mean 'main'"},
    {{"loads", "--mission", "@IN@", "--speed", "30 m/s"}, PMISSION, NULL, 0, "--speed", "add --stage NAME"},
    {{"loads", "--mission", "@IN@", "--family", "conical"}, PMISSION, NULL, 0, "--mission", "drop --family"},
    {{"loads", "--mission", "@IN@"}, MISSION, NULL, 0, "--mission", "no start block"},
    {{"loads", "--mission", "@IN@"}, MISSION_HEAD SECTION "stages:\n  - name: main\n    family: conical\n" START, NULL,
     0, "--mission", "stage 'main' has no size"},
    {{LOADS_CANOPY, "--speed", "0", "--plot", "@OUT@/fig"}, NULL, NULL, 0, "--speed", "greater than zero"},
    {{"loads", "--mission", "@IN@", "--plot", "@OUT@/fig", "-o", "@OUT@"}, PMISSION, NULL, 0, "-o: @OUT@",
     "is a directory"},

    /* ---- freefall: options and drag tables ---- */
    {{FREEFALL, "--body", "cube"}, NULL, NULL, 0, "--body", "'cube' is not one of sphere"},
    {{"freefall", "--mass", "1 kg", "--body", "sphere"}, NULL, NULL, 0, "--diameter", "is required"},
    {{FREEFALL, "--length", "1 m"}, NULL, NULL, 0, "--length", "only a cylinder has a length"},
    {{FREEFALL, "--body", "cylinder"}, NULL, NULL, 0, "--length", "a cylinder needs its length"},
    {{FREEFALL, "--curve", "sphere-foo"}, NULL, NULL, 0, "--curve", "unknown drag curve 'sphere-foo'"},
    {{FREEFALL, "--body", "disk", "--curve", "sphere-cgw"}, NULL, NULL, 0, "--curve", "is for a sphere"},
    {{"freefall", "--mass", "-1 kg", "--diameter", "10 cm"}, NULL, NULL, 0, "--mass", "greater than zero"},
    {{"freefall", "--mass", "1 kg", "--diameter", "0 m"}, NULL, NULL, 0, "--diameter", "greater than zero"},
    {{FREEFALL, "--altitude", "0:10 km"}, NULL, NULL, 0, "--altitude", "FROM:TO:STEP"},
    {{FREEFALL, "--altitude", "0:80 km:1 m"}, NULL, NULL, 0, "--altitude", "at most 256"},
    {{FREEFALL, "--altitude", "90 km"}, NULL, NULL, 0, "--altitude", "outside"},
    {{FREEFALL, "--trace", "--steps", "500"}, NULL, NULL, 0, "--steps", "from 1 to 200"},
    {{FREEFALL, "--start-cd", "1"}, NULL, NULL, 0, "--start-cd", "goes with --trace"},
    {{FREEFALL, "--area", "1 m2"}, NULL, NULL, 0, "--area", "only for a table body"},
    {{FREEFALL, "--body", "sphere", "--cd-table", "@IN@"}, CD_HEAD "1e2,1.0\n1e3,0.5\n", NULL, 0, "--cd-table",
     "goes with --body table"},
    {{FREEFALL, "--cd-table", "@IN@"}, NULL, NULL, 0, "--cd-table: @IN@", "cannot open"},
    {{FREEFALL, "--cd-table", "@IN@"}, CD_HEAD "1e3,0.5\n1e2,1.0\n", NULL, 0, "@IN@:3:1", "strictly increasing"},
    {{FREEFALL, "--cd-table", "@IN@"}, CD_HEAD "1e2,1.0\n1e2,0.5\n", NULL, 0, "@IN@:3:1", "does not increase"},
    {{FREEFALL, "--cd-table", "@IN@"}, CD_HEAD "1e2,1.0\n1e3,-0.5\n", NULL, 0, "@IN@:3:1",
     "drag coefficient -0.5 must be positive"},
    {{FREEFALL, "--cd-table", "@IN@"}, CD_HEAD "1e2,1.0\n1e3,0\n", NULL, 0, "@IN@:3:1", "must be positive"},
    {{FREEFALL, "--cd-table", "@IN@"}, CD_HEAD "-1e2,1.0\n1e3,0.5\n", NULL, 0, "@IN@:2:1",
     "Reynolds number -100 must be positive"},
    {{FREEFALL, "--cd-table", "@IN@"}, CD_HEAD "1e2,1.0\n", NULL, 0, "@IN@:2:1", "at least 2 rows"},
    {{FREEFALL, "--cd-table", "@IN@", "--interp", "steffen"}, CD_HEAD "1e2,1.0\n1e3,0.5\n", NULL, 0, "@IN@:3:1",
     "at least 3 rows for monotone interpolation"},
    {{FREEFALL, "--cd-table", "@IN@", "--interp", "cubic"}, CD_HEAD "1e2,1.0\n1e3,0.5\n", NULL, 0, "--interp",
     "not one of loglog, steffen"},
    {{FREEFALL, "--cd-table", "@IN@"}, CD_HEAD "1e2,1.0\n1e3,x\n", NULL, 0, "@IN@:3:5", "not a number"},
    {{FREEFALL, "--cd-table", "@IN@"}, "Re,Cd,Foo\n1e2,1.0,1\n1e3,0.5,1\n", NULL, 0, "@IN@:1:7",
     "unknown column 'Foo'"},
    {{FREEFALL, "--cd-table", "@IN@"}, "Re [m],Cd\n1e2,1.0\n1e3,0.5\n", NULL, 0, "@IN@:1:1", "takes no unit"},
    {{FREEFALL, "--cd-table", "@IN@"}, "", NULL, 0, "@IN@:1:1", "empty table"},
    {{FREEFALL, "--cd-table", "@IN2@.yaml"}, NULL, "points: [[1e2, 1.0]]\n", 0, "@IN2@.yaml:1:10",
     "at least 2 rows"},
    {{FREEFALL, "--cd-table", "@IN2@.yaml"}, NULL, "points: [[1e2, 1.0], [1e3]]\n", 0, "@IN2@.yaml:1:22",
     "a pair [Re, Cd]"},
    {{FREEFALL, "--cd-table", "@IN2@.yaml"}, NULL, "pionts: [[1e2, 1.0], [1e3, 0.4]]\n", 0, "@IN2@.yaml:1:1",
     "did you mean 'points'"},
    {{FREEFALL, "--cd-table", "@IN2@.yaml"}, NULL, "points: [[1e2, 1.0], [1e3, 0.4]]\nreference-area: 2\n", 0,
     "@IN2@.yaml:2:17", "needs a unit"},
    {{FREEFALL, "--altitude", "90 km", "--plot", "@OUT@/fig"}, NULL, NULL, 0, "--altitude", "outside"},

    /* ---- dispersion ---- */
    {{DISPERSION, "-n", "0"}, PMISSION, NULL, 0, "-n", "from 1 to 10000000"},
    {{DISPERSION, "-n", "1e12"}, PMISSION, NULL, 0, "-n", "from 1 to 10000000"},
    {{DISPERSION, "-n", "2.5"}, PMISSION, NULL, 0, "-n", "whole number"},
    {{DISPERSION, "-n", "abc"}, PMISSION, NULL, 0, "-n", "'abc' is not a number of samples"},
    {{DISPERSION, "-n", "-5"}, PMISSION, NULL, 0, "-n", "from 1 to 10000000"},
    {{DISPERSION, "--threads", "x"}, PMISSION, NULL, 0, "--threads", "from 0 to 256"},
    {{DISPERSION, "--threads", "1000"}, PMISSION, NULL, 0, "--threads", "from 0 to 256"},
    {{DISPERSION, "--seed", "-1"}, PMISSION, NULL, 0, "--seed", "whole number >= 0"},
    {{DISPERSION, "--seed", "1e3"}, PMISSION, NULL, 0, "--seed", "from 0 to 4294967295"},
    {{DISPERSION, "--seed", "99999999999"}, PMISSION, NULL, 0, "--seed", "from 0 to 4294967295"},
    {{DISPERSION, "--max-risk", "150 %"}, PMISSION, NULL, 0, "--max-risk", "not a probability"},
    {{DISPERSION, "--samples", "@OUT@/no/such/samples.csv"}, PMISSION, NULL, 0,
     "--samples: @OUT@/no/such/samples.csv", "cannot write"},
    {{DISPERSION, "--samples", "@OUT@"}, PMISSION, NULL, 0, "--samples: @OUT@", "is a directory"},
    {{DISPERSION, "--samples", ""}, PMISSION, NULL, 0, "--samples", "empty output file name"},
    {{DISPERSION, "--samples", "/proc/sinkrate-bad-input.csv"}, PMISSION, NULL, 0,
     "--samples: /proc/sinkrate-bad-input.csv", "cannot write"},
    {{DISPERSION, "-n", "0", "--samples", "@OUT@/s.csv", "--plot", "@OUT@/fig"}, PMISSION, NULL, 0, "-n",
     "from 1 to 10000000"},
    {{DISPERSION, "--plot", "@OUT@/fig", "-o", "@OUT@/missing/d.txt"}, PMISSION, NULL, 0,
     "-o: @OUT@/missing/d.txt", "cannot write"},
    {{"dispersion"}, NULL, NULL, 0, "dispersion", "a mission file is required"},
    {{DISPERSION}, NULL, NULL, 0, "@IN@", "cannot open"},
    {{"dispersion", "@DIR@"}, NULL, NULL, 0, "@DIR@", "is a directory"},
    /* the uncertainty block */
    {{DISPERSION, "--samples", "@OUT@/s.csv"}, PMISSION "uncertainty: {mass: {distribution: normal, sigma: -2 %}}\n",
     NULL, 0, "@IN@:10:51", "must not be negative"},
    {{DISPERSION}, PMISSION "uncertainty: {mass: {distribution: gaussian, sigma: 2 %}}\n", NULL, 0, "@IN@:10:36",
     "unknown distribution 'gaussian'"},
    {{DISPERSION}, PMISSION "uncertainty: {mas: {distribution: normal, sigma: 2 %}}\n", NULL, 0, "@IN@:10:15",
     "did you mean 'mass'"},
    {{DISPERSION}, PMISSION "uncertainty: {drag: {mian: uniform}}\n", NULL, 0, "@IN@:10:22", "did you mean 'main'"},
    {{DISPERSION}, PMISSION "uncertainty: {mass: {distribution: normal, sigma: 50 %}}\n", NULL, 0, "@IN@:10:51",
     "at most 30 %"},
    {{DISPERSION}, PMISSION "uncertainty: {mass: {distribution: normal, sgima: 5 %}}\n", NULL, 0, "@IN@:10:44",
     "did you mean 'sigma'"},
    {{DISPERSION}, PMISSION "uncertainty: {first-deployment: {distribution: normal, sigma: 500 m}}\n", NULL, 0,
     "@IN@:10:63", "reaches the ground"},
    {{DISPERSION}, PMISSION "uncertainty: {wind-direction: {distribution: uniform, half-width: 5 m}}\n", NULL, 0,
     "@IN@:10:67", "unknown angle unit 'm'"},
    {{DISPERSION}, PMISSION "uncertainty: {wind-speed: {distribution: normal}}\n", NULL, 0, "@IN@:10:27",
     "needs sigma"},
    {{DISPERSION}, PMISSION "uncertainty: {drag: {main: uniform}, drag: x}\n", NULL, 0, "@IN@:10:38",
     "duplicate key 'drag'"},
    /* ---- design: the design: block and the options ---- */
    {{DESIGN}, PMISSION "design: {stages: {main: {nominal-diameter: {min: 3 m, max: 1 m}}}}\n", NULL, 0,
     "@IN@:10:50", "min 3 m is above its max 1 m"},
    {{DESIGN}, PMISSION "design: {stages: {main: {families: []}}}\n", NULL, 0, "@IN@:10:36", "the list is empty"},
    {{DESIGN}, PMISSION "design: {stages: {main: {families: [conicl]}}}\n", NULL, 0, "@IN@:10:37",
     "did you mean 'conical'"},
    {{DESIGN}, PMISSION "design: {stages: {main: {families: {class: ribbon}}}}\n", NULL, 0, "@IN@:10:44",
     "no family of the catalog has class 'ribbon'"},
    {{DESIGN}, PMISSION "design: {stages: {mian: {families: [conical]}}}\n", NULL, 0, "@IN@:10:19",
     "did you mean 'main'"},
    {{DESIGN}, PMISSION "design: {stage: {main: {families: [conical]}}}\n", NULL, 0, "@IN@:10:10",
     "did you mean 'stages'"},
    {{DESIGN}, PMISSION "design: {stages: {main: {deploy-height: {min: 100 m, max: 200 m}}}}\n", NULL, 0,
     "@IN@:10:41", "does not deploy at a height"},
    {{DESIGN}, HMISSION "design: {stages: {main: {deploy-height: {min: 100 m, max: 1200 m}}}}\n", NULL, 0,
     "@IN@:9:41", "not below the start at 1000 m"},
    {{DESIGN}, PMISSION "design: {stages: {main: {nominal-diameter: {min: 1 m, max: 100 m}}}}\n", NULL, 0,
     "@IN@:10:44", "spans more than a factor 50"},
    {{DESIGN}, PMISSION "design: {stages: {main: {nominal-diameter: []}}}\n", NULL, 0, "@IN@:10:44",
     "the list of sizes is empty"},
    {{DESIGN}, PMISSION "design: {stages: {main: {nominal-diameter: [1 m, 2 m, 1 m]}}}\n", NULL, 0, "@IN@:10:44",
     "listed twice"},
    {{DESIGN}, PMISSION "design: {stages: {main: {nominal-diameter: {min: 1 m, max: 2 m, step: 0 m}}}}\n", NULL, 0,
     "@IN@:10:71", "the size step must be positive"},
    {{DESIGN}, PMISSION "design: {stages: {main: {bay-volume: -1 L}}}\n", NULL, 0, "@IN@:10:38",
     "must lie above 0"},
    {{DESIGN}, PMISSION "design: {stages: {main: {bay-volume: 2 m}}}\n", NULL, 0, "@IN@:10:38",
     "unknown volume unit 'm'"},
    {{DESIGN}, PMISSION "design: {stages: {main: {count: [1, 0]}}}\n", NULL, 0, "@IN@:10:37", "from 1 to 16"},
    {{DESIGN}, PMISSION "design: {objective: cheapest}\n", NULL, 0, "@IN@:10:21", "objective must be mass"},
    {{DESIGN}, PMISSION "design: {packing: vacuum}\n", NULL, 0, "@IN@:10:19", "packing must be hand, machine"},
    {{DESIGN}, PMISSION "design: {stages: {main: {optional: yes}}}\n", NULL, 0, "@IN@:10:36",
     "expected true or false"},
    {{DESIGN}, PMISSION "design: {objective: mass}\n", NULL, 0, "@IN@", "nothing to search"},
    {{DESIGN}, MISSION "design: {stages: {main: {families: [conical]}}}\n", NULL, 0, "@IN@", "no start: block"},
    {{DESIGN, "--diameters", "main=3m..1m"}, PMISSION, NULL, 0, "--diameters", "min 3 m is above its max 1 m"},
    {{DESIGN, "--diameters", "main=1m..100m"}, PMISSION, NULL, 0, "--diameters", "spans more than a factor 50"},
    {{DESIGN, "--families", "mian=conical"}, PMISSION, NULL, 0, "--families", "did you mean 'main'"},
    {{DESIGN, "--families", "main"}, PMISSION, NULL, 0, "--families", "give STAGE=VALUE"},
    {{DESIGN, "--families", "main="}, PMISSION, NULL, 0, "--families", "no value after 'main='"},
    {{DESIGN, "--families", "main=conicl"}, PMISSION, NULL, 0, "--families", "did you mean 'conical'"},
    {{DESIGN, "--families", "main=conical", "--families", "main=cross"}, PMISSION, NULL, 0, "--families",
     "given twice"},
    {{DESIGN, "--heights", "main=100m..300m"}, PMISSION, NULL, 0, "--heights", "does not deploy at a height"},
    {{DESIGN, "--heights", "main=300m"}, HMISSION, NULL, 0, "--heights", "give a range MIN..MAX"},
    {{DESIGN, "--counts", "main=0"}, PMISSION, NULL, 0, "--counts", "from 1 to 16"},
    {{DESIGN, "--bay", "main=-1L"}, PMISSION, NULL, 0, "--bay", "greater than zero"},
    {{DESIGN, "--optional", "main=yes"}, PMISSION, NULL, 0, "--optional", "the stage name only"},
    {{DESIGN, "--objective", "heavy"}, PMISSION, NULL, 0, "--objective", "not one of mass, volume, drift"},
    {{DESIGN, "--packing", "tight"}, PMISSION, NULL, 0, "--packing", "not one of hand, machine, pressure"},
    {{DESIGN, "--grid", "1"}, PMISSION, NULL, 0, "--grid", "from 2 to 64"},
    {{DESIGN, "--top", "0"}, PMISSION, NULL, 0, "--top", "from 1 to"},
    {{DESIGN, "--pareto", "speed,speed"}, PMISSION, NULL, 0, "--pareto", "two different quantities"},
    {{DESIGN, "--pareto", "speed,cost"}, PMISSION, NULL, 0, "--pareto", "not two of speed, drift"},
    {{DESIGN, "--max-risk", "1 %"}, PMISSION, NULL, 0, "--max-risk", "goes with --risk-samples"},
    {{DESIGN, "--risk-samples", "0"}, PMISSION, NULL, 0, "--risk-samples", "from 1 to"},
    {{DESIGN, "--risk-samples", "100", "--max-risk", "2"}, PMISSION, NULL, 0, "--max-risk", "not a probability"},
    {{DESIGN, "--write", "@OUT@/no/such/m.yaml"}, PMISSION, NULL, 0, "--write: @OUT@/no/such/m.yaml",
     "cannot write"},
    {{DESIGN, "--write", "@IN@"}, PMISSION, NULL, 0, "--write", "the mission file"},
    {{DESIGN, "--limits-at", "middle"}, PMISSION, NULL, 0, "--limits-at", "not band-end"},
    {{DESIGN}, MISSION_HEAD SECTION
     "stages:\n  - {name: a, family: cross, nominal-diameter: 0.5 m}\n"
     "  - {name: b, family: conical, nominal-diameter: 1 m, deploy: {height: 800 m}}\n"
     "  - {name: c, family: conical, nominal-diameter: 2 m, deploy: {height: 300 m}}\n" START
     "design: {stages: {a: {families: all, nominal-diameter: {min: 0.3 m, max: 1 m}}, b: {families: all, "
     "nominal-diameter: {min: 0.5 m, max: 2 m}, deploy-height: {min: 500 m, max: 900 m}}, c: {families: all, "
     "nominal-diameter: {min: 1 m, max: 4 m}, deploy-height: {min: 150 m, max: 250 m}}}}\n",
     NULL, 0, "@IN@", "the search space is too large"},
    {{"design"}, NULL, NULL, 0, "design", "give a mission file"},
    /* under --units us every length of a size or height range needs its unit */
    {{DESIGN, "--units", "us", "--diameters", "main=30..60"}, PMISSION, NULL, 0, "--diameters",
     "give a unit, e.g. 30in"},
    {{DESIGN, "--units", "us", "--diameters", "main=30in,36,42in"}, PMISSION, NULL, 0, "--diameters",
     "give a unit, e.g. 36in"},
    {{DESIGN, "--units", "us", "--diameters", "main=30in..60in/6"}, PMISSION, NULL, 0, "--diameters",
     "give a unit, e.g. 6in"},
    {{DESIGN, "--units", "us", "--heights", "main=500..1000ft/10"}, HMISSION, NULL, 0, "--heights",
     "give a unit, e.g. 500ft"},
    {{DESIGN}, NULL, NULL, 0, "@IN@", "cannot open"},
    /* ---- the verdict: limits keys, --limits-at, measured openings, attitudes, bands ---- */
    {{PROFILE}, PMISSION "limits: {rated-strength: 2 kN}\n", NULL, 0, "@IN@:10:10", "needs design-factor"},
    {{PROFILE}, PMISSION "limits: {design-factor: 2}\n", NULL, 0, "@IN@:10:25", "goes with rated-strength"},
    {{PROFILE}, PMISSION "limits: {rated-strength: {mian: 2 kN}, design-factor: 2}\n", NULL, 0, "@IN@:10:27",
     "did you mean 'main'"},
    {{PROFILE}, PMISSION "limits: {rated-strength: 2 kN, design-factor: 0.5}\n", NULL, 0, "@IN@:10:47", "1 .. 10"},
    {{PROFILE}, PMISSION "limits: {rated-strength: 2 kg, design-factor: 2}\n", NULL, 0, "@IN@:10:26", "force"},
    {{PROFILE}, PMISSION "limits: {landing-energy-basis: horizontal}\n", NULL, 0, "@IN@:10:32",
     "descent-rate (the vertical speed"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: {low: 3 kg, high: 2 kg}}\n" STAGES START, NULL, 0, "@IN@:4:21",
     "low <= typical <= high"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: {low: 3 kg, hi: 4 kg}}\n" STAGES START, NULL, 0, "@IN@:4:33",
     "unknown key 'hi' in mass"},
    {{PROFILE}, MISSION "    measured-opening: {factor: 1.3, load: 800 N, source: test}\n" START, NULL, 0,
     "@IN@:9:23", "exactly one of factor"},
    {{PROFILE}, MISSION "    measured-opening: {factor: 1.3}\n" START, NULL, 0, "@IN@:9:23", "source"},
    {{PROFILE}, MISSION "    measured-opening: {load: 800 kg, source: test}\n" START, NULL, 0, "@IN@:9:30", "force"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: sphere, diameter: 10 cm, stable-end-on: true}}\n"
     STAGES START, NULL, 0, "@IN@:4:81", "no end to fall on"},
    {{PROFILE}, MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: cylinder, diameter: 10 cm, length: 1 m, "
     "stable-end-on: yes}}\n" STAGES START, NULL, 0, "@IN@:4:96", "true or false"},
    {{CHECK}, FAMILY "growth-exponent: {low: 3, high: 1, source: s}\n", NULL, 0, "@IN@:11:18",
     "low <= typical <= high"},
    {{CHECK}, FAMILY "growth-exponent: {low: 1, high: 3}\n", NULL, 0, "@IN@:11:18", "source"},
    {{PROFILE, "--limits-at", "worst"}, PMISSION, NULL, 0, "--limits-at", "not band-end"},
    {{LOADS_CANOPY, "--speed", "30 m/s", "--limits-at", "typical"}, NULL, NULL, 0, "--limits-at", "needs --mission"},
    {{"loads", "--mission", "@IN@", "--mass", "3 kg"}, PMISSION, NULL, 0, "--mass", "drop --mass"},
    {{"loads", "--mission", "@IN@", "--limits-at", "loose"}, PMISSION, NULL, 0, "--limits-at", "not band-end"},

    /* ---- outputs that are inputs of the run, or each other (same path, link or inode) ---- */
    {{PROFILE, "-o", "@IN@"}, PMISSION, NULL, 0, "-o: @IN@", "is also a file this run reads (the mission file)"},
    {{DISPERSION, "--samples", "@IN@"}, PMISSION, NULL, 0, "--samples: @IN@",
     "is also a file this run reads (the mission file)"},
    {{AIR_SOUNDING, "-o", "@IN@"}, SOUNDING_HEAD "0,15,1013.25\n1000,8.5,898.7\n", NULL, 0, "-o: @IN@",
     "is also a file this run reads (--sounding)"},
    {{CHECK, "-o", "@IN@"}, MISSION, NULL, 0, "-o: @IN@", "is also a file this run reads (a file to check)"},
    {{RATE_CANOPY, "-o", "@IN@"}, "canopy:\n  family: conical\n  nominal-diameter: 1 m\n", NULL, 0, "-o: @IN@",
     "is also a file this run reads (--canopy)"},
    {{PROFILE, "-o", "@IN2@"}, "mission: m\nsite: {sounding: second}\nsections:\n" SECTION STAGES START,
     SOUNDING_HEAD "0,15,1013.25\n3000,-4.5,701.1\n", 0, "-o: @IN2@",
     "is also a file this run reads (the mission's sounding)"},
    {{PROFILE, "-o", "@IN2@"}, MISSION_HEAD SECTION "stages:\n  - {name: main, canopy: second}\n" START,
     "canopy:\n  family: conical\n  nominal-diameter: 1.5 m\n", 0, "-o: @IN2@",
     "is also a file this run reads (a canopy file of the mission)"},
    {{FREEFALL, "--cd-table", "@IN@", "-o", "@IN@"}, CD_HEAD "1e2,1.0\n1e3,0.5\n", NULL, 0, "-o: @IN@",
     "is also a file this run reads (--cd-table)"},
    {{"canopies", "--data", "@DATA@", "-o", "@IN@"}, FAMILY, NULL, 0, "@IN@",
     "is also a file this run reads (a canopy family file of the catalog)"},
    {{DISPERSION, "-o", "@OUT@/x", "--samples", "@OUT@/x"}, PMISSION, NULL, 0, "--samples: @OUT@/x",
     "is also written by -o"},
    {{DISPERSION, "-o", "@OUT@/fig.dat", "--plot", "@OUT@/fig"}, PMISSION, NULL, 0, "--plot: @OUT@/fig.dat",
     "is also written by -o"},
    {{DISPERSION, "-o", "@OUT@/./x", "--samples", "@OUT@/x"}, PMISSION, NULL, 0, "--samples: @OUT@/x",
     "is also written by -o"},

    /* ---- options named in every message; given once ---- */
    {{RATE_OK, "-n", "5"}, NULL, NULL, 0, "'-n'", "unknown option '-n' (see --help)"},
    {{"air", "-o"}, NULL, NULL, 0, "-o", "-o needs a value"},
    {{"dispersion", "@IN@", "-o", "@OUT@/r", "-n"}, PMISSION, NULL, 0, "-n", "-n needs a value"},
    {{"air", "-o", "@OUT@/r", "--sounding"}, NULL, NULL, 0, "--sounding", "--sounding needs a value"},
    {{"air", "-o", "@OUT@/r", "--help=yes"}, NULL, NULL, 0, "--help", "takes no value"},
    {{SIZE_OK, "--mass", "3 kg"}, NULL, NULL, 0, "--mass", "given twice ('2 kg', then '3 kg')"},
    {{RATE_OK, "--family", "cross"}, NULL, NULL, 0, "--family", "given twice"},
    {{"air", "-o", "@OUT@/a", "-o", "@OUT@/b"}, NULL, NULL, 0, "-o", "given twice"},
    {{"air", "--format", "csv", "--format", "json"}, NULL, NULL, 0, "--format", "given twice"},
    {{DISPERSION, "-n", "10", "-n", "20"}, PMISSION, NULL, 0, "-n", "given twice"},
    {{PROFILE, "--plot", "@OUT@/a", "--plot", "@OUT@/b"}, PMISSION, NULL, 0, "--plot", "given twice"},
    {{SWEEP_OK, "--by", "site-elevation=20000m"}, NULL, NULL, 0, "--by: site 20000 m",
     "puts the ground above the lowest swept altitude"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,\"15\n# a comment\n\",1013.25\n1000,8.5,898.7\n", NULL, 0, "@IN@:2:3",
     "a quoted cell runs past the end of its line"},

    /* ---- numbers: no input leads to an infinite or absurd result ---- */
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1e-306\n1000,8.5,1e-307\n", NULL, 0, "@IN@:2:1",
     "pressure 1e-306 hPa at 0 m is not air"},
    {{RATE_OK, "--sounding", "@IN@"}, SOUNDING_HEAD "0,15,1e-300\n1000,8.5,1e-301\n", NULL, 0, "--sounding: @IN@:2:1",
     "is not air"},
    {{AIR_SOUNDING}, SOUNDING_HEAD "0,15,1013.25\n1000,8.5,89.87\n", NULL, 0, "@IN@:3:1", "(check the unit)"},
    {{PROFILE}, "mission: m\nsections:\n" SECTION
     "stages:\n  - {name: main, family: conical, nominal-diameter: 1.5 m, deploy: {delay: 100 s}}\n"
     "start: {height: 3000 m, speed: 1999 m/s, path-angle: -90 deg}\n", NULL, 0, "@IN@:6:8",
     "climbs past 86000 m above sea level, the top of the atmosphere model"},
    {{DISPERSION}, "mission: m\nsections:\n" SECTION STAGES "start: {height: 85500 m}\n"
     "uncertainty: {first-deployment: {distribution: normal, sigma: 200 m}}\n", NULL, 0, "@IN@:9:63",
     "six times sigma reaches above the top of the atmosphere model"},
    /* ---- fit: the flight log and its options ---- */
    {{"fit"}, NULL, NULL, 0, "fit", "give one or more flight logs"},
    {{FIT}, NULL, NULL, 0, "@IN@", "cannot open"},
    {{FIT}, LOGH "0,500\n1,495\n0.5,494\n" L20, NULL, 0, "@IN@:4:1", "earlier than the row before"},
    {{FIT}, LOGH "0,500\n1,495\n1,494\n" L20, NULL, 0, "@IN@:4:1", "repeats the row before"},
    {{FIT}, LOGH "0,500\n1,495\n" L20 "40,100\n", NULL, 0, "@IN@:24:1", "a gap of 19 s"},
    {{FIT, "--max-gap", "0.5 s"}, LOGH "0,500\n1,495\n" L20, NULL, 0, "@IN@:3:1", "a gap of 1 s"},
    {{FIT}, "time [s],height\n0,500\n" L20, NULL, 0, "@IN@:1:10", "needs a unit"},
    {{FIT}, LOGH "0,500\n1,nan\n" L20, NULL, 0, "@IN@:3:3", "column 'height'"},
    {{FIT}, LOGH "0,500\n1,\n" L20, NULL, 0, "@IN@:3:3", "empty cell"},
    {{FIT}, "time [s],pressure [Pa]\n0,850\n1,849\n", NULL, 0, "@IN@:2:3", "check the unit"},
    {{FIT}, "time [s],pressure [m]\n0,850\n", NULL, 0, "@IN@:1:10", "unknown pressure unit"},
    {{FIT}, "time [s],height [m],altitude [m]\n0,1,2\n", NULL, 0, "@IN@:1:21", "both 'height' and 'altitude'"},
    {{FIT}, "time [s],east [m],north [m]\n0,1,2\n", NULL, 0, "@IN@:1:1", "needs a vertical column"},
    {{FIT}, "time [s],height [m],east [m]\n0,1,2\n", NULL, 0, "@IN@:1:21", "both 'east' and 'north'"},
    {{FIT}, "time [s],height [m],temperature [C]\n0,1,2\n", NULL, 0, "@IN@:1:21", "unknown column"},
    {{FIT}, LOGH "0,500\n", NULL, 0, "@IN@:2:1", "at least 20"},
    {{FIT}, LOGH "0,0\n1,10\n2,20\n3,30\n4,40\n5,50\n6,60\n7,70\n8,80\n9,90\n10,100\n11,110\n12,120\n13,130\n14,140\n15,150\n16,160\n17,170\n18,180\n19,190\n20,200\n21,210\n22,220\n23,230\n", NULL, 0, "@IN@:25:4", "never descends"},
    {{FIT}, LOGH "0,150\n1,142\n2,134\n3,126\n4,118\n5,110\n6,102\n7,94\n8,86\n9,78\n10,70\n11,62\n12,54\n13,46\n14,38\n15,30\n16,22\n17,14\n18,6\n19,0\n20,0\n21,0\n22,0\n23,0\n24,0\n", NULL, 0, "@IN@:2:1", "too short to fit"},
    {{"fit", "@IN@"}, LOGH L20, NULL, 0, "fit", "mass"},
    {{FIT, "--events", "guess"}, LOGH L20, NULL, 0, "--events", "not detect or mission"},
    {{FIT, "--events", "mission"}, LOGH L20, NULL, 0, "--events", "needs --mission"},
    {{FIT, "--deploy-times", "apogee,soon"}, LOGH L20, NULL, 0, "--deploy-times", "soon"},
    {{FIT, "--confidence", "120"}, LOGH L20, NULL, 0, "--confidence", "outside"},
    {{FIT, "--max-gap", "-1 s"}, LOGH L20, NULL, 0, "--max-gap", ""},
    {{FIT, "--stage-names", "a,,b"}, LOGH L20, NULL, 0, "--stage-names", "1 to"},
    {{FIT, "--write-canopy", "@OUT@/c.yaml"}, LOGH L20, NULL, 0, "--write-canopy", "has no canopy"},
    {{"fit", "@IN@", "--mission", "@IN2@", "--mass", "2 kg"}, LOGH L20, PMISSION, 0, "--mass", "the mission gives"},
    {{"fit", "@IN@", "--mission", "@IN2@"}, LOGH L20, "mission: m\nsections: [\n", 0, "--mission: @IN2@:3:1",
     "malformed YAML"},
    {{FIT, "--write-canopy", "@OUT@/"}, LOGH L20, NULL, 0, "--write-canopy", "directory"},
    {{FIT, "--write-wind", "/proc/sinkrate-bad-input.csv"}, LOGH L20, NULL, 0, "--write-wind", "cannot write"},

    /* ---- --units us: a bare number for a dimensional option is refused (a bare zero is zero in any unit) ---- */
    {{"size", "--units", "us", "--family", "conical", "--speed", "18 ft/s", "--mass", "2"},
     NULL, NULL, 0, "--mass", "give a unit, e.g. 2lb"},
    {{"size", "--units", "us", "--family", "conical", "--mass", "5 lb", "--speed", "5"},
     NULL, NULL, 0, "--speed", "give a unit, e.g. 5ft/s"},
    {{"size", "--units", "us", "--family", "conical", "--mass", "5 lb", "--speed", "18 ft/s", "--altitude", "100"},
     NULL, NULL, 0, "--altitude", "give a unit, e.g. 100ft"},
    {{"size", "--units", "us", "--family", "conical", "--mass", "5 lb", "--speed", "18 ft/s", "--body-drag-area",
      "0.02"},
     NULL, NULL, 0, "--body-drag-area", "give a unit, e.g. 0.02ft2"},
    {{"size", "--units", "us", "--family", "conical", "--mass", "5 lb", "--speed", "18 ft/s", "--areal-mass", "0.04"},
     NULL, NULL, 0, "--areal-mass", "give a unit, e.g. 0.04oz/yd2"},
    {{"size", "--units", "us", "--family", "conical", "--mass", "5 lb", "--speed", "18 ft/s", "--temp-offset", "15"},
     NULL, NULL, 0, "--temp-offset", "give a unit, e.g. 15F"},
    {{"size", "--units", "us", "--family", "conical", "--mass", "5 lb", "--speed", "18 ft/s", "--site-elevation",
      "1380"},
     NULL, NULL, 0, "--site-elevation", "give a unit, e.g. 1380ft"},
    {{"size", "--units", "us", "--family", "conical", "--mass", "5 lb", "--speed", "18 ft/s", "--surface-temp", "95"},
     NULL, NULL, 0, "--surface-temp", "give a unit, e.g. 95F"},
    {{"size", "--units", "us", "--family", "conical", "--mass", "5 lb", "--speed", "18 ft/s", "--surface-pressure",
      "850"},
     NULL, NULL, 0, "--surface-pressure", "give a unit, e.g. 850inHg"},
    {{"rate", "--units", "us", "--family", "conical", "--nominal-diameter", "36 in", "--mass", "2.65"},
     NULL, NULL, 0, "--mass", "give a unit, e.g. 2.65lb"},
    {{"rate", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36"},
     NULL, NULL, 0, "--nominal-diameter", "give a unit, e.g. 36in"},
    {{"rate", "--units", "us", "--family", "conical", "--mass", "6 lb", "--projected-diameter", "36"},
     NULL, NULL, 0, "--projected-diameter", "give a unit, e.g. 36in"},
    {{"rate", "--units", "us", "--family", "conical", "--mass", "6 lb", "--flat-diameter", "36"},
     NULL, NULL, 0, "--flat-diameter", "give a unit, e.g. 36in"},
    {{"rate", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-area", "7"},
     NULL, NULL, 0, "--nominal-area", "give a unit, e.g. 7ft2"},
    {{"rate", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in", "--altitude",
      "0 ft,1000"},
     NULL, NULL, 0, "--altitude", "give a unit, e.g. 1000ft"},
    {{"rate", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in",
      "--body-drag-area", "0.1"},
     NULL, NULL, 0, "--body-drag-area", "give a unit, e.g. 0.1ft2"},
    {{"rate", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in",
      "--areal-mass", "0.04"},
     NULL, NULL, 0, "--areal-mass", "give a unit, e.g. 0.04oz/yd2"},
    {{"rate", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in",
      "--temp-offset", "-10"},
     NULL, NULL, 0, "--temp-offset", "give a unit, e.g. -10F"},
    {{"sweep", "--units", "us", "--family", "conical", "--nominal-diameter", "36 in", "--mass", "3"},
     NULL, NULL, 0, "--mass", "give a unit, e.g. 3lb"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36"},
     NULL, NULL, 0, "--nominal-diameter", "give a unit, e.g. 36in"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--flat-diameter", "36"},
     NULL, NULL, 0, "--flat-diameter", "give a unit, e.g. 36in"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in", "--to",
      "3000 ft", "--step", "500 ft", "--from", "100"},
     NULL, NULL, 0, "--from", "give a unit, e.g. 100ft"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in", "--from",
      "0", "--step", "500 ft", "--to", "3000"},
     NULL, NULL, 0, "--to", "give a unit, e.g. 3000ft"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in", "--from",
      "0", "--to", "3000 ft", "--step", "500"},
     NULL, NULL, 0, "--step", "give a unit, e.g. 500ft"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--vary", "speed", "--values", "15 ft/s,20"},
     NULL, NULL, 0, "--values", "give a unit, e.g. 20ft/s"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in", "--by",
      "mass=4,6"},
     NULL, NULL, 0, "--by", "give a unit, e.g. 4lb"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in", "--vary",
      "temp-offset", "--values", "0", "--altitude", "1000"},
     NULL, NULL, 0, "--altitude", "give a unit, e.g. 1000ft"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in",
      "--body-drag-area", "0.1"},
     NULL, NULL, 0, "--body-drag-area", "give a unit, e.g. 0.1ft2"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in",
      "--mark-speed", "20"},
     NULL, NULL, 0, "--mark-speed", "give a unit, e.g. 20ft/s"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in",
      "--mark-altitude", "500"},
     NULL, NULL, 0, "--mark-altitude", "give a unit, e.g. 500ft"},
    {{"sweep", "--units", "us", "--family", "conical", "--mass", "6 lb", "--nominal-diameter", "36 in",
      "--surface-pressure", "29.9"},
     NULL, NULL, 0, "--surface-pressure", "give a unit, e.g. 29.9inHg"},
    {{"loads", "--units", "us", "--family", "conical", "--nominal-diameter", "36 in", "--speed", "90 ft/s", "--mass",
      "5"},
     NULL, NULL, 0, "--mass", "give a unit, e.g. 5lb"},
    {{"loads", "--units", "us", "--family", "conical", "--nominal-diameter", "36 in", "--mass", "11 lb", "--speed",
      "30"},
     NULL, NULL, 0, "--speed", "give a unit, e.g. 30ft/s"},
    {{"loads", "--units", "us", "--family", "conical", "--mass", "11 lb", "--speed", "90 ft/s", "--nominal-diameter",
      "1.5"},
     NULL, NULL, 0, "--nominal-diameter", "give a unit, e.g. 1.5in"},
    {{"loads", "--units", "us", "--family", "conical", "--nominal-diameter", "36 in", "--mass", "11 lb", "--speed",
      "90 ft/s", "--altitude", "1000"},
     NULL, NULL, 0, "--altitude", "give a unit, e.g. 1000ft"},
    {{"loads", "--units", "us", "--family", "conical", "--nominal-diameter", "36 in", "--mass", "11 lb", "--speed",
      "90 ft/s", "--site-elevation", "300"},
     NULL, NULL, 0, "--site-elevation", "give a unit, e.g. 300ft"},
    {{"freefall", "--units", "us", "--mass", "2 lb", "--diameter", "4"},
     NULL, NULL, 0, "--diameter", "give a unit, e.g. 4in"},
    {{"freefall", "--units", "us", "--diameter", "4 in", "--mass", "2"},
     NULL, NULL, 0, "--mass", "give a unit, e.g. 2lb"},
    {{"freefall", "--units", "us", "--body", "cylinder", "--mass", "2 lb", "--diameter", "4 in", "--length", "30"},
     NULL, NULL, 0, "--length", "give a unit, e.g. 30in"},
    {{"freefall", "--units", "us", "--mass", "2 lb", "--diameter", "4 in", "--cd-table", "@IN@", "--area", "0.1"},
     CD_HEAD "1e2,1.0\n1e3,0.5\n", NULL, 0, "--area", "give a unit, e.g. 0.1ft2"},
    {{"freefall", "--units", "us", "--mass", "2 lb", "--diameter", "4 in", "--altitude", "0:3000:1000"},
     NULL, NULL, 0, "--altitude", "give a unit, e.g. 3000ft"},
    {{"freefall", "--units", "us", "--mass", "2 lb", "--diameter", "4 in", "--surface-temp", "300"},
     NULL, NULL, 0, "--surface-temp", "give a unit, e.g. 300F"},
    {{"air", "--units", "us", "--to", "3000 ft", "--step", "500 ft", "--from", "10"},
     NULL, NULL, 0, "--from", "give a unit, e.g. 10ft"},
    {{"air", "--units", "us", "--from", "0", "--step", "500 ft", "--to", "3000"},
     NULL, NULL, 0, "--to", "give a unit, e.g. 3000ft"},
    {{"air", "--units", "us", "--from", "0", "--to", "3000 ft", "--step", "500"},
     NULL, NULL, 0, "--step", "give a unit, e.g. 500ft"},
    {{"air", "--units", "us", "--altitude", "1000"}, NULL, NULL, 0, "--altitude", "give a unit, e.g. 1000ft"},
    {{"air", "--units", "us", "--temp-offset", "20"}, NULL, NULL, 0, "--temp-offset", "give a unit, e.g. 20F"},
    /* ---- files: every dimensional value needs a unit, whatever --units says ---- */
    {{SIZE_MISSION}, MISSION "    deploy: {height: 300}\n", NULL, 0, "@IN@:9:22", "needs a unit"},
    {{SIZE_MISSION}, MISSION "    line-stretch: 0.5\n", NULL, 0, "@IN@:9:19", "needs a unit"},
    {{SIZE_MISSION},
     MISSION_HEAD "  - {name: a, mass: 2 kg, drag-area: 0.1}\n" STAGES, NULL, 0, "@IN@:4:38", "needs a unit"},
    {{SIZE_MISSION},
     MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: sphere, diameter: 10}}\n" STAGES, NULL, 0,
     "@IN@:4:59", "needs a unit"},
    {{SIZE_MISSION},
     MISSION_HEAD "  - {name: a, mass: 2 kg, body: {shape: cylinder, diameter: 10 cm, length: 0.8}}\n" STAGES, NULL, 0,
     "@IN@:4:76", "needs a unit"},
    {{SIZE_MISSION},
     MISSION_HEAD SECTION "stages:\n  - {name: main, family: conical, projected-diameter: 1.2}\n", NULL, 0,
     "@IN@:6:55", "needs a unit"},
    {{SIZE_MISSION},
     MISSION_HEAD SECTION "stages:\n  - {name: main, family: conical, flat-diameter: 1.6}\n", NULL, 0,
     "@IN@:6:50", "needs a unit"},
    {{SIZE_MISSION},
     MISSION_HEAD SECTION "stages:\n  - {name: main, family: conical, nominal-area: 1.8}\n", NULL, 0,
     "@IN@:6:49", "needs a unit"},
    {{SIZE_MISSION}, MISSION "    areal-mass: 0.04\n", NULL, 0, "@IN@:9:17", "needs a unit"},
    {{SIZE_MISSION}, MISSION "start: {height: 1000 m, speed: 12}\n", NULL, 0, "@IN@:9:32", "needs a unit"},
    {{SIZE_MISSION}, MISSION "start: {height: 1000 m, path-angle: 10}\n", NULL, 0, "@IN@:9:37", "needs a unit"},
    {{SIZE_MISSION}, MISSION "start: {height: 1000 m, heading: 90}\n", NULL, 0, "@IN@:9:34", "needs a unit"},
    {{SIZE_MISSION}, MISSION "start: {height: 1000 m, east: 50}\n", NULL, 0, "@IN@:9:31", "needs a unit"},
    {{SIZE_MISSION}, MISSION "limits: {landing-energy: 100}\n", NULL, 0, "@IN@:9:26", "needs a unit"},
    {{SIZE_MISSION}, MISSION "limits: {descent-time: 150}\n", NULL, 0, "@IN@:9:24", "needs a unit"},
    {{SIZE_MISSION}, MISSION "limits: {drift: 1500}\n", NULL, 0, "@IN@:9:17", "needs a unit"},
    {{SIZE_MISSION}, MISSION "limits: {deployment-pressure: 1500}\n", NULL, 0, "@IN@:9:31", "needs a unit"},
    {{SIZE_MISSION},
     "mission: m\nsite: {temperature: 300}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:21", "needs a unit"},
    {{SIZE_MISSION},
     "mission: m\nsite: {pressure: 101325}\nsections:\n" SECTION STAGES, NULL, 0, "@IN@:2:18", "needs a unit"},
    {{PROFILE},
     "mission: m\nsite: {wind: {model: power-law, speed: 5 m/s, from: 250 deg, "
      "reference-height: 10}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:80", "needs a unit"},
    {{PROFILE},
     "mission: m\nsite: {wind: {model: power-law, speed: 5 m/s, from: 250 deg, "
      "gradient-height: 300}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:79", "needs a unit"},
    {{PROFILE},
     "mission: m\nsite: {wind: {model: log-law, speed: 5 m/s, from: 250 deg, "
      "roughness-length: 0.03}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:78", "needs a unit"},
    {{PROFILE},
     "mission: m\nsite: {wind: {model: log-law, speed: 5 m/s, from: 250 deg, roughness-length: 0.03 m, "
      "displacement: 2}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:100", "needs a unit"},
    {{PROFILE},
     "mission: m\nsite: {wind: {rows: [{height: 0 m, speed: 3 m/s, from: 250 deg}, {height: 500, speed: 8 m/s, "
      "from: 260 deg}]}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:75", "needs a unit"},
    {{PROFILE},
     "mission: m\nsite: {wind: {rows: [{height: 0 m, speed: 3 m/s, from: 250 deg}, {height: 500 m, speed: 8, "
      "from: 260 deg}]}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:89", "needs a unit"},
    {{PROFILE},
     "mission: m\nsite: {wind: {rows: [{height: 0 m, speed: 3 m/s, from: 250 deg}, {height: 500 m, "
      "speed: 8 m/s, from: 260}]}}\nsections:\n" SECTION STAGES START, NULL, 0,
     "@IN@:2:102", "needs a unit"},
    {{DISPERSION},
     PMISSION "uncertainty: {wind-speed: {distribution: normal, sigma: 1.5}}\n", NULL, 0, "@IN@:10:57", "needs a unit"},
    {{DISPERSION},
     PMISSION "uncertainty: {first-deployment: {distribution: normal, sigma: 60}}\n", NULL, 0,
     "@IN@:10:63", "needs a unit"},
    {{DISPERSION},
     PMISSION "uncertainty: {wind-direction: {distribution: normal, sigma: 15}}\n", NULL, 0,
     "@IN@:10:61", "needs a unit"},
    {{DISPERSION},
     PMISSION "uncertainty: {mass: {distribution: normal, sigma: 0.1}}\n", NULL, 0, "@IN@:10:51", "needs a unit"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  projected-diameter: 1.2\n", NULL, 0, "@IN@:3:23", "needs a unit"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  flat-diameter: 1.6\n", NULL, 0, "@IN@:3:18", "needs a unit"},
    {{RATE_CANOPY}, "canopy:\n  family: conical\n  nominal-area: 1.8\n", NULL, 0, "@IN@:3:17", "needs a unit"},
    {{RATE_CANOPY},
     "canopy:\n  family: conical\n  nominal-diameter: 1 m\n  areal-mass: 0.04\n", NULL, 0, "@IN@:4:15", "needs a unit"},
    {{CHECK}, FAMILY "areal-mass: {value: 0.04, source: s}\n", NULL, 0, "@IN@:11:21", "needs a unit"},

    /* ---- trajectories and landing maps: the launch point and the files ---- */
    {{PROFILE}, GEO_SITE("latitude: 91 deg, longitude: 0 deg"), NULL, 0, "@IN@:2:18", "outside -90 .. 90 deg"},
    {{PROFILE}, GEO_SITE("latitude: 35 deg, longitude: 200 deg"), NULL, 0, "@IN@:2:37", "outside -180 .. 180 deg"},
    {{PROFILE}, GEO_SITE("latitude: 35 deg"), NULL, 0, "@IN@:2:18", "give site.latitude and site.longitude together"},
    {{PROFILE}, GEO_SITE("longitude: -106 deg"), NULL, 0, "@IN@:2:19", "give site.latitude and site.longitude"},
    {{PROFILE}, GEO_SITE("latitude: 35, longitude: -106 deg"), NULL, 0, "@IN@:2:18", "needs a unit"},
    {{PROFILE}, GEO_SITE("latitude: 35 m, longitude: -106 deg"), NULL, 0, "@IN@:2:18", "unknown angle unit 'm'"},
    {{PROFILE}, GEO_SITE("lattitude: 35 deg, longitude: -106 deg"), NULL, 0, "@IN@:2:8", "did you mean 'latitude'"},
    {{DISPERSION}, GEO_SITE("latitude: -95 deg, longitude: 10 deg"), NULL, 0, "@IN@:2:18", "outside -90 .. 90 deg"},
    {{PROFILE, "--geojson", "@OUT@/m.geojson"}, PMISSION, NULL, 0, "--geojson", "no launch point on the map"},
    {{DISPERSION, "--geojson", "@OUT@/m.geojson"}, PMISSION, NULL, 0, "--geojson", "no launch point on the map"},
    {{PROFILE, "--geojson", "@OUT@"}, GEO_SITE("latitude: 35 deg, longitude: -106 deg"), NULL, 0, "--geojson: @OUT@",
     "is a directory"},
    {{PROFILE, "--geojson", ""}, PMISSION, NULL, 0, "--geojson", "empty output file name"},
    {{PROFILE, "--trajectory", "@OUT@/no/such/t.csv"}, PMISSION, NULL, 0, "--trajectory: @OUT@/no/such/t.csv",
     "cannot write"},
    {{PROFILE, "--trajectory", "/proc/sinkrate-bad-input.csv"}, PMISSION, NULL, 0,
     "--trajectory: /proc/sinkrate-bad-input.csv", "cannot write"},
    {{PROFILE, "--band-ends"}, PMISSION, NULL, 0, "--band-ends", "goes with --trajectory or --geojson"},
    {{PROFILE, "--fast", "--trajectory", "@OUT@/t.csv"}, PMISSION, NULL, 0, "--trajectory", "drop --fast"},
    {{PROFILE, "--trajectory", "@OUT@/t.csv"}, MISSION, NULL, 0, "@IN@", "no start: block"},
    {{DISPERSION, "--geojson-samples", "10"}, PMISSION, NULL, 0, "--geojson-samples", "goes with --geojson"},
    {{DISPERSION, "--geojson", "@OUT@/m.geojson", "--geojson-samples", "-1"}, PMISSION, NULL, 0,
     "--geojson-samples", "from 0 to 20000"},
    {{DISPERSION, "--geojson", "@OUT@/m.geojson", "--geojson-samples", "many"}, PMISSION, NULL, 0,
     "--geojson-samples", "not a whole number"},

    /* ---- --table: one table of the output ---- */
    {{RATE_OK, "--table", "rate"}, NULL, NULL, 0, "--table", "did you mean 'rates'"},
    {{"air", "--table", "pressure"}, NULL, NULL, 0, "--table", "its tables: values, atmosphere"},
    {{SIZE_OK, "--table", ""}, NULL, NULL, 0, "--table", "has no table ''"},
    {{PROFILE, "--table", "failure_cases", "--format", "csv"}, PMISSION, NULL, 0, "--table",
     "this output has no table 'failure_cases'"},
    {{"freefall", "--mass", "1 kg", "--diameter", "10 cm", "--table", "trace_"}, NULL, NULL, 0, "--table",
     "has no table 'trace_'"},
    {{"canopies", "--table", "familes"}, NULL, NULL, 0, "--table", "did you mean 'families'"},
    {{DISPERSION, "--table", "limit"}, PMISSION, NULL, 0, "--table", "did you mean 'limits'"},
};

/* ---- the harness ---- */

static void subst(char *out, size_t len, const char *s, const char *dir)
{
    static const char *const KEYS[] = {"@IN2@", "@IN@", "@DIR@", "@OUT@", "@DATA@"};
    static const char *const FMT[] = {"%s/in/second", "%s/in/first", "%s/in", "%s/out", "%s/data"};
    size_t o = 0;
    while (*s && o + 1 < len) {
        int hit = 0;
        for (size_t k = 0; k < sizeof KEYS / sizeof KEYS[0]; k++) {
            size_t kl = strlen(KEYS[k]);
            if (strncmp(s, KEYS[k], kl) == 0) {
                char rep[512];
                snprintf(rep, sizeof rep, FMT[k], dir);
                o += (size_t)snprintf(out + o, len - o, "%s", rep);
                if (o >= len)
                    o = len - 1;
                s += kl;
                hit = 1;
                break;
            }
        }
        if (!hit)
            out[o++] = *s++;
    }
    out[o] = '\0';
}

static void write_file(const char *path, const char *data, size_t len)
{
    FILE *f = fopen(path, "wb");
    assert_non_null(f);
    assert_int_equal(fwrite(data, 1, len, f), len);
    fclose(f);
}

static char *generate(gen g, size_t *len)
{
    size_t cap = 2u << 20;
    char *b = malloc(cap);
    assert_non_null(b);
    size_t n = 0;
    switch (g) {
    case GEN_BIG:
        n += (size_t)snprintf(b, cap, "mission: m\ndescription: \"");
        while (n < (3u << 19))
            b[n++] = 'x';
        n += (size_t)snprintf(b + n, cap - n, "\"\n");
        break;
    case GEN_BINARY:
        for (n = 0; n < 256; n++)
            b[n] = (char)n;
        break;
    case GEN_DEEP_BLOCK:
        n += (size_t)snprintf(b, cap, "mission: m\nsections:\n");
        for (int i = 0; i < 40; i++)
            n += (size_t)snprintf(b + n, cap - n, "%*sk%d:\n", 2 * (i + 1), "", i);
        n += (size_t)snprintf(b + n, cap - n, "%*sv\n", 82, "");
        break;
    case GEN_LAUGHS:
        n += (size_t)snprintf(b, cap, "mission: m\nl0: &l0 [x, x, x, x, x, x, x, x, x, x]\n");
        for (int i = 1; i < 9; i++)
            n += (size_t)snprintf(b + n, cap - n, "l%d: &l%d [*l%d, *l%d, *l%d, *l%d, *l%d, *l%d, *l%d, *l%d]\n", i, i,
                                  i - 1, i - 1, i - 1, i - 1, i - 1, i - 1, i - 1, i - 1);
        n += (size_t)snprintf(b + n, cap - n, "sections:\n" SECTION STAGES);
        break;
    case GEN_ANCHORS:
        for (int i = 0; i < 29000 && n + 64 < cap; i++)
            n += (size_t)snprintf(b + n, cap - n, "k%d: &a%d x\n", i, i);
        for (int i = 0; i < 29000 && n + 64 < cap; i++)
            n += (size_t)snprintf(b + n, cap - n, "r%d: *a%d\n", i, i);
        break;
    case GEN_LONG_NUMBER:
        n += (size_t)snprintf(b, cap, MISSION_HEAD "  - {name: a, mass: ");
        for (int i = 0; i < 300; i++)
            b[n++] = '7';
        n += (size_t)snprintf(b + n, cap - n, " kg}\n" STAGES);
        break;
    default:
        break;
    }
    *len = n;
    return b;
}

static int run_case(size_t i, const bad_case *c, int show)
{
    char dir[64];
    sr_test_tmpdir(dir, sizeof dir, "bad");
    char p[1024];
    snprintf(p, sizeof p, "%s/in", dir);
    assert_int_equal(mkdir(p, 0755), 0);
    snprintf(p, sizeof p, "%s/out", dir);
    assert_int_equal(mkdir(p, 0755), 0);
    int uses_data = 0;
    for (size_t k = 0; k < 16 && c->args[k]; k++)
        if (strstr(c->args[k], "@DATA@"))
            uses_data = 1;
    const char *in_path = "%s/in/first";
    if (uses_data) {
        snprintf(p, sizeof p, "%s/data", dir);
        assert_int_equal(mkdir(p, 0755), 0);
        snprintf(p, sizeof p, "%s/data/canopies", dir);
        assert_int_equal(mkdir(p, 0755), 0);
        in_path = "%s/data/canopies/first.yaml";
    }
    char in_file[1024];
    snprintf(in_file, sizeof in_file, in_path, dir);
    if (c->gen && c->gen != GEN_BINARY2) {
        size_t len;
        char *b = generate(c->gen, &len);
        write_file(in_file, b, len);
        free(b);
    } else if (c->in) {
        char *text = malloc(strlen(c->in) * 2 + 1024);
        assert_non_null(text);
        subst(text, strlen(c->in) * 2 + 1024, c->in, dir);
        write_file(in_file, text, strlen(text));
        free(text);
    }
    if (c->in2 || c->gen == GEN_BINARY2) {
        size_t len = c->in2 ? strlen(c->in2) : 0;
        char *b = c->in2 ? NULL : generate(GEN_BINARY, &len);
        for (int k = 0; k < 2; k++) {
            snprintf(p, sizeof p, k ? "%s/in/second.yaml" : "%s/in/second", dir);
            write_file(p, b ? b : c->in2, len);
        }
        free(b);
    }
    int before = sr_test_entries(dir);

    char store[24][1024];
    char *argv[24];
    int argc = 0, has_o = 0;
    argv[argc++] = "sinkrate";
    for (size_t k = 0; k < 16 && c->args[k]; k++) {
        subst(store[argc], sizeof store[argc], c->args[k], dir);
        if (uses_data && strcmp(c->args[k], "@IN@") == 0)
            snprintf(store[argc], sizeof store[argc], "%s", in_file);
        if (strcmp(c->args[k], "-o") == 0 || strcmp(c->args[k], "--output") == 0)
            has_o = 1;
        argv[argc] = store[argc];
        argc++;
    }
    int is_check = strcmp(c->args[0], "check") == 0;
    if (!has_o && !is_check) {
        argv[argc++] = "-o";
        snprintf(store[argc], sizeof store[argc], "%s/out/result", dir);
        argv[argc] = store[argc];
        argc++;
    }
    argv[argc] = NULL;

    char where[1024];
    subst(where, sizeof where, c->where, dir);
    if (uses_data) /* @IN@ in `where` names the family file inside the data directory */
        snprintf(where, sizeof where, "%s%s", in_file, c->where + strlen("@IN@"));

    char *out, *err;
    int rc = sr_test_cli_argv(&out, &err, argc, argv);
    int after = sr_test_entries(dir);
    /* check lists every problem of a file, one line each; every other command stops at the first */
    int ok = rc == 2 && (is_check ? sr_test_lines(err) >= 1 : sr_test_lines(err) == 1) &&
             err[strlen(err) - 1] == '\n' && strstr(err, where) &&
             strstr(err, c->expect) && (is_check || out[0] == '\0') && after == before;
    if (show || !ok) {
        /* the error line with the temporary directory shortened, for review */
        char shown[2048];
        size_t o = 0;
        for (const char *s = err; *s && o + 8 < sizeof shown;) {
            if (strncmp(s, dir, strlen(dir)) == 0) {
                o += (size_t)snprintf(shown + o, sizeof shown - o, "$T");
                s += strlen(dir);
            } else {
                shown[o++] = *s++;
            }
        }
        shown[o] = '\0';
        if (!ok)
            print_error("bad-input row %zu (%s %s): rc %d, %d line(s), stdout %zu bytes, %d new file(s); want '%s' "
                        "and '%s'\n  stderr: %s",
                        i, c->args[0], c->args[1] ? c->args[1] : "", rc, sr_test_lines(err), strlen(out),
                        after - before, c->where, c->expect, shown);
        else
            print_message("%3zu %s", i, shown);
    }
    free(out);
    free(err);
    sr_test_rmtree(dir);
    return ok;
}

/* Valid requests with no answer: exit 1 and one line saying why. */
static const struct {
    const char *args[16];
    const char *expect;
    const char *in;     /* the mission file @IN@, or NULL */
} IMPOSSIBLE[] = {
    {{"size", "--mass", "1e-6 kg", "--speed", "5 m/s", "--family", "conical"}, "no canopy fits", NULL},
    {{"size", "--mass", "9e4 kg", "--speed", "0.5 m/s", "--family", "conical"}, "no canopy fits", NULL},
    {{"size", "--mass", "0.1 kg", "--speed", "0.5 m/s", "--family", "conical", "--areal-mass", "1500 g/m2"},
     "no canopy size", NULL},
    /* design: the page shows every combination's closest miss; the line names the closest */
    {{DESIGN, "--write", "@OUT@/chosen.yaml"}, "no design meets every limit; the closest, main annular, misses "
                                                "touchdown descent rate",
     PMISSION "limits: {touchdown-speed: 1 m/s}\n"
              "design: {stages: {main: {families: [conical, annular], nominal-diameter: {min: 1 m, max: 3 m}}}}\n"},
    {{DESIGN, "--write", "@OUT@/chosen.yaml"}, "no candidate fits its bay: the least 'main', a 1.000 m conical",
     PMISSION "limits: {touchdown-speed: 6 m/s}\n"
              "design: {stages: {main: {nominal-diameter: {min: 1 m, max: 3 m}, bay-volume: 10 cm3}}}\n"},
    {{DESIGN}, "no design meets every limit within the bays",
     PMISSION "limits: {touchdown-speed: 6 m/s}\n"
              "design: {stages: {main: {nominal-diameter: {min: 1 m, max: 3 m}, bay-volume: 0.25 L}}}\n"},
};

static void test_impossible(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof IMPOSSIBLE / sizeof IMPOSSIBLE[0]; i++) {
        char *argv[20], store[16][512];
        int argc = 0;
        argv[argc++] = "sinkrate";
        char dir[] = "/tmp/sinkrate-impossible-XXXXXX";
        assert_non_null(mkdtemp(dir));
        char in[600];
        snprintf(in, sizeof in, "%s/mission.yaml", dir);
        if (IMPOSSIBLE[i].in) {
            FILE *f = fopen(in, "w");
            assert_non_null(f);
            fputs(IMPOSSIBLE[i].in, f);
            fclose(f);
        }
        for (size_t k = 0; k < 16 && IMPOSSIBLE[i].args[k]; k++) {
            const char *a = IMPOSSIBLE[i].args[k];
            if (strcmp(a, "@IN@") == 0)
                snprintf(store[k], sizeof store[k], "%s", in);
            else if (strncmp(a, "@OUT@", 5) == 0)
                snprintf(store[k], sizeof store[k], "%s%s", dir, a + 5);
            else
                snprintf(store[k], sizeof store[k], "%s", a);
            argv[argc++] = store[k];
        }
        argv[argc] = NULL;
        char *out, *err;
        int rc = sr_test_cli_argv(&out, &err, argc, argv);
        if (rc != 1 || sr_test_lines(err) != 1 || !strstr(err, IMPOSSIBLE[i].expect))
            print_error("impossible row %zu: rc %d, stderr '%s'\n", i, rc, err);
        assert_int_equal(rc, 1);
        assert_int_equal(sr_test_lines(err), 1);
        assert_non_null(strstr(err, IMPOSSIBLE[i].expect));
        if (strcmp(IMPOSSIBLE[i].args[0], "design") == 0) /* its page: every closest miss, with the caution */
            assert_non_null(strstr(out, "closest miss of each"));
        else
            assert_string_equal(out, "");
        /* nothing written: the directory holds the input only */
        char chosen[640];
        snprintf(chosen, sizeof chosen, "%s/chosen.yaml", dir);
        assert_int_equal(access(chosen, F_OK), -1);
        remove(in);
        assert_int_equal(rmdir(dir), 0);
        free(out);
        free(err);
    }
}

static void test_bad_input_catalogue(void **state)
{
    (void)state;
    size_t n = sizeof BAD / sizeof BAD[0];
    int show = getenv("SR_BADINPUT_SHOW") != NULL;
    size_t failed = 0;
    for (size_t i = 0; i < n; i++)
        failed += !run_case(i, &BAD[i], show);
    print_message("bad-input catalogue: %zu rows, %zu failed\n", n, failed);
    assert_true(n >= 100);
    /* every command has rows (a new command fails here until it has them) */
    for (const sr_command *const *cmd = sr_cli_commands; *cmd; cmd++) {
        size_t rows = 0;
        for (size_t i = 0; i < n; i++)
            rows += strcmp(BAD[i].args[0], (*cmd)->name) == 0;
        if (rows < 5)
            print_error("bad-input catalogue: %zu rows for %s\n", rows, (*cmd)->name);
        assert_true(rows >= 5);
    }
    assert_int_equal(failed, 0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_bad_input_catalogue),
        cmocka_unit_test(test_impossible),
    };
    return cmocka_run_group_tests_name("badinput", tests, NULL, NULL);
}
