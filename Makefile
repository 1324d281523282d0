# frechet_ext - PGXS build.  `make`, `make install`, `make installcheck`
# (against a running server), `make check-core` (engine unit tests),
# `make bench`.  See DEVELOPERS.md.

EXTENSION = frechet_ext
MODULE_big = frechet_ext
EXTVERSION = 0.1

CORE_OBJS = src/core/freespace.o src/core/decide.o src/core/distance.o \
	src/core/discrete.o src/core/matching.o src/core/partial.o \
	src/core/excursions.o src/core/prune.o
OBJS = $(CORE_OBJS) src/frechet_ext.o src/point_array.o src/witness.o

DATA_built = sql/frechet_ext--$(EXTVERSION).sql
EXTRA_CLEAN = sql/frechet_ext--$(EXTVERSION).sql test/core/*.bin \
	regression.diffs regression.out results

REGRESS = $(patsubst test/sql/%.sql,%,$(sort $(wildcard test/sql/*.sql)))
REGRESS_OPTS = --inputdir=test --load-extension=frechet_ext

PG_CFLAGS = -Wall -Wextra -Wno-unused-parameter -Wno-missing-field-initializers \
	-Wno-sign-compare -Werror=implicit-function-declaration
PG_CPPFLAGS = -I$(srcdir)/src/core

# PostGIS layer: a second extension, frechet_ext_postgis, whose C functions
# live in the same library (EWKB decoding, geodesy, planner support; no
# PostGIS headers, no PostGIS link).  Its pg_regress files are named
# postgis_*.sql and run only where PostGIS is installed.
EXTENSION += frechet_ext_postgis
OBJS += src/core/geodesy.o src/ewkb.o src/geo_glue.o src/geo_witness.o
DATA_built += sql/frechet_ext_postgis--$(EXTVERSION).sql
EXTRA_CLEAN += sql/frechet_ext_postgis--$(EXTVERSION).sql

# Debian installs several majors side by side; prefer 15, the supported one.
PG_CONFIG ?= $(firstword $(wildcard /usr/lib/postgresql/15/bin/pg_config) pg_config)
PGXS := $(shell $(PG_CONFIG) --pgxs)
include $(PGXS)

sql/frechet_ext--$(EXTVERSION).sql: sql/frechet_ext.sql
	cp $< $@

# Engine unit tests: plain C, no server needed.
CORE_SRC = $(CORE_OBJS:.o=.c)
CORE_TEST_CFLAGS = -std=c11 -O2 -g -Wall -Wextra -Wno-unused-parameter -Isrc/core

test/core/test_engine.bin: test/core/test_engine.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_engine.c $(CORE_SRC) -lcmocka -lm

test/core/test_geos.bin: test/core/test_geos.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_geos.c $(CORE_SRC) -lgeos_c -lcmocka -lm

test/core/test_matching.bin: test/core/test_matching.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_matching.c $(CORE_SRC) -lcmocka -lm

test/core/test_partial.bin: test/core/test_partial.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_partial.c $(CORE_SRC) -lcmocka -lm

test/core/test_excursions.bin: test/core/test_excursions.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_excursions.c $(CORE_SRC) -lcmocka -lm

test/core/test_prune.bin: test/core/test_prune.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_prune.c $(CORE_SRC) -lcmocka -lm

CORE_TESTS = test/core/test_prune.bin test/core/test_engine.bin test/core/test_geos.bin test/core/test_matching.bin \
	test/core/test_partial.bin test/core/test_excursions.bin

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

# Checks our WGS84 metric against PROJ's geodesics (geod_inverse, Karney 2013).
test/core/test_geodesy.bin: test/core/test_geodesy.c test/core/testutil.h $(CORE_SRC) src/core/geodesy.c src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -Wno-unused-function -o $@ test/core/test_geodesy.c $(CORE_SRC) src/core/geodesy.c -lproj -lcmocka -lm

CORE_TESTS += test/core/test_geodesy.bin
core-tests check-core: test/core/test_geodesy.bin
