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

# Index: cheap bounds in the engine, GiST operator class, planner support.
CORE_OBJS += src/core/bounds.o
OBJS += src/track_key.o src/gist.o src/support.o

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
CORE_OBJS += src/core/geodesy.o
OBJS += src/ewkb.o src/geo_glue.o src/geo_witness.o
DATA_built += sql/frechet_ext_postgis--$(EXTVERSION).sql
EXTRA_CLEAN += sql/frechet_ext_postgis--$(EXTVERSION).sql

# Maps and dashboards: track pieces and GeoJSON (SQL bodies in the install scripts).
OBJS += src/track_piece.o

# Debian installs several majors side by side; prefer 15, the supported one.
PG_CONFIG ?= $(firstword $(wildcard /usr/lib/postgresql/15/bin/pg_config) pg_config)
PGXS := $(shell $(PG_CONFIG) --pgxs)
include $(PGXS)

sql/frechet_ext--$(EXTVERSION).sql: sql/frechet_ext.sql
	cp $< $@

# Engine unit tests: plain C, no server needed.
CORE_SRC = $(CORE_OBJS:.o=.c)
CORE_TEST_CFLAGS = -std=c11 -O2 -g -Wall -Wextra -Wno-unused-parameter -Isrc/core

# One binary per test/core/test_*.c; every one links the engine and the
# reference libraries (GEOS, PROJ) and cmocka.
CORE_TESTS = $(patsubst %.c,%.bin,$(sort $(wildcard test/core/test_*.c)))
CORE_TEST_LIBS = -lgeos_c -lproj -lcmocka -lm

test/core/%.bin: test/core/%.c test/core/testutil.h $(CORE_SRC) src/core/*.h
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

# Checks our WGS84 metric against PROJ's geodesics (geod_inverse, Karney 2013).
