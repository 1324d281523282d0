# frechet_ext - PGXS build.  `make`, `make install`, `make installcheck`
# (against a running server), `make check-core` (engine unit tests),
# `make bench`.  See DEVELOPERS.md.

EXTENSION = frechet_ext
MODULE_big = frechet_ext
EXTVERSION = 0.2

CORE_OBJS = src/core/freespace.o src/core/reach.o src/core/decide.o src/core/distance.o \
	src/core/discrete.o src/core/matching.o src/core/partial.o \
	src/core/excursions.o src/core/prune.o src/core/simplify.o src/core/pings.o \
	src/core/progress.o src/core/passage.o src/core/bounds.o src/core/geodesy.o

# The glue, in layers (DEVELOPERS.md, "Layers of the glue"); a layer calls
# only the layers before it, which test/reliability/glue_layers.sh checks.
GLUE_BASE_OBJS = src/glue/module.o src/glue/track_report.o src/glue/srf.o src/glue/track_units.o
POINTS_OBJS = src/pg/point_array.o src/pg/points.o
POSTGIS_OBJS = src/postgis/ewkb.o src/postgis/postgis.o src/postgis/ewkb_out.o \
	src/postgis/box_strategies.o
TRACK_OBJS = src/track/track.o
INDEX_OBJS = src/index/key.o src/index/gist.o src/index/support.o src/index/selectivity.o
FUNCTION_OBJS = src/functions/distance.o src/functions/explain.o src/functions/simplify.o \
	src/functions/piece.o src/functions/check.o src/functions/geojson.o \
	src/functions/pings.o src/functions/progress.o src/functions/passage.o
OBJS = $(CORE_OBJS) $(GLUE_BASE_OBJS) $(POINTS_OBJS) $(POSTGIS_OBJS) $(TRACK_OBJS) \
	$(INDEX_OBJS) $(FUNCTION_OBJS)
GLUE_DIRS = glue pg postgis track index functions

# geography edges follow the geodesic: PROJ's geodesic routines (Karney 2013)
SHLIB_LINK += -lproj

DATA_built = sql/frechet_ext--$(EXTVERSION).sql
EXTRA_CLEAN = sql/frechet_ext--$(EXTVERSION).sql test/core/*.bin \
	regression.diffs regression.out results

REGRESS = $(patsubst test/sql/%.sql,%,$(sort $(wildcard test/sql/*.sql)))
REGRESS_OPTS = --inputdir=test --load-extension=frechet_ext

PG_CFLAGS = -Wall -Wextra -Wno-unused-parameter -Wno-missing-field-initializers \
	-Wno-sign-compare -Werror=implicit-function-declaration
PG_CPPFLAGS = -I$(srcdir)/src/core $(patsubst %,-I$(srcdir)/src/%,$(GLUE_DIRS))

# PostGIS layer: a second extension, frechet_ext_postgis, whose C functions
# live in the same library (src/postgis: EWKB decoding and encoding,
# PostGIS's box strategies; no PostGIS headers, no PostGIS link).  Its
# pg_regress files are named postgis_*.sql and run only where PostGIS is
# installed.
EXTENSION += frechet_ext_postgis
DATA_built += sql/frechet_ext_postgis--$(EXTVERSION).sql
EXTRA_CLEAN += sql/frechet_ext_postgis--$(EXTVERSION).sql

# Debian installs several majors side by side; prefer 15, the supported one.
PG_CONFIG ?= $(firstword $(wildcard /usr/lib/postgresql/15/bin/pg_config) pg_config)
PGXS := $(shell $(PG_CONFIG) --pgxs)
include $(PGXS)

# PGXS tracks no header dependencies: a change to a header (a struct's
# layout, say) must rebuild every object and JIT bitcode file that sees it.
$(OBJS) $(OBJS:.o=.bc): $(wildcard src/core/*.h) $(wildcard src/*/*.h)

sql/frechet_ext--$(EXTVERSION).sql: sql/frechet_ext.sql
	cp $< $@

# The engine never reads errno, so sqrt may compile to one instruction (and
# vectorise); no contraction into fused multiply-adds, so every caller of a
# formula rounds it the same way and the deciders agree exactly.  The engine
# never reads floating-point exception flags either (-fno-trapping-math lets
# branch-free selects be evaluated ahead, which vectorisation needs; values
# are unchanged), and loops with run-time trip counts may vectorise
# (-fvect-cost-model=dynamic: -O2 alone only takes the trivially cheap ones).
ENGINE_FP_FLAGS = -fno-math-errno -ffp-contract=off -fno-trapping-math -fvect-cost-model=dynamic
$(CORE_OBJS): override CFLAGS += $(ENGINE_FP_FLAGS)

# Engine unit tests: plain C, no server needed.
CORE_SRC = $(CORE_OBJS:.o=.c)
CORE_TEST_CFLAGS = -std=c11 -O2 -g -Wall -Wextra -Wno-unused-parameter $(ENGINE_FP_FLAGS) -Isrc/core

# One binary per test/core/test_*.c; every one links the engine and the
# reference libraries (GEOS, PROJ) and cmocka.
CORE_TESTS = $(patsubst %.c,%.bin,$(sort $(wildcard test/core/test_*.c)))
CORE_TEST_LIBS = -lgeos_c -lproj -lcmocka -lm

test/core/%.bin: test/core/%.c test/core/testutil.h test/core/geosutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ $< $(CORE_SRC) $(CORE_TEST_LIBS)

.PHONY: check-core core-tests bench
core-tests: $(CORE_TESTS)

check-core: $(CORE_TESTS)
	@set -e; for t in $(CORE_TESTS); do ./$$t; done

bench:
	$(MAKE) -C bench

# PostGIS layer: install script, regress filter, geodesy reference checks.
sql/frechet_ext_postgis--$(EXTVERSION).sql: sql/frechet_ext_postgis.sql
	cp $< $@

ifeq ($(wildcard $(shell $(PG_CONFIG) --sharedir)/extension/postgis.control),)
REGRESS := $(filter-out postgis_%,$(REGRESS))
endif

# ---- Reliability (issue 7): upgrade scripts, fuzzing, sanitizers, valgrind, load test ----

# Released install scripts (sql/<ext>--<old>.sql, committed when a version
# is released) and upgrade scripts (sql/<ext>--<from>--<to>.sql) are
# installed as they are; test/reliability/upgrade.sh checks every path.
DATA += $(filter-out $(DATA_built),$(wildcard sql/*--*.sql))

# See DEVELOPERS.md, "Reliability".  Fuzz targets are test/fuzz/fuzz_*.c;
# each links the engine (CORE_SRC) and, for glue targets, the glue file it
# names in FUZZ_GLUE_<target> with the server stubs.

FUZZ_CC = clang
FUZZ_CFLAGS = -std=gnu11 -g -O1 -fsanitize=fuzzer,address,undefined \
	-fno-sanitize-recover=all -fno-omit-frame-pointer -Wall -Wextra \
	-Wno-unused-parameter -Wno-ignored-attributes -Wno-sign-compare \
	-Isrc/core -Isrc/glue -Isrc/pg -Isrc/postgis -Itest/fuzz
PG_INCLUDEDIR_SERVER := $(shell $(PG_CONFIG) --includedir-server)
# FUZZ_STRICT=1 also checks the properties of known, reported engine bugs
# (see the top of test/fuzz/fuzz_engine.c).
FUZZ_CFLAGS += $(if $(FUZZ_STRICT),-DFUZZ_STRICT)
FUZZ_TARGETS = $(patsubst %.c,%.bin,$(wildcard test/fuzz/fuzz_*.c))
FUZZ_GLUE_fuzz_point_array = src/pg/point_array.c src/glue/track_report.c
FUZZ_GLUE_fuzz_ewkb = src/postgis/ewkb.c src/glue/track_report.c

# The engine's work is floating point: comparison tracing (trace-cmp) would
# cost two thirds of the time and guide little, so it is off there.
# Engine targets: fuzz_engine (distance, decision), fuzz_witness (matching,
# excursions, partial matching), fuzz_index (summary bounds, cheap verdicts,
# simplification), fuzz_pings (the ping functions); all decode through
# test/fuzz/fuzz_case.h.
ENGINE_FUZZ = fuzz_engine fuzz_witness fuzz_index fuzz_pings
$(patsubst %,test/fuzz/%.bin,$(ENGINE_FUZZ)): test/fuzz/%.bin: test/fuzz/%.c test/fuzz/fuzz_case.h $(CORE_SRC) src/core/*.h
	$(FUZZ_CC) $(FUZZ_CFLAGS) -O2 -fno-sanitize-coverage=trace-cmp -o $@ $< $(CORE_SRC) -lproj -lm

test/fuzz/fuzz_%.bin: test/fuzz/fuzz_%.c test/fuzz/pg_stubs.c test/fuzz/pg_stubs.h src/*/*.c src/*/*.h $(CORE_SRC)
	$(FUZZ_CC) $(FUZZ_CFLAGS) -I$(PG_INCLUDEDIR_SERVER) -o $@ $< test/fuzz/pg_stubs.c $(FUZZ_GLUE_fuzz_$*) -lproj -lm

# Engine unit tests built with AddressSanitizer and UndefinedBehaviorSanitizer.
SAN_CFLAGS = -std=c11 -O1 -g -fsanitize=address,undefined -fno-sanitize-recover=all \
	-fno-omit-frame-pointer -Wall -Wextra -Wno-unused-parameter -Isrc/core

test/core/%.san.bin: test/core/%.c test/core/testutil.h test/core/geosutil.h $(CORE_SRC) src/core/*.h
	$(FUZZ_CC) $(SAN_CFLAGS) -o $@ $< $(CORE_SRC) $(if $(findstring geos,$*),-lgeos_c) -lcmocka -lproj -lm

SAN_TESTS = test/core/test_engine.san.bin test/core/test_geos.san.bin

.PHONY: fuzz fuzz-build check-sanitize check-valgrind load-test
fuzz-build: $(FUZZ_TARGETS)

# FUZZ_SECONDS per target (default 60); see test/fuzz/run.
fuzz: fuzz-build
	bash test/fuzz/run

# Long runs: FUZZ_LONG_SECONDS per target (default 600), two at a time,
# each input limited as in CI (a hang of over 10 s is a finding).
FUZZ_LONG_SECONDS ?= 600
.PHONY: fuzz-long
fuzz-long: fuzz-build
	FUZZ_SECONDS=$(FUZZ_LONG_SECONDS) FUZZ_JOBS=2 bash test/fuzz/run

check-sanitize: $(SAN_TESTS)
	@set -e; for t in $(SAN_TESTS); do ./$$t; done

check-valgrind: test/core/test_engine.bin
	valgrind -q --error-exitcode=99 --leak-check=full --errors-for-leak-kinds=all ./test/core/test_engine.bin

# pgbench, 8 clients for 60 s over 10,000 trips, on a throwaway server (not in test/run).
load-test:
	bash test/load/run
EXTRA_CLEAN += test/fuzz/*.bin
